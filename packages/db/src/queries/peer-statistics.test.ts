import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { peerStatistics as computePeerStatistics } from '@plumbline/stats';
import { createScratchDatabase, type ScratchDatabase } from '../testing.ts';
import { createQcCatalogue, type QcCatalogue } from '../qc-fixtures.ts';
import {
  peerGroupAssignments,
  peerGroups,
  peerStatistics,
  peerStatisticsRequests,
} from '../schema/peer-groups.ts';
import { qcSummaries } from '../schema/qc-data.ts';
import {
  drainPeerStatisticsRequests,
  recomputeAllPeerStatistics,
  requestPeerStatistics,
} from './peer-statistics.ts';

let scratch: ScratchDatabase;
let c: QcCatalogue;
beforeAll(async () => {
  scratch = await createScratchDatabase('peerstats');
  c = await createQcCatalogue(scratch.db);
});
afterAll(async () => scratch?.drop());

/** One lab per mean, each with one glucose procedure and a level-1 summary for 2026-02. */
async function labsWith(means: number[], spec: Parameters<QcCatalogue['makeLabWithProcedures']>[0][number]) {
  const ids: string[] = [];
  for (const mean of means) {
    const { lab, procedures } = await c.makeLabWithProcedures([spec]);
    await scratch.db.insert(qcSummaries).values({
      labId: lab.id,
      procedureId: procedures[0].id,
      controlLotId: c.lot.id,
      level: 1,
      period: '2026-02',
      n: 20,
      mean,
      sd: 0.1,
    });
    ids.push(procedures[0].id);
  }
  return ids;
}

const statsOf = async (groupId: string) =>
  scratch.db
    .select()
    .from(peerStatistics)
    .where(
      and(
        eq(peerStatistics.peerGroupId, groupId),
        eq(peerStatistics.scope, 'period'),
        eq(peerStatistics.period, '2026-02'),
      ),
    );

describe('peer groups and their statistics', () => {
  it('when procedures share model, method and reagent, then they form one instrument group whose figures equal @plumbline/stats', async () => {
    const x1 = await labsWith([5.5, 5.6, 5.4], { code: 'G1' });
    const y2 = await labsWith([5.7, 5.65], { code: 'G2', model: c.models.y2 });
    await requestPeerStatistics(scratch.db, [
      { controlLotId: c.lot.id, analyteId: c.analytes.glucose.id, level: 1, period: '2026-02' },
    ]);
    expect(await drainPeerStatisticsRequests(scratch.db)).toBe(1);
    expect(await scratch.db.select().from(peerStatisticsRequests)).toEqual([]);

    const groups = await scratch.db.select().from(peerGroups).where(eq(peerGroups.controlLotId, c.lot.id));
    expect(groups.map((g) => g.tier).sort()).toEqual(['analyte', 'instrument', 'instrument', 'method']);
    const groupX1 = groups.find((g) => g.tier === 'instrument' && g.key.includes(c.models.x1.id))!;
    const [row] = await statsOf(groupX1.id);
    const expected = computePeerStatistics(
      x1.map((id, i) => ({ id, n: 20, mean: [5.5, 5.6, 5.4][i], sd: 0.1 })),
    );
    expect(row).toMatchObject({ labs: 3, sufficient: true, version: 0 });
    expect(row.mean).toBeCloseTo(expected.mean, 12);
    expect(row.members.sort()).toEqual([...x1].sort());

    const groupY2 = groups.find((g) => g.tier === 'instrument' && g.key.includes(c.models.y2.id))!;
    expect((await statsOf(groupY2.id))[0]).toMatchObject({ labs: 2, sufficient: false });
    const method = groups.find((g) => g.tier === 'method')!;
    expect((await statsOf(method.id))[0]).toMatchObject({ labs: 5, sufficient: true });
    expect(y2).toHaveLength(2);
  });

  it('when the coordinator assigns a procedure to another group or merges groups, then membership follows', async () => {
    const groups = await scratch.db
      .select()
      .from(peerGroups)
      .where(and(eq(peerGroups.controlLotId, c.lot.id), eq(peerGroups.tier, 'instrument')));
    const groupX1 = groups.find((g) => g.key.includes(c.models.x1.id))!;
    const groupY2 = groups.find((g) => g.key.includes(c.models.y2.id))!;
    const [y2Member] = (await statsOf(groupY2.id))[0].members;

    // Move one Y2 procedure into the X1 group: X1 now has 4 labs, Y2 one.
    await scratch.db
      .insert(peerGroupAssignments)
      .values({ procedureId: y2Member, controlLotId: c.lot.id, tier: 'instrument', peerGroupId: groupX1.id });
    await recomputeAllPeerStatistics(scratch.db);
    expect((await statsOf(groupX1.id))[0]).toMatchObject({ labs: 4 });
    expect((await statsOf(groupY2.id))[0]).toMatchObject({ labs: 1 });

    // Merge Y2 into X1: every procedure resolves to X1; Y2 keeps no figures of its own.
    await scratch.db
      .update(peerGroups)
      .set({ mergedIntoId: groupX1.id })
      .where(eq(peerGroups.id, groupY2.id));
    await recomputeAllPeerStatistics(scratch.db);
    expect((await statsOf(groupX1.id))[0]).toMatchObject({ labs: 5 });
    expect(await statsOf(groupY2.id)).toEqual([]);
  });

  it('when everything is recomputed twice, then the figures are the same and not duplicated', async () => {
    await recomputeAllPeerStatistics(scratch.db);
    const first = await scratch.db.select().from(peerStatistics);
    await recomputeAllPeerStatistics(scratch.db);
    const second = await scratch.db.select().from(peerStatistics);
    const strip = (rows: typeof first) =>
      rows
        .map(({ id: _i, computedAt: _c, ...r }) => r)
        .sort((a, b) => (a.peerGroupId + a.scope < b.peerGroupId + b.scope ? -1 : 1));
    expect(strip(second)).toEqual(strip(first));
  });
});
