import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { peerStatistics as computePeerStatistics } from '@plumbline/stats';
import { createScratchDatabase, type ScratchDatabase } from '../testing.ts';
import { createQcCatalogue, type QcCatalogue } from '../qc-fixtures.ts';
import { peerGroups, peerStatistics, peerStatisticsFailures } from '../schema/peer-groups.ts';
import { qcSummaries } from '../schema/qc-data.ts';
import { drainPeerStatisticsRequests, requestPeerStatistics } from './peer-statistics.ts';
import type { ComputeGroupStatistics } from './peer-group-figures.ts';
import { listPeerStatisticsFailures } from './peer-statistics-failures.ts';

let scratch: ScratchDatabase;
let c: QcCatalogue;
beforeAll(async () => {
  scratch = await createScratchDatabase('peerfail');
  c = await createQcCatalogue(scratch.db);
});
afterAll(async () => scratch?.drop());

/** One lab per mean, each with one glucose procedure and a level-1 summary for 2026-02 (invented data). */
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

const periodFigures = (groupId: string) =>
  scratch.db
    .select()
    .from(peerStatistics)
    .where(and(eq(peerStatistics.peerGroupId, groupId), eq(peerStatistics.period, '2026-02')));

const failuresOf = (groupId: string) =>
  scratch.db.select().from(peerStatisticsFailures).where(eq(peerStatisticsFailures.peerGroupId, groupId));

describe('recompute isolates peer groups', () => {
  it('when the statistics of one group throw, then that group is recorded with its reason, the others are computed, and a later recompute clears it', async () => {
    const broken = await labsWith([5.5, 5.6, 5.4], { code: 'F1' });
    const healthy = await labsWith([5.7, 5.65, 5.75], { code: 'F2', model: c.models.y2 });
    const target = { controlLotId: c.lot.id, analyteId: c.analytes.glucose.id, level: 1, period: '2026-02' };

    // A statistics function that throws for any group holding one of the first model's procedures.
    const throwing: ComputeGroupStatistics = (labs, options) => {
      if (labs.some((l) => broken.includes(l.id))) throw new Error('forced failure for this group');
      return computePeerStatistics(labs, options);
    };
    await requestPeerStatistics(scratch.db, [target]);
    await drainPeerStatisticsRequests(scratch.db, { computeGroupStatistics: throwing });

    const groups = await scratch.db.select().from(peerGroups).where(eq(peerGroups.controlLotId, c.lot.id));
    const brokenGroup = groups.find((g) => g.tier === 'instrument' && g.key.includes(c.models.x1.id))!;
    const healthyGroup = groups.find((g) => g.tier === 'instrument' && g.key.includes(c.models.y2.id))!;

    // The healthy group's figures are those of @plumbline/stats for its own members.
    const [computed] = (await periodFigures(healthyGroup.id)).filter((r) => r.scope === 'period');
    const expected = computePeerStatistics(
      healthy.map((id, i) => ({ id, n: 20, mean: [5.7, 5.65, 5.75][i], sd: 0.1 })),
    );
    expect(computed.mean).toBeCloseTo(expected.mean, 12);
    expect(await failuresOf(healthyGroup.id)).toEqual([]);

    expect(await periodFigures(brokenGroup.id)).toEqual([]);
    const recorded = await failuresOf(brokenGroup.id);
    expect(recorded.map((f) => f.scope).sort()).toEqual(['cumulative', 'period']);
    expect(recorded.every((f) => f.reason === 'forced failure for this group')).toBe(true);
    expect(recorded[0].failedAt).toBeInstanceOf(Date);

    const listed = await listPeerStatisticsFailures(scratch.db, { period: '2026-02' });
    expect(listed.find((f) => f.peerGroupId === brokenGroup.id && f.scope === 'period')).toMatchObject({
      tier: 'instrument',
      lotNumber: c.lot.lotNumber,
      analyteCode: c.analytes.glucose.code,
      level: 1,
      period: '2026-02',
      reason: 'forced failure for this group',
    });
    expect(await listPeerStatisticsFailures(scratch.db, { period: '2026-03' })).toEqual([]);

    // The next recompute computes the group and removes the record.
    await requestPeerStatistics(scratch.db, [target]);
    await drainPeerStatisticsRequests(scratch.db);
    expect(await failuresOf(brokenGroup.id)).toEqual([]);
    expect((await periodFigures(brokenGroup.id)).length).toBe(2);
  });

  it('when the statistics return a non-finite peer SD for a sufficient group, then the group is recorded instead of stored without figures', async () => {
    const target = { controlLotId: c.lot.id, analyteId: c.analytes.glucose.id, level: 1, period: '2026-02' };
    const infinite: ComputeGroupStatistics = (labs, options) => ({
      ...computePeerStatistics(labs, options),
      sd: Number.POSITIVE_INFINITY,
    });
    await requestPeerStatistics(scratch.db, [target]);
    await drainPeerStatisticsRequests(scratch.db, { computeGroupStatistics: infinite });
    const listed = await listPeerStatisticsFailures(scratch.db, { period: '2026-02' });
    expect(listed.length).toBeGreaterThan(0);
    expect(listed.every((f) => f.reason === 'the peer SD is not a finite number (Infinity)')).toBe(true);

    await requestPeerStatistics(scratch.db, [target]);
    await drainPeerStatisticsRequests(scratch.db);
    expect(await listPeerStatisticsFailures(scratch.db)).toEqual([]);
  });
});
