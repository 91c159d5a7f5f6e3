import { sql } from 'drizzle-orm';
import { peerGroups } from '../schema/peer-groups.ts';
import type { Executor } from '../client.ts';

/** Narrowest first: same instrument model + method + reagent; same method; every procedure for the analyte. */
export const PEER_TIERS = ['instrument', 'method', 'analyte'] as const;
export type PeerTierName = (typeof PEER_TIERS)[number];

/** What a procedure's peer group keys are made of, with names for the group labels. */
export type PeerKeyParts = {
  id: string;
  analyteId: string;
  analyteName: string;
  instrumentModelId: string;
  instrumentModelName: string;
  methodId: string;
  methodName: string;
  reagentId: string;
  reagentName: string;
};

export type PeerGroupRef = { id: string; tier: PeerTierName; key: string; label: string };

/** procedure id → the group it belongs to at each tier (after assignments and merges). */
export type PeerMembership = Map<string, Partial<Record<PeerTierName, PeerGroupRef>>>;

/** The grouping rule: the key a procedure falls under at a tier unless the coordinator assigned it elsewhere. */
export function derivedPeerKey(tier: PeerTierName, p: PeerKeyParts): string {
  if (tier === 'instrument') return `instrument:${p.instrumentModelId}:${p.methodId}:${p.reagentId}`;
  if (tier === 'method') return `method:${p.methodId}`;
  return `analyte:${p.analyteId}`;
}

function derivedLabel(tier: PeerTierName, p: PeerKeyParts): string {
  if (tier === 'instrument') return `${p.instrumentModelName} · ${p.methodName} · ${p.reagentName}`;
  if (tier === 'method') return `${p.methodName} (every instrument and reagent)`;
  return `All procedures for ${p.analyteName}`;
}

/** A coordinator's assignment of a procedure to a group at a tier. */
export type PeerAssignmentRow = { procedureId: string; tier: PeerTierName; peerGroupId: string };

/** Procedures with what their peer group keys are made of, and the names for labels. */
export async function loadPeerKeyParts(
  db: Executor,
  procedureIds: readonly string[],
): Promise<PeerKeyParts[]> {
  // Plain SQL with the ids as one array parameter: the ingest worker calls this for every upload, and
  // building the equivalent query with the query builder cost more than running it.
  const result: PeerKeyParts[] = [];
  for (let i = 0; i < procedureIds.length; i += 5000) {
    const chunk = procedureIds.slice(i, i + 5000);
    const rows = await db.execute<PeerKeyParts>(sql`
      select p.id, p.analyte_id as "analyteId", a.name as "analyteName",
             p.instrument_model_id as "instrumentModelId", im.name as "instrumentModelName",
             p.method_id as "methodId", m.name as "methodName", p.reagent_id as "reagentId", r.name as "reagentName"
        from procedures p
        join analytes a on a.id = p.analyte_id
        join instrument_models im on im.id = p.instrument_model_id
        join methods m on m.id = p.method_id
        join reagents r on r.id = p.reagent_id
       where p.id = any(${sql.param(chunk)}::uuid[])`);
    result.push(...rows.rows);
  }
  return result;
}

/** A peer group as membership needs it. */
export type PeerGroupRow = {
  id: string;
  analyteId: string;
  tier: PeerTierName;
  key: string;
  label: string;
  mergedIntoId: string | null;
};

/**
 * Resolves each procedure's peer group at every tier for one control lot (each procedure within its
 * analyte): the coordinator's assignment when there is one, otherwise the group of the derived key; a
 * merged group resolves to the group it was merged into. With `create`, missing derived groups are made.
 */
export async function resolvePeerMembership(
  db: Executor,
  controlLotId: string,
  parts: readonly PeerKeyParts[],
  options: { create: boolean },
): Promise<PeerMembership> {
  if (parts.length === 0) return new Map();

  const analyteIds = [...new Set(parts.map((p) => p.analyteId))];
  const loadGroups = async () =>
    (
      await db.execute<PeerGroupRow>(sql`
        select id, analyte_id as "analyteId", tier, key, label, merged_into_id as "mergedIntoId"
          from peer_groups
         where control_lot_id = ${controlLotId} and analyte_id = any(${sql.param(analyteIds)}::uuid[])`)
    ).rows;
  let groups = await loadGroups();

  if (options.create) {
    const byKey = new Map(groups.map((g) => [`${g.analyteId}|${g.tier}|${g.key}`, g]));
    // A group is made once, for a derived key that has none yet.
    const missing = new Map<string, { part: PeerKeyParts; tier: PeerTierName; key: string }>();
    for (const p of parts) {
      for (const tier of PEER_TIERS) {
        const key = derivedPeerKey(tier, p);
        const id = `${p.analyteId}|${tier}|${key}`;
        if (!byKey.has(id) && !missing.has(id)) missing.set(id, { part: p, tier, key });
      }
    }
    if (missing.size > 0) {
      const values = [...missing.values()].map((m) => ({
        controlLotId,
        analyteId: m.part.analyteId,
        tier: m.tier,
        key: m.key,
        label: derivedLabel(m.tier, m.part),
      }));
      for (let i = 0; i < values.length; i += 1000) {
        await db
          .insert(peerGroups)
          .values(values.slice(i, i + 1000))
          .onConflictDoNothing();
      }
      groups = await loadGroups();
    }
  }
  // A lot has few assignments: read them all rather than sending every procedure id.
  const assignments = (
    await db.execute<PeerAssignmentRow>(sql`
      select procedure_id as "procedureId", tier, peer_group_id as "peerGroupId"
        from peer_group_assignments
       where control_lot_id = ${controlLotId}`)
  ).rows;
  return membershipFromRows(parts, groups, assignments);
}

/**
 * resolvePeerMembership (without creating groups) for several control lots at once, in three parallel
 * queries whatever the number of lots: `procedureIdsByLot` maps each control lot to the procedures to place.
 * Reads only the lots' groups of those procedures' analytes and those procedures' assignments.
 */
export async function resolvePeerMembershipByLot(
  db: Executor,
  procedureIdsByLot: ReadonlyMap<string, readonly string[]>,
): Promise<Map<string, PeerMembership>> {
  const result = new Map<string, PeerMembership>();
  const procedureIds = [...new Set([...procedureIdsByLot.values()].flat())];
  if (procedureIds.length === 0) return result;
  const lotIds = [...procedureIdsByLot.keys()];
  // The three reads are independent: the groups are those of the procedures' analytes, found in SQL.
  const [parts, groups, assignments] = await Promise.all([
    loadPeerKeyParts(db, procedureIds),
    db.execute<PeerGroupRow & { controlLotId: string }>(sql`
      select id, control_lot_id as "controlLotId", analyte_id as "analyteId", tier, key, label,
             merged_into_id as "mergedIntoId"
        from peer_groups
       where control_lot_id = any(${sql.param(lotIds)}::uuid[])
         and analyte_id in (select analyte_id from procedures where id = any(${sql.param(procedureIds)}::uuid[]))`),
    db.execute<PeerAssignmentRow & { controlLotId: string }>(sql`
      select procedure_id as "procedureId", control_lot_id as "controlLotId", tier, peer_group_id as "peerGroupId"
        from peer_group_assignments
       where control_lot_id = any(${sql.param(lotIds)}::uuid[])
         and procedure_id = any(${sql.param(procedureIds)}::uuid[])`),
  ]);
  const partById = new Map(parts.map((p) => [p.id, p]));
  for (const [lotId, ids] of procedureIdsByLot) {
    const lotParts = ids.map((id) => partById.get(id)).filter((p): p is PeerKeyParts => p !== undefined);
    // As resolvePeerMembership: the lot's groups of the analytes of the procedures placed in it.
    const lotAnalytes = new Set(lotParts.map((p) => p.analyteId));
    result.set(
      lotId,
      lotParts.length === 0
        ? new Map()
        : membershipFromRows(
            lotParts,
            groups.rows.filter((g) => g.controlLotId === lotId && lotAnalytes.has(g.analyteId)),
            assignments.rows.filter((a) => a.controlLotId === lotId),
          ),
    );
  }
  return result;
}

/**
 * The membership rule of resolvePeerMembership on rows already read: `groups` must hold the lot's groups
 * of the parts' analytes, `assignments` the lot's assignments.
 */
export function membershipFromRows(
  parts: readonly PeerKeyParts[],
  groups: readonly PeerGroupRow[],
  assignments: readonly PeerAssignmentRow[],
): PeerMembership {
  const membership: PeerMembership = new Map();
  const byKey = new Map(groups.map((g) => [`${g.analyteId}|${g.tier}|${g.key}`, g]));
  const byId = new Map(groups.map((g) => [g.id, g]));
  const assigned = new Map(assignments.map((a) => [`${a.procedureId}|${a.tier}`, a.peerGroupId]));

  // Follow merges to the surviving group; a cycle (a data error) stops at the last group seen.
  const surviving = (groupId: string): PeerGroupRow | undefined => {
    let group = byId.get(groupId);
    for (let hops = 0; group?.mergedIntoId && hops < 20; hops++) {
      const next = byId.get(group.mergedIntoId);
      if (!next) break;
      group = next;
    }
    return group;
  };

  for (const p of parts) {
    const entry: Partial<Record<PeerTierName, PeerGroupRef>> = {};
    for (const tier of PEER_TIERS) {
      const start =
        assigned.get(`${p.id}|${tier}`) ?? byKey.get(`${p.analyteId}|${tier}|${derivedPeerKey(tier, p)}`)?.id;
      const group = start ? surviving(start) : undefined;
      if (group) entry[tier] = { id: group.id, tier: group.tier, key: group.key, label: group.label };
    }
    membership.set(p.id, entry);
  }
  return membership;
}
