import { and, eq, inArray } from 'drizzle-orm';
import { instrumentModels, methods, reagents, analytes } from '../schema/catalogue.ts';
import { peerGroupAssignments, peerGroups } from '../schema/peer-groups.ts';
import { procedures } from '../schema/procedures.ts';
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

/** Procedures with the names their peer group labels are made of. */
export async function loadPeerKeyParts(db: Executor, procedureIds: readonly string[]): Promise<PeerKeyParts[]> {
  if (procedureIds.length === 0) return [];
  return db
    .select({
      id: procedures.id,
      analyteId: procedures.analyteId,
      analyteName: analytes.name,
      instrumentModelId: procedures.instrumentModelId,
      instrumentModelName: instrumentModels.name,
      methodId: procedures.methodId,
      methodName: methods.name,
      reagentId: procedures.reagentId,
      reagentName: reagents.name,
    })
    .from(procedures)
    .innerJoin(analytes, eq(analytes.id, procedures.analyteId))
    .innerJoin(instrumentModels, eq(instrumentModels.id, procedures.instrumentModelId))
    .innerJoin(methods, eq(methods.id, procedures.methodId))
    .innerJoin(reagents, eq(reagents.id, procedures.reagentId))
    .where(inArray(procedures.id, [...procedureIds]));
}

/**
 * Resolves each procedure's peer group at every tier for one control lot and analyte:
 * the coordinator's assignment when there is one, otherwise the group of the derived key; a merged
 * group resolves to the group it was merged into. With `create`, missing derived groups are made.
 */
export async function resolvePeerMembership(
  db: Executor,
  controlLotId: string,
  analyteId: string,
  parts: readonly PeerKeyParts[],
  options: { create: boolean },
): Promise<PeerMembership> {
  const membership: PeerMembership = new Map();
  if (parts.length === 0) return membership;

  if (options.create) {
    const wanted = new Map<string, { tier: PeerTierName; key: string; label: string }>();
    for (const p of parts) {
      for (const tier of PEER_TIERS) {
        const key = derivedPeerKey(tier, p);
        wanted.set(`${tier}|${key}`, { tier, key, label: derivedLabel(tier, p) });
      }
    }
    await db
      .insert(peerGroups)
      .values([...wanted.values()].map((g) => ({ controlLotId, analyteId, tier: g.tier, key: g.key, label: g.label })))
      .onConflictDoNothing();
  }

  const groups = await db
    .select()
    .from(peerGroups)
    .where(and(eq(peerGroups.controlLotId, controlLotId), eq(peerGroups.analyteId, analyteId)));
  const byId = new Map(groups.map((g) => [g.id, g]));
  const byKey = new Map(groups.map((g) => [`${g.tier}|${g.key}`, g]));

  const assignments = await db
    .select()
    .from(peerGroupAssignments)
    .where(
      and(
        eq(peerGroupAssignments.controlLotId, controlLotId),
        inArray(
          peerGroupAssignments.procedureId,
          parts.map((p) => p.id),
        ),
      ),
    );
  const assigned = new Map(assignments.map((a) => [`${a.procedureId}|${a.tier}`, a.peerGroupId]));

  // Follow merges to the surviving group; a cycle (a data error) stops at the last group seen.
  const surviving = (groupId: string): (typeof groups)[number] | undefined => {
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
      const start = assigned.get(`${p.id}|${tier}`) ?? byKey.get(`${tier}|${derivedPeerKey(tier, p)}`)?.id;
      const group = start ? surviving(start) : undefined;
      if (group) entry[tier] = { id: group.id, tier: group.tier, key: group.key, label: group.label };
    }
    membership.set(p.id, entry);
  }
  return membership;
}
