import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, gt } from 'drizzle-orm';
import { createScratchDatabase, type ScratchDatabase } from '../testing.ts';
import { createQcCatalogue, type QcCatalogue } from '../qc-fixtures.ts';
import { peerStatistics, publishedStatisticsMembers } from '../schema/peer-groups.ts';
import { periods, publications } from '../schema/periods.ts';
import { qcSummaries } from '../schema/qc-data.ts';
import { auditEvents } from '../schema/audit.ts';
import { recomputeAllPeerStatistics } from './peer-statistics.ts';
import { PublishRefusedError, publishPeriod, publishPeriodsWithoutSnapshot } from './publishing.ts';

let scratch: ScratchDatabase;
let c: QcCatalogue;
const seededAt = new Date('2026-02-13T14:00:00Z');

beforeAll(async () => {
  scratch = await createScratchDatabase('publishing');
  c = await createQcCatalogue(scratch.db);
  // Like the demo seed: January is marked published, but no snapshot exists.
  await scratch.db
    .update(periods)
    .set({ state: 'published', publishedAt: seededAt })
    .where(eq(periods.period, '2026-01'));
  for (const mean of [5.5, 5.6, 5.4]) {
    const { lab, procedures } = await c.makeLabWithProcedures([{ code: 'G1' }]);
    for (const period of ['2026-01', '2026-02']) {
      await scratch.db.insert(qcSummaries).values({
        labId: lab.id,
        procedureId: procedures[0].id,
        controlLotId: c.lot.id,
        level: 1,
        period,
        n: 20,
        mean,
        sd: 0.1,
      });
    }
  }
  await recomputeAllPeerStatistics(scratch.db);
});
afterAll(async () => scratch?.drop());

const rowsOf = (period: string, version: number) =>
  scratch.db
    .select()
    .from(peerStatistics)
    .where(and(eq(peerStatistics.period, period), eq(peerStatistics.version, version)));

describe('publishing periods', () => {
  it('when a period is marked published without a snapshot, then it gets version 1 at its recorded date, once', async () => {
    expect(await publishPeriodsWithoutSnapshot(scratch.db, { actorLabel: 'demo seed' })).toEqual(['2026-01']);
    const [publication] = await scratch.db
      .select()
      .from(publications)
      .where(eq(publications.period, '2026-01'));
    expect(publication).toMatchObject({ version: 1, publishedAt: seededAt, publishedBy: null });
    const provisional = await rowsOf('2026-01', 0);
    expect(provisional.length).toBeGreaterThan(0);
    expect((await rowsOf('2026-01', 1)).length).toBe(provisional.length);
    const [audit] = await scratch.db.select().from(auditEvents).where(eq(auditEvents.kind, 'period.publish'));
    expect(audit).toMatchObject({ actorLabel: 'demo seed', entityId: '2026-01' });

    // Running it again changes nothing.
    expect(await publishPeriodsWithoutSnapshot(scratch.db)).toEqual([]);
    expect(await scratch.db.select().from(publications)).toHaveLength(1);
  });

  it('when the period is in a state the caller does not allow, or does not exist, then nothing is published', async () => {
    await expect(publishPeriod(scratch.db, '2026-02', { allowedStates: ['closed'] })).rejects.toMatchObject({
      name: 'PublishRefusedError',
      state: 'open',
      latestVersion: 0,
    });
    await expect(publishPeriod(scratch.db, '2031-01')).rejects.toBeInstanceOf(PublishRefusedError);
    expect(await rowsOf('2026-02', 1)).toEqual([]);
  });

  it('when a period is published twice, then versions 1 and 2 both stay', async () => {
    const first = await publishPeriod(scratch.db, '2026-02', { reason: null });
    const second = await publishPeriod(scratch.db, '2026-02', { reason: 'correction' });
    expect([first.version, second.version]).toEqual([1, 2]);
    expect(second.statistics).toBe(first.statistics);
    expect((await rowsOf('2026-02', 1)).length).toBe(first.statistics);
    expect((await rowsOf('2026-02', 2)).length).toBe(first.statistics);
  });

  it('when a period is published, then each snapshot row lists its members in the narrow members table', async () => {
    // Consistency of two stores of the same fact (no outside source): the table the report reads must
    // hold exactly the member list frozen in each published row.
    const published = await scratch.db.select().from(peerStatistics).where(gt(peerStatistics.version, 0));
    expect(published.length).toBeGreaterThan(0);
    const narrow = await scratch.db.select().from(publishedStatisticsMembers);
    expect(narrow.length).toBeGreaterThan(0);
    for (const row of published) {
      const listed = narrow.filter((m) => m.peerStatisticsId === row.id).map((m) => m.procedureId);
      expect(listed.sort()).toEqual([...new Set(row.members)].sort());
    }
    expect(narrow.length).toBe(published.reduce((sum, row) => sum + new Set(row.members).size, 0));
  });
});
