import { peerStatistics as computePeerStatistics, pool, type PeerStatistics } from '@plumbline/stats';
import type { ExcludedLab, peerStatistics } from '../schema/peer-groups.ts';
import { PEER_TIERS, type PeerMembership } from './peer-groups.ts';
import { thresholds } from '../thresholds.ts';

// The pure part of a recompute: the figures of each peer group from its members' summaries, one group
// at a time, so a group whose figures cannot be computed is reported and the others still are.

export type PeerStatisticsSettings = {
  /** Labs that must remain for figures to be published (docs/methods.md §2: 3, a setting). */
  minLabs?: number;
  /** Replaces the statistics function (tests use it to make one group fail). */
  computeGroupStatistics?: ComputeGroupStatistics;
};

export type SummaryRow = {
  procedureId: string;
  analyteId: string;
  level: number;
  period: string;
  n: number;
  mean: number;
  sd: number;
  /** Set when this procedure's figures could not be pooled (its groups then cannot be computed). */
  problem?: string;
};

export type ExclusionRow = { procedureId: string; level: number | null; period: string; reason: string };

/** Each procedure's to-date figures: its monthly summaries pooled (docs/methods.md §1). */
export function cumulativeByProcedure(rows: readonly SummaryRow[]): SummaryRow[] {
  const byProcedure = new Map<string, SummaryRow[]>();
  for (const r of rows) {
    const list = byProcedure.get(r.procedureId);
    if (list) list.push(r);
    else byProcedure.set(r.procedureId, [r]);
  }
  const result: SummaryRow[] = [];
  for (const [procedureId, parts] of byProcedure) {
    const last = parts[parts.length - 1];
    const base = { procedureId, analyteId: last.analyteId, level: last.level, period: last.period };
    try {
      const pooled = parts.length === 1 ? parts[0] : pool(parts);
      result.push({ ...base, n: pooled.n, mean: pooled.mean, sd: pooled.sd });
    } catch (error) {
      // One procedure's months that cannot be pooled spoil only the groups it belongs to.
      const problem = `the months of one member could not be pooled: ${messageOf(error)}`;
      result.push({ ...base, n: 0, mean: Number.NaN, sd: Number.NaN, problem });
    }
  }
  return result;
}

type GroupFigures = Omit<typeof peerStatistics.$inferInsert, 'level' | 'period' | 'scope' | 'version'>;
export type GroupFailure = { peerGroupId: string; reason: string };

/** Builds the statistics of one group; a seam so tests can make one group's computation fail. */
export type ComputeGroupStatistics = typeof computePeerStatistics;

/**
 * peerStatistics for every group that has members among the entries, at every tier. A group whose
 * figures cannot be computed (the statistics throw, or a member's figures are unusable) is returned
 * among `failures` with the reason, and the other groups are still computed.
 */
export function groupFigures(
  membership: PeerMembership,
  entries: readonly SummaryRow[],
  settings: PeerStatisticsSettings,
  exclusionOf: (procedureId: string) => ExclusionRow | undefined,
): { figures: GroupFigures[]; failures: GroupFailure[] } {
  const members = new Map<string, SummaryRow[]>();
  for (const entry of entries) {
    const groups = membership.get(entry.procedureId);
    if (!groups) continue;
    for (const tier of PEER_TIERS) {
      const group = groups[tier];
      if (!group) continue;
      const list = members.get(group.id);
      if (list) list.push(entry);
      else members.set(group.id, [entry]);
    }
  }
  const figures: GroupFigures[] = [];
  const failures: GroupFailure[] = [];
  const compute = settings.computeGroupStatistics ?? computePeerStatistics;
  for (const [peerGroupId, list] of members) {
    const spoiled = list.find((e) => e.problem);
    if (spoiled?.problem) {
      failures.push({ peerGroupId, reason: spoiled.problem });
      continue;
    }
    const manual = list.filter((e) => exclusionOf(e.procedureId));
    let stats: PeerStatistics;
    try {
      stats = compute(
        list.map((e) => ({ id: e.procedureId, n: e.n, mean: e.mean, sd: e.sd })),
        {
          minLabs: settings.minLabs ?? thresholds().peerMinLabs,
          excludeIds: manual.map((e) => e.procedureId),
        },
      );
    } catch (error) {
      failures.push({ peerGroupId, reason: messageOf(error) });
      continue;
    }
    const broken = stats.sufficient ? nonFiniteFigure(stats) : null;
    if (broken) {
      failures.push({ peerGroupId, reason: broken });
      continue;
    }
    const excluded: ExcludedLab[] = stats.excluded.map((x) => {
      const note = x.reason === 'manual' ? exclusionOf(x.id)?.reason : undefined;
      return note ? { id: x.id, reason: x.reason, note } : { id: x.id, reason: x.reason };
    });
    figures.push({
      peerGroupId,
      labs: stats.labs,
      n: stats.n,
      mean: finiteOrNull(stats.mean),
      sd: finiteOrNull(stats.sd),
      cv: finiteOrNull(stats.cv),
      withinSd: finiteOrNull(stats.withinSd),
      withinCv: finiteOrNull(stats.withinCv),
      robustMean: finiteOrNull(stats.robustMean),
      robustSd: finiteOrNull(stats.robustSd),
      sufficient: stats.sufficient,
      excluded,
      members: list.map((e) => e.procedureId),
    });
  }
  return { figures, failures };
}

/** Names the first of the group's mean, SD and within-lab SD that is not a finite number, if any. */
function nonFiniteFigure(stats: PeerStatistics): string | null {
  const named = [
    ['mean', stats.mean],
    ['SD', stats.sd],
    ['within-lab SD', stats.withinSd],
  ] as const;
  for (const [name, value] of named) {
    if (!Number.isFinite(value)) return `the peer ${name} is not a finite number (${value})`;
  }
  return null;
}

/** The message of a thrown value, cut to a length a notice can show. */
function messageOf(error: unknown): string {
  const text = error instanceof Error ? error.message : String(error);
  return text.length > 500 ? `${text.slice(0, 497)}...` : text;
}

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);
