import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { createScratchDatabase, type ScratchDatabase } from '../testing.ts';
import { createQcCatalogue, type QcCatalogue } from '../qc-fixtures.ts';
import { controlLots } from '../schema/catalogue.ts';
import { peerGroupAssignments, peerGroups } from '../schema/peer-groups.ts';
import { loadPeerKeyParts, resolvePeerMembership, resolvePeerMembershipByLot } from './peer-groups.ts';

// The report places many lots' procedures at once; the answer must be the one-lot rule's answer for each
// lot (a consistency check between two readings of the same rule; no outside source applies).
let scratch: ScratchDatabase;
let c: QcCatalogue;
beforeAll(async () => {
  scratch = await createScratchDatabase('peergroups');
  c = await createQcCatalogue(scratch.db);
});
afterAll(async () => scratch?.drop());

describe('peer membership of several control lots at once', () => {
  it('when procedures are assigned, merged and spread over two lots, then each lot matches the one-lot rule', async () => {
    const [secondLot] = await scratch.db
      .insert(controlLots)
      .values({ materialId: c.material.id, lotNumber: 'LOT-SECOND', levels: [1, 2], expiresOn: '2028-06-30' })
      .returning();
    const { procedures: mine } = await c.makeLabWithProcedures([
      { code: 'GLU1' },
      { code: 'GLU2', model: c.models.y2, reagent: c.reagents.s },
      { code: 'CREA', analyte: c.analytes.creatinine, method: c.methods.oxidase },
    ]);
    const { procedures: theirs } = await c.makeLabWithProcedures([
      { code: 'GLU1', method: c.methods.oxidase },
      { code: 'CREA', analyte: c.analytes.creatinine },
    ]);
    const all = [...mine, ...theirs].map((p) => p.id);
    const parts = await loadPeerKeyParts(scratch.db, all);
    for (const lot of [c.lot.id, secondLot.id]) {
      await resolvePeerMembership(scratch.db, lot, parts, { create: true });
    }
    // One procedure moved into another group at the instrument tier, one method group merged into another.
    const groups = await scratch.db.select().from(peerGroups).where(eq(peerGroups.controlLotId, c.lot.id));
    const glucoseGroups = groups.filter((g) => g.analyteId === c.analytes.glucose.id);
    const target = glucoseGroups.find((g) => g.tier === 'instrument' && g.key.includes(c.models.y2.id))!;
    await scratch.db.insert(peerGroupAssignments).values({
      procedureId: mine[0].id,
      controlLotId: c.lot.id,
      tier: 'instrument',
      peerGroupId: target.id,
    });
    const methodGroup = (id: string) => glucoseGroups.find((g) => g.key === `method:${id}`)!;
    const [from, into] = [methodGroup(c.methods.hexokinase.id), methodGroup(c.methods.oxidase.id)];
    await scratch.db.update(peerGroups).set({ mergedIntoId: into.id }).where(eq(peerGroups.id, from.id));

    const byLot = new Map([
      [c.lot.id, [mine[0].id, mine[1].id, mine[2].id]],
      [secondLot.id, [mine[0].id, mine[2].id]],
    ]);
    const together = await resolvePeerMembershipByLot(scratch.db, byLot);
    expect([...together.keys()].sort()).toEqual([...byLot.keys()].sort());
    for (const [lot, ids] of byLot) {
      const one = await resolvePeerMembership(
        scratch.db,
        lot,
        parts.filter((p) => ids.includes(p.id)),
        { create: false },
      );
      expect(together.get(lot)).toEqual(one);
    }
    // The assignment and the merge took effect (so the comparison above covered them).
    const first = together.get(c.lot.id)!;
    expect(first.get(mine[0].id)?.instrument?.id).toBe(target.id);
    expect(first.get(mine[0].id)?.method?.id).toBe(into.id);
  });

  it('when no procedure is given, then nothing is read and the answer is empty', async () => {
    expect((await resolvePeerMembershipByLot(scratch.db, new Map())).size).toBe(0);
  });
});
