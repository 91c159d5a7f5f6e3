import { evaluateTea, pool, sigmaMetric } from '@plumbline/stats';
import {
  PEER_TIERS,
  hasPendingPeerStatistics,
  resolvePeerMembershipByLot,
  type Database,
  thresholds,
} from '@plumbline/db';
import type {
  LabFigures,
  PeerFigures,
  PeerReport,
  PeerReportRow,
  ReportFlag,
  UnitSystem,
} from '@plumbline/contracts';
import type { Principal } from '../../auth/principal.ts';
import { assertLabAccess } from '../../auth/authenticate.ts';
import { notFound } from '../../errors/app-error.ts';
import { cvrFlag, exclusionFlag, peerNote, sdiFlag, tierDescription, type TierCandidate } from './flags.ts';
import {
  compare,
  figuresOf,
  finiteRow,
  notComputableRow,
  type Figures,
  type RowIdentity,
} from './report-row.ts';
import * as repo from './peer-report.repository.ts';
import { convertSpread, convertValue, displayUnitFor, type DisplayUnit } from '../../units/convert.ts';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export type PeerReportSettings = {
  minLabs?: number;
  /** Unit system of means and SDs; default the lab's preferred units. */
  units?: UnitSystem;
};

/**
 * A lab's report for one period: per procedure, control lot and level its own figures beside the peer
 * figures of the narrowest tier with enough labs, with SDI, CVR, bias, sigma and flags, and the same
 * comparison lot to date. Peer figures come from the latest published version of the period, or the
 * provisional ones (version 0) while nothing is published.
 */
export async function buildPeerReport(
  db: Database,
  principal: Principal,
  labId: string,
  period: string,
  settings: PeerReportSettings = {},
): Promise<PeerReport> {
  assertLabAccess(principal, labId);
  if (!UUID.test(labId)) throw notFound('Lab');
  // Every query reads only the lab's own rows and its groups' figures; independent ones run together
  // (three round trips in all).
  const [lab, publication, summaries, statisticsPending] = await Promise.all([
    repo.findLab(db, labId),
    repo.latestPublication(db, period),
    repo.labSummaries(db, labId, period),
    hasPendingPeerStatistics(db, period),
  ]);
  if (!lab) throw notFound('Lab');
  const minLabs = settings.minLabs ?? thresholds().peerMinLabs;
  const units: UnitSystem = settings.units ?? (lab.preferredUnits === 'conventional' ? 'conventional' : 'si');
  const version = publication?.version ?? 0;
  const procedureIds = [...new Set(summaries.map((s) => s.procedureId))];

  // Peer group of each procedure at each tier, per control lot.
  const procedureIdsByLot = new Map<string, string[]>();
  for (const s of summaries) {
    const ids = procedureIdsByLot.get(s.controlLotId) ?? [];
    if (!ids.includes(s.procedureId)) ids.push(s.procedureId);
    procedureIdsByLot.set(s.controlLotId, ids);
  }
  // A published version is read by the membership frozen in its snapshot, not today's grouping.
  const [memberships, toDate, snapshot] = await Promise.all([
    resolvePeerMembershipByLot(db, procedureIdsByLot),
    repo.summariesToDate(db, procedureIds, period),
    repo.publishedSnapshot(db, [...procedureIdsByLot.keys()], procedureIds, period, version),
  ]);
  const groupIds = new Set<string>();
  for (const membership of memberships.values()) {
    for (const groups of membership.values())
      for (const g of Object.values(groups)) if (g) groupIds.add(g.id);
  }
  // Groups the last recompute could not compute: a provisional row that would be compared with one says so.
  const [statistics, failures] = await Promise.all([
    repo.peerStatisticsFor(db, [...groupIds], period, [...new Set([0, version])]),
    version === 0 ? repo.statisticsFailuresFor(db, [...groupIds], period) : [],
  ]);

  const statisticsByKey = firstByKey(
    statistics,
    (r) => `${r.peerGroupId}|${r.level}|${r.scope}|${r.version}`,
  );
  const statisticsOf = (groupId: string, level: number, scope: 'period' | 'cumulative') => {
    const at = (v: number) => statisticsByKey.get(`${groupId}|${level}|${scope}|${v}`);
    // Lot-to-date figures fall back to the provisional ones when a snapshot holds none.
    return scope === 'period' ? at(version) : (at(version) ?? at(0));
  };
  const snapshotByKey = firstByKey(
    snapshot,
    (r) => `${r.controlLotId}|${r.procedureId}|${r.tier}|${r.level}|${r.scope}`,
  );
  const snapshotRow = (
    s: { controlLotId: string; procedureId: string; level: number },
    tier: string,
    scope: string,
  ) => snapshotByKey.get(`${s.controlLotId}|${s.procedureId}|${tier}|${s.level}|${scope}`);
  const failureByKey = firstByKey(failures, (f) => `${f.peerGroupId}|${f.level}|${f.scope}`);
  const failureOf = (groupId: string, level: number, scope: 'period' | 'cumulative') =>
    failureByKey.get(`${groupId}|${level}|${scope}`);
  // The lab's summaries to date per procedure, lot and level, in period order.
  const toDateByKey = new Map<string, typeof toDate>();
  for (const t of toDate) {
    const key = `${t.procedureId}|${t.controlLotId}|${t.level}`;
    const list = toDateByKey.get(key) ?? [];
    list.push(t);
    toDateByKey.set(key, list);
  }

  const rowOf = (s: repo.LabSummaryRow): PeerReportRow => {
    const groups = memberships.get(s.controlLotId)?.get(s.procedureId) ?? {};
    const choose = (scope: 'period' | 'cumulative') => {
      const candidates: (TierCandidate & { row: repo.PeerStatisticsRow | undefined })[] = PEER_TIERS.map(
        (tier) => {
          const group = groups[tier];
          const row =
            snapshotRow(s, tier, scope) ?? (group ? statisticsOf(group.id, s.level, scope) : undefined);
          return {
            tier,
            labs: row ? row.labs : null,
            sufficient: Boolean(row?.sufficient && row.mean !== null && row.sd !== null),
            row,
          };
        },
      );
      const chosen = candidates.find((c) => c.sufficient);
      // A narrower group without figures because they failed might have been the one to compare with.
      const narrower = chosen ? candidates.slice(0, candidates.indexOf(chosen)) : candidates;
      const failed = narrower
        .map((c) => {
          const group = groups[c.tier];
          return { tier: c.tier, failure: !c.row && group ? failureOf(group.id, s.level, scope) : undefined };
        })
        .find((c) => c.failure);
      const problem = failed?.failure
        ? `The peer figures of the group with ${tierDescription[failed.tier]} could not be computed: ${failed.failure.reason}`
        : null;
      return { candidates, chosen: problem ? undefined : chosen, problem };
    };

    const labFigures = figuresOf(s);
    const current = choose('period');
    const peer = current.chosen ? peerFiguresOf(current.chosen.tier, current.chosen.row!) : null;
    const comparison = peer ? compare(labFigures, peer) : null;
    const position = comparison?.standing ?? null;
    const problem = current.problem ?? comparison?.problem ?? null;

    const labToDateParts = toDateByKey.get(`${s.procedureId}|${s.controlLotId}|${s.level}`) ?? [];
    const labToDate = labToDateParts.length
      ? figuresOf(labToDateParts.length === 1 ? labToDateParts[0] : pool(labToDateParts))
      : null;
    const cumulative = choose('cumulative');
    const peerToDate = cumulative.chosen
      ? peerFiguresOf(cumulative.chosen.tier, cumulative.chosen.row!)
      : null;
    const comparisonToDate = labToDate && peerToDate ? compare(labToDate, peerToDate) : null;
    const positionToDate = comparisonToDate?.standing ?? null;
    const problemToDate = cumulative.problem ?? comparisonToDate?.problem ?? null;

    const excludedEntry = current.chosen?.row?.excluded.find((e) => e.id === s.procedureId);
    const excluded = excludedEntry
      ? { reason: excludedEntry.reason, note: excludedEntry.note ?? null }
      : null;

    const tea = peer ? teaAt(s.analyte, peer.mean) : null;
    const sigma =
      position && tea && labFigures.cv !== null && labFigures.cv > 0
        ? sigmaMetric(tea.pct, position.biasPct, labFigures.cv)
        : null;

    const flags: ReportFlag[] = [];
    if (position) flags.push(sdiFlag(position.sdi), cvrFlag(position.cvr));
    if (excluded) flags.push(exclusionFlag(excluded));

    // Everything is computed in the canonical unit; only the means and SDs shown are converted.
    const shown = displayUnitFor(
      { ...s.analyte, conventionalUnit: s.conventionalUnit, molarMass: s.molarMass },
      units,
    );
    return finiteRow({
      ...identityOf(s, shown),
      lab: labFiguresIn(labFigures, shown),
      peer: peer && peerFiguresIn(peer, shown),
      peerNote: peerNote(current.candidates, minLabs),
      sdi: position?.sdi ?? null,
      cvr: position?.cvr ?? null,
      biasPct: position?.biasPct ?? null,
      sigma: sigma !== null && Number.isFinite(sigma) ? sigma : null,
      tea,
      cumulative: {
        lab: labToDate && labFiguresIn(labToDate, shown),
        peer: peerToDate && peerFiguresIn(peerToDate, shown),
        sdi: positionToDate?.sdi ?? null,
        cvr: positionToDate?.cvr ?? null,
        notComputable: problemToDate ? { reason: problemToDate } : null,
      },
      excluded,
      flags,
      notComputable: problem ? { reason: problem } : null,
    });
  };

  // Row by row: a row that throws is shown as not computable and the other rows stay as they are.
  const rows = summaries.map((s) => {
    try {
      return rowOf(s);
    } catch (error) {
      const reason = `The figures of this row could not be computed: ${(error as Error).message}`;
      return notComputableRow(identityOf(s, null), figuresOf(s), { reason });
    }
  });

  return {
    period,
    lab: { id: lab.id, code: lab.code, name: lab.name },
    units,
    published: publication
      ? { version: publication.version, publishedAt: publication.publishedAt.toISOString() }
      : null,
    statisticsPending,
    rows,
  };
}

/** Rows by key; the first row wins where several share a key (as a search from the start would find). */
function firstByKey<T>(rows: readonly T[], keyOf: (row: T) => string): Map<string, T> {
  const map = new Map<string, T>();
  for (const row of rows) {
    const key = keyOf(row);
    if (!map.has(key)) map.set(key, row);
  }
  return map;
}

/** A row's identity; with no display unit (something failed before it was known), the canonical unit. */
function identityOf(s: repo.LabSummaryRow, shown: DisplayUnit | null): RowIdentity {
  return {
    procedure: { id: s.procedureId, code: s.procedureCode },
    analyte: s.analyte,
    controlLot: { id: s.controlLotId, lotNumber: s.lotNumber },
    level: s.level,
    unit: shown?.unit ?? s.analyte.unit,
    canonicalUnit: s.analyte.unit,
    decimals: shown?.decimals ?? s.analyte.decimals,
    source: s.source === 'values' ? 'values' : 'summary',
    late: s.late,
  };
}

function labFiguresIn(figures: Figures, unit: DisplayUnit): LabFigures {
  return { ...figures, mean: convertValue(figures.mean, unit), sd: convertSpread(figures.sd, unit) };
}

function peerFiguresIn(figures: PeerFigures, unit: DisplayUnit): PeerFigures {
  return { ...figures, mean: convertValue(figures.mean, unit), sd: convertSpread(figures.sd, unit) };
}

function peerFiguresOf(tier: PeerFigures['tier'], row: repo.PeerStatisticsRow): PeerFigures {
  return { tier, labs: row.labs, n: row.n, mean: row.mean!, sd: row.sd!, cv: row.cv, withinCv: row.withinCv };
}

/**
 * The analyte's total allowable error rule ("± absolute or ± %, whichever is greater") evaluated at a
 * control level's concentration; null when no rule is set or it has no value there (an absolute limit
 * at concentration 0).
 */
function teaAt(
  analyte: { teaPct: number | null; teaAbsolute: number | null },
  concentration: number,
): { pct: number; governing: 'absolute' | 'percent' | 'both' } | null {
  if (analyte.teaPct === null && analyte.teaAbsolute === null) return null;
  try {
    const tea = evaluateTea({ absolute: analyte.teaAbsolute, percent: analyte.teaPct }, concentration);
    return { pct: tea.teaPct, governing: tea.governing };
  } catch {
    return null;
  }
}
