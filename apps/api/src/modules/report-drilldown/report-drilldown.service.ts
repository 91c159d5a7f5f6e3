import {
  evaluateMultirule,
  measurementUncertainty,
  peerMeanUncertaintyPct,
  pool,
  type ControlPoint,
} from '@plumbline/stats';
import {
  PEER_TIERS,
  loadPeerKeyParts,
  resolvePeerMembership,
  type Database,
  type PeerTierName,
} from '@plumbline/db';
import type { Drilldown, DrilldownQuery, PeerFigures, TrendPoint } from '@plumbline/contracts';
import type { Principal } from '../../auth/principal.ts';
import { notFound } from '../../errors/app-error.ts';
import { convertSpread, convertValue, displayUnitFor } from '../../units/convert.ts';
import { UUID, visibleLab } from '../lab-review/lab-scope.ts';
import { compare, figuresOf } from '../peer-report/report-row.ts';
import * as repo from './report-drilldown.repository.ts';

/** How many periods the SDI/CVR trend covers (the last 12). */
export const TREND_PERIODS = 12;

type Chosen = { tier: PeerTierName; row: repo.PeerStatisticsRow; published: boolean };

/**
 * Everything behind one report row (procedure, control lot, level) in a period: the SDI/CVR trend, the
 * peer distribution, the two-level plot, the Levey-Jennings chart against the chosen target, and the
 * measurement uncertainty. Peer figures are chosen as in the peer report (narrowest sufficient tier,
 * published version when there is one).
 */
export async function buildDrilldown(
  db: Database,
  principal: Principal,
  labId: string,
  row: { procedureId: string; controlLotId: string; level: number },
  query: DrilldownQuery,
): Promise<Drilldown> {
  const lab = await visibleLab(db, principal, labId);
  const { period } = query;
  const procedure = UUID.test(row.procedureId) ? await repo.findProcedure(db, labId, row.procedureId) : null;
  if (!procedure) throw notFound('Procedure');
  const lot = UUID.test(row.controlLotId) ? await repo.findControlLot(db, row.controlLotId) : null;
  if (!lot || !lot.levels.includes(row.level)) throw notFound('Control lot level');
  const level = row.level;

  const units = query.units ?? lab.preferredUnits;
  const shown = displayUnitFor(procedure.analyte, units);
  const value = (x: number) => convertValue(x, shown);
  const spread = (x: number) => convertSpread(x, shown);

  // The lab's own monthly figures for this procedure and lot (every level), up to the period.
  const own = await repo.summariesOf(db, [procedure.id], lot.id, period);
  const ownLevel = own.filter((s) => s.level === level);
  if (!ownLevel.some((s) => s.period === period)) {
    throw notFound(`Data of ${procedure.code}, lot ${lot.lotNumber}, level ${level} in ${period}`);
  }
  const trendRows = ownLevel.slice(-TREND_PERIODS);
  const trendPeriods = trendRows.map((s) => s.period);

  // Peer figures: the procedure's group at each tier, the statistics of the trend periods.
  const parts = await loadPeerKeyParts(db, [procedure.id]);
  const groups = (await resolvePeerMembership(db, lot.id, parts, { create: false })).get(procedure.id) ?? {};
  const groupIds = PEER_TIERS.flatMap((tier) => (groups[tier] ? [groups[tier].id] : []));
  const versions = await repo.publishedVersions(db, trendPeriods);
  const statistics = await repo.peerStatisticsOf(db, groupIds, trendPeriods, [0, ...versions.values()]);

  const statisticsAt = (tier: PeerTierName, lvl: number, p: string, scope: 'period' | 'cumulative') => {
    const group = groups[tier];
    if (!group) return undefined;
    const version = versions.get(p) ?? 0;
    const at = (v: number) =>
      statistics.find(
        (r) =>
          r.peerGroupId === group.id &&
          r.level === lvl &&
          r.period === p &&
          r.scope === scope &&
          r.version === v,
      );
    // Lot-to-date figures fall back to the provisional ones when a snapshot holds none (as the report does).
    return scope === 'period' ? at(version) : (at(version) ?? at(0));
  };
  const usable = (r: repo.PeerStatisticsRow | undefined): r is repo.PeerStatisticsRow =>
    Boolean(r && r.sufficient && r.mean !== null && r.sd !== null);
  const choosePeer = (lvl: number, p: string, scope: 'period' | 'cumulative'): Chosen | null => {
    for (const tier of PEER_TIERS) {
      const r = statisticsAt(tier, lvl, p, scope);
      if (usable(r)) return { tier, row: r, published: r.version > 0 };
    }
    return null;
  };

  // Parts that cannot be computed are listed with the reason; the rest of the drill-down still is.
  const notComputable: string[] = [];

  // 1. Trend of SDI, CVR and bias.
  const trend: TrendPoint[] = trendRows.map((s) => {
    const chosen = choosePeer(level, s.period, 'period');
    const comparison = chosen ? compare(figuresOf(s), peerFiguresOfRow(chosen)) : null;
    if (comparison?.problem) notComputable.push(`${s.period}: ${comparison.problem}`);
    const position = comparison?.standing ?? null;
    return {
      period: s.period,
      sdi: position?.sdi ?? null,
      cvr: position?.cvr ?? null,
      biasPct: position?.biasPct ?? null,
      labMean: value(s.mean),
      labSd: spread(s.sd),
      peerMean: chosen ? value(chosen.row.mean!) : null,
      peerSd: chosen ? spread(chosen.row.sd!) : null,
      tier: chosen?.tier ?? null,
      published: chosen?.published ?? false,
      notComputable: comparison?.problem ?? null,
    };
  });

  const current = choosePeer(level, period, 'period');

  // 2. Distribution of the member labs' means (anonymous: only the value, ours marked), sorted by value.
  let distribution: Drilldown['distribution'] = null;
  let twoLevel: Drilldown['twoLevel'] = null;
  if (current) {
    const members = current.row.members;
    const excludedIds = new Set(current.row.excluded.map((e) => e.id));
    const memberData = await repo.summariesInPeriod(db, members, lot.id, period);
    distribution = {
      labMeans: memberData
        .filter((s) => s.level === level)
        .map((s) => ({
          mean: value(s.mean),
          own: s.procedureId === procedure.id,
          excluded: excludedIds.has(s.procedureId),
        }))
        .sort((a, b) => a.mean - b.mean),
      peerMean: value(current.row.mean!),
      peerSd: spread(current.row.sd!),
    };

    // 3. Two-level SDI plot at the row's tier: every lab of the group with data at both levels.
    const levels = [...lot.levels].sort((a, b) => a - b);
    if (levels.length >= 2) {
      const pair: [number, number] = levels.slice(0, 2).includes(level)
        ? [levels[0], levels[1]]
        : [levels[0], level];
      const peerAt = pair.map((l) => statisticsAt(current.tier, l, period, 'period'));
      if (peerAt.every((r) => usable(r) && r.sd! > 0)) {
        const [p1, p2] = peerAt as repo.PeerStatisticsRow[];
        const ids = [...new Set([...p1.members, ...p2.members])];
        const data =
          ids.length === members.length && ids.every((id) => members.includes(id))
            ? memberData
            : await repo.summariesInPeriod(db, ids, lot.id, period);
        const points: NonNullable<Drilldown['twoLevel']>['points'] = [];
        for (const id of ids) {
          const a = data.find((s) => s.procedureId === id && s.level === pair[0]);
          const b = data.find((s) => s.procedureId === id && s.level === pair[1]);
          if (!a || !b) continue;
          const point = {
            sdi1: (a.mean - p1.mean!) / p1.sd!,
            sdi2: (b.mean - p2.mean!) / p2.sd!,
            own: id === procedure.id,
          };
          if (Number.isFinite(point.sdi1) && Number.isFinite(point.sdi2)) points.push(point);
          else if (point.own) notComputable.push('Two-level plot: your SDI is not a finite number.');
        }
        points.sort((x, y) => x.sdi1 - y.sdi1 || x.sdi2 - y.sdi2);
        twoLevel = { levels: pair, points };
      }
    }
  }

  // 4. Levey-Jennings chart with the multirule re-evaluated against the chosen target.
  const leveyJennings = await leveyJenningsOf(db, {
    procedureId: procedure.id,
    controlLotId: lot.id,
    period,
    level,
    kind: query.target,
    labTarget: (lvl) =>
      labTarget(
        own.filter((s) => s.level === lvl),
        period,
      ),
    problem: (reason) => notComputable.push(`Levey-Jennings chart: ${reason}`),
    peerTarget: (lvl) => {
      const toDate = choosePeer(lvl, period, 'cumulative');
      if (toDate && toDate.row.sd! > 0)
        return { basis: 'peer-to-date', mean: toDate.row.mean!, sd: toDate.row.sd! };
      const inPeriod = choosePeer(lvl, period, 'period');
      if (inPeriod && inPeriod.row.sd! > 0)
        return { basis: 'peer-period', mean: inPeriod.row.mean!, sd: inPeriod.row.sd! };
      return null;
    },
  });

  // 5. Measurement uncertainty over the trend periods (docs/methods.md §3, Nordtest TR 537).
  const { uncertainty, uncertaintyNote } = uncertaintyOf(
    trendRows,
    trend.flatMap((t) => {
      const chosen = t.biasPct !== null ? choosePeer(level, t.period, 'period') : null;
      // u(Cref) from the between-lab dispersion of the lab means: the robust s* published with the figures.
      const row = chosen?.row;
      return row && t.biasPct !== null && row.robustSd !== null && row.robustSd >= 0 && row.mean
        ? [
            {
              period: t.period,
              biasPct: t.biasPct,
              uRefPct: peerMeanUncertaintyPct(row.robustSd, row.mean, row.labs),
            },
          ]
        : [];
    }),
  );

  return {
    period,
    procedure: { id: procedure.id, code: procedure.code },
    analyte: { code: procedure.analyte.code, name: procedure.analyte.name },
    controlLot: { id: lot.id, lotNumber: lot.lotNumber },
    level,
    units,
    unit: shown.unit,
    decimals: shown.decimals,
    peer: current ? { tier: current.tier, labs: current.row.labs } : null,
    trend,
    distribution,
    twoLevel,
    leveyJennings: {
      target: leveyJennings.target && {
        ...leveyJennings.target,
        mean: value(leveyJennings.target.mean),
        sd: spread(leveyJennings.target.sd),
      },
      points: leveyJennings.points.map((p) => ({ ...p, value: value(p.value) })),
      runs: leveyJennings.runs,
    },
    uncertainty: uncertainty && {
      ...uncertainty,
      longTerm: {
        ...uncertainty.longTerm,
        mean: value(uncertainty.longTerm.mean),
        sd: spread(uncertainty.longTerm.sd),
      },
    },
    uncertaintyNote,
    notComputable,
  };
}

/** The chosen peer statistics in the shape the row comparison takes. */
function peerFiguresOfRow(chosen: Chosen): PeerFigures {
  const r = chosen.row;
  return {
    tier: chosen.tier,
    labs: r.labs,
    n: r.n,
    mean: r.mean!,
    sd: r.sd!,
    cv: r.cv,
    withinCv: r.withinCv,
  };
}

type Target = {
  basis: 'established' | 'this-period' | 'peer-to-date' | 'peer-period';
  mean: number;
  sd: number;
};

/**
 * The lab's own target for a level: its figures from the periods before this one pooled (docs/methods.md §1),
 * or this period's own figures when there are none.
 */
export function labTarget(history: readonly repo.SummaryRow[], period: string): Target | null {
  const earlier = history.filter((h) => h.period < period);
  if (earlier.length > 0) {
    const pooled = pool(earlier);
    if (pooled.n >= 2 && pooled.sd > 0) return { basis: 'established', mean: pooled.mean, sd: pooled.sd };
  }
  const now = history.find((h) => h.period === period);
  return now && now.n >= 2 && now.sd > 0 ? { basis: 'this-period', mean: now.mean, sd: now.sd } : null;
}

/**
 * The period's daily values of the procedure and lot, evaluated with the multirule against the chosen
 * target of every level (across-level rules need all levels), then the row's level picked out. Points are
 * ordered as the ingest worker orders them: a run's points together (by time, then level), runs by the
 * time of their first point; a value without a run id forms a run with the values measured at the same moment.
 */
async function leveyJenningsOf(
  db: Database,
  input: {
    procedureId: string;
    controlLotId: string;
    period: string;
    level: number;
    kind: 'lab' | 'peer';
    labTarget: (level: number) => Target | null;
    peerTarget: (level: number) => Target | null;
    /** Told why the chart cannot be computed, when it cannot. */
    problem: (reason: string) => void;
  },
) {
  const values = await repo.dailyValues(db, input.procedureId, input.controlLotId, input.period);
  const targets = new Map<number, Target>();
  for (const lvl of new Set(values.map((v) => v.level))) {
    const target = input.kind === 'lab' ? input.labTarget(lvl) : input.peerTarget(lvl);
    if (target) targets.set(lvl, target);
  }
  const target =
    targets.get(input.level) ??
    (input.kind === 'lab' ? input.labTarget(input.level) : input.peerTarget(input.level));
  const empty = { target: target ? { kind: input.kind, ...target } : null, points: [], runs: [] };
  if (!target || !values.some((v) => v.level === input.level)) return empty;

  const runOf = (v: (typeof values)[number]) => v.run ?? `at:${v.measuredAt.toISOString()}`;
  const runStart = new Map<string, number>();
  for (const v of values) {
    const run = runOf(v);
    const start = runStart.get(run);
    if (start === undefined || v.measuredAt.getTime() < start) runStart.set(run, v.measuredAt.getTime());
  }
  const ordered = values
    .filter((v) => targets.has(v.level))
    .sort((a, b) => {
      const ra = runOf(a);
      const rb = runOf(b);
      if (ra !== rb) {
        const sa = runStart.get(ra)!;
        const sb = runStart.get(rb)!;
        return sa !== sb ? sa - sb : ra < rb ? -1 : 1;
      }
      return a.measuredAt.getTime() - b.measuredAt.getTime() || a.level - b.level || a.id - b.id;
    });
  const points: ControlPoint[] = ordered.map((v) => ({ run: runOf(v), level: v.level, value: v.value }));
  const record: Record<number, { mean: number; sd: number }> = {};
  for (const [lvl, t] of targets) record[lvl] = { mean: t.mean, sd: t.sd };
  let result: ReturnType<typeof evaluateMultirule>;
  try {
    result = evaluateMultirule(points, record);
  } catch (error) {
    input.problem(`the multirule evaluation failed: ${(error as Error).message}`);
    return empty;
  }

  const mine = result.points.flatMap((p, i) =>
    p.level === input.level
      ? [
          {
            measuredAt: ordered[i].measuredAt.toISOString(),
            run: p.run,
            value: p.value,
            z: p.z,
            rules: [...p.rules],
          },
        ]
      : [],
  );
  const myRuns = new Set(result.points.filter((p) => p.level === input.level).map((p) => p.run));
  return {
    target: { kind: input.kind, ...target },
    points: mine,
    runs: result.runs
      .filter((r) => myRuns.has(r.run))
      .map((r) => ({ run: r.run, verdict: r.verdict, rules: [...r.rules] })),
  };
}

/** Nordtest uncertainty from the lab's pooled figures over the trend periods and its peer comparisons. */
function uncertaintyOf(
  trendRows: readonly repo.SummaryRow[],
  comparisons: { period: string; biasPct: number; uRefPct: number }[],
): { uncertainty: Drilldown['uncertainty']; uncertaintyNote: string | null } {
  const longTerm = pool(trendRows);
  const cv = longTerm.mean !== 0 ? (100 * longTerm.sd) / Math.abs(longTerm.mean) : NaN;
  if (!(cv > 0))
    return {
      uncertainty: null,
      uncertaintyNote: 'The lab’s figures show no spread, so u(Rw) cannot be estimated.',
    };
  if (comparisons.length === 0) {
    return {
      uncertainty: null,
      uncertaintyNote:
        'No period has a peer comparison yet, so the bias component (and the uncertainty) cannot be estimated.',
    };
  }
  const k = 2;
  let u: ReturnType<typeof measurementUncertainty>;
  try {
    u = measurementUncertainty({ cvPct: cv, comparisons, coverageFactor: k });
  } catch (error) {
    return {
      uncertainty: null,
      uncertaintyNote: `The measurement uncertainty cannot be computed: ${(error as Error).message}`,
    };
  }
  return {
    uncertainty: {
      ...u,
      k,
      longTerm: { periods: trendRows.length, n: longTerm.n, mean: longTerm.mean, sd: longTerm.sd, cv },
      comparisons,
    },
    uncertaintyNote:
      comparisons.length < 6
        ? `Based on ${comparisons.length} peer comparison${comparisons.length === 1 ? '' : 's'} only; more periods give a steadier bias estimate.`
        : null,
  };
}
