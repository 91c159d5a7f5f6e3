// The peer groups of one control lot and analyte held in memory, so a preview can compute the
// figures of a would-be arrangement with @plumbline/stats without writing anything. The grouping
// rule is the one the recompute uses (packages/db/src/queries/peer-groups.ts): a coordinator's
// assignment first, else the group of the derived key, and a merged group stands for the group it
// was merged into.
import { peerStatistics as computePeerStatistics } from '@plumbline/stats';
import { PEER_TIERS, derivedPeerKey, type PeerKeyParts, type PeerTierName } from '@plumbline/db';
import type { PeerGroupFigures, PreviewGroup } from '@plumbline/contracts';

export type GroupRow = {
  id: string;
  tier: PeerTierName;
  key: string;
  label: string;
  mergedIntoId: string | null;
};
export type AssignmentRow = { procedureId: string; tier: PeerTierName; peerGroupId: string };
export type Layout = { groups: readonly GroupRow[]; assignments: readonly AssignmentRow[] };

export type LabRef = { id: string; code: string; name: string };
export type ProcedureInfo = PeerKeyParts & { code: string; lab: LabRef };

/** One member's monthly figures for a level and period. */
export type SummaryEntry = {
  procedureId: string;
  level: number;
  n: number;
  mean: number;
  sd: number;
  late: boolean;
};

/** A coordinator's exclusion in force: the procedure, the level it covers (null = every level) and why. */
export type ExclusionEntry = { procedureId: string; level: number | null; reason: string };

/** procedure id → its group at each tier. */
export type Membership = Map<string, Partial<Record<PeerTierName, GroupRow>>>;

/** Follows merges to the surviving group; a cycle (a data error) stops after 20 hops, as the recompute does. */
export function survivingGroup(byId: ReadonlyMap<string, GroupRow>, groupId: string): GroupRow | undefined {
  let group = byId.get(groupId);
  for (let hops = 0; group?.mergedIntoId && hops < 20; hops++) {
    const next = byId.get(group.mergedIntoId);
    if (!next) break;
    group = next;
  }
  return group;
}

export function resolveMembership(layout: Layout, procedures: readonly PeerKeyParts[]): Membership {
  const byId = new Map(layout.groups.map((g) => [g.id, g]));
  const byKey = new Map(layout.groups.map((g) => [`${g.tier}|${g.key}`, g]));
  const assigned = new Map(layout.assignments.map((a) => [`${a.procedureId}|${a.tier}`, a.peerGroupId]));
  const membership: Membership = new Map();
  for (const p of procedures) {
    const entry: Partial<Record<PeerTierName, GroupRow>> = {};
    for (const tier of PEER_TIERS) {
      const start = assigned.get(`${p.id}|${tier}`) ?? byKey.get(`${tier}|${derivedPeerKey(tier, p)}`)?.id;
      const group = start ? survivingGroup(byId, start) : undefined;
      if (group) entry[tier] = group;
    }
    membership.set(p.id, entry);
  }
  return membership;
}

/** The procedures that resolve to a group. */
export function membersOf(membership: Membership, group: Pick<GroupRow, 'id' | 'tier'>): string[] {
  const ids: string[] = [];
  for (const [procedureId, groups] of membership)
    if (groups[group.tier]?.id === group.id) ids.push(procedureId);
  return ids;
}

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

/**
 * The figures of a group from its members' summaries (docs/methods.md §2, `peerStatistics`), with the
 * coordinator's exclusions of that level passed as manual exclusions. Null when no member has data;
 * `{ notComputable }` when the statistics cannot be computed (the other groups of a preview still are).
 */
export function groupFigures(
  entries: readonly SummaryEntry[],
  exclusions: readonly ExclusionEntry[],
  minLabs: number,
): PeerGroupFigures | { notComputable: string } | null {
  if (entries.length === 0) return null;
  const exclusionOf = (e: SummaryEntry) =>
    exclusions.find((x) => x.procedureId === e.procedureId && (x.level === null || x.level === e.level));
  const manual = entries.filter((e) => exclusionOf(e));
  let stats: ReturnType<typeof computePeerStatistics>;
  try {
    stats = computePeerStatistics(
      entries.map((e) => ({ id: e.procedureId, n: e.n, mean: e.mean, sd: e.sd })),
      { minLabs, excludeIds: manual.map((e) => e.procedureId) },
    );
  } catch (error) {
    return { notComputable: (error as Error).message };
  }
  return {
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
    excluded: stats.excluded.map((x) => ({
      procedureId: x.id,
      reason: x.reason,
      note: x.reason === 'manual' ? (exclusions.find((e) => e.procedureId === x.id)?.reason ?? null) : null,
    })),
  };
}

/** What the figures of a set of groups would be under a layout and a set of exclusions, for one level. */
export type Scenario = { layout: Layout; exclusions: readonly ExclusionEntry[] };

export function previewGroups(
  scenario: Scenario,
  groupIds: readonly string[],
  context: {
    procedures: readonly ProcedureInfo[];
    summaries: readonly SummaryEntry[];
    level: number;
    minLabs: number;
    /** Groups that exist only in the scenario (a split's new groups) are shown without an id. */
    isNew?: (groupId: string) => boolean;
  },
): PreviewGroup[] {
  const membership = resolveMembership(scenario.layout, context.procedures);
  const byId = new Map(scenario.layout.groups.map((g) => [g.id, g]));
  const procedureById = new Map(context.procedures.map((p) => [p.id, p]));
  const result: PreviewGroup[] = [];
  for (const id of groupIds) {
    const group = byId.get(id);
    if (!group) continue;
    const memberIds = membersOf(membership, group);
    const entries = context.summaries.filter(
      (s) => s.level === context.level && memberIds.includes(s.procedureId),
    );
    result.push({
      id: context.isNew?.(id) ? null : id,
      tier: group.tier,
      label: group.label,
      members: memberIds
        .map((pid) => procedureById.get(pid)!)
        .sort((a, b) => a.lab.code.localeCompare(b.lab.code) || a.code.localeCompare(b.code))
        .map((p) => ({ procedureId: p.id, procedureCode: p.code, lab: p.lab })),
      ...previewFigures(
        groupFigures(
          entries,
          scenario.exclusions.filter((x) => x.level === null || x.level === context.level),
          context.minLabs,
        ),
      ),
    });
  }
  return result;
}

function previewFigures(
  figures: ReturnType<typeof groupFigures>,
): Pick<PreviewGroup, 'figures' | 'notComputable'> {
  if (figures && 'notComputable' in figures) {
    return { figures: null, notComputable: { reason: figures.notComputable } };
  }
  return { figures, notComputable: null };
}
