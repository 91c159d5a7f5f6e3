import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import request from 'supertest';
import { and, eq } from 'drizzle-orm';
import { parse } from 'csv-parse/sync';
import { peerGroups, peerStatistics, peerStatisticsFailures } from '@plumbline/db';
import type { Drilldown, LabOverview, PeerGroupsView, PeerReport, PeerReportRow } from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import {
  seedWorkspaceNetwork,
  type WorkspaceNetwork,
} from '../report-drilldown/testing/workspace-network.ts';

// The statistics function the report calls, made to throw for one lab mean while `trap.mean` is set:
// a row whose comparison throws, whatever the stored data (the database refuses such data outright).
const trap = vi.hoisted(() => ({ mean: null as number | null }));
vi.mock('@plumbline/stats', async (importOriginal) => {
  const actual = await importOriginal<typeof import('@plumbline/stats')>();
  return {
    ...actual,
    standing: (...args: Parameters<typeof actual.standing>) => {
      if (trap.mean !== null && args[0].mean === trap.mean)
        throw new Error('forced failure of the comparison');
      return actual.standing(...args);
    },
  };
});

const PERIOD = '2026-03';
let t: TestApp;
let net: WorkspaceNetwork;
let coordinator: Awaited<ReturnType<TestApp['makeUser']>>;

beforeAll(async () => {
  t = await createTestApp('notcomputable');
  net = await seedWorkspaceNetwork(t);
  coordinator = await t.makeUser('coordinator', null);
});
afterAll(async () => t?.close());

const asA = (path: string) =>
  request(t.app).get(`/api/labs/${net.labs.A.id}${path}`).set('Authorization', net.labs.A.analyst.auth);
const keyOf = (r: PeerReportRow) => `${r.procedure.code}/${r.level}`;

async function reportOfA(): Promise<PeerReport> {
  const res = await asA(`/peer-report?period=${PERIOD}`);
  expect(res.status).toBe(200);
  return res.body;
}

/** Every row but `key` equal to the baseline's, and `key` itself not computable. */
function expectOthersIntact(report: PeerReport, baseline: PeerReport, key: string) {
  expect(report.rows.map(keyOf)).toEqual(baseline.rows.map(keyOf));
  for (const row of report.rows) {
    if (keyOf(row) === key) continue;
    expect(row).toEqual(baseline.rows.find((b) => keyOf(b) === keyOf(row)));
  }
}

describe('a report row that cannot be computed', () => {
  it('when every row computes, then no row is marked and each has an SDI', async () => {
    const report = await reportOfA();
    expect(report.rows).toHaveLength(4);
    for (const row of report.rows) {
      expect(row.notComputable).toBeNull();
      expect(row.sdi).not.toBeNull();
    }
  });

  it('when the comparison of one row throws, then the report, CSV, PDF, overview and drill-down answer 200 and only that row says why', async () => {
    const baseline = await reportOfA();
    trap.mean = net.table.glucose.A[PERIOD][2].mean;
    try {
      const report = await reportOfA();
      const broken = report.rows.find((r) => keyOf(r) === 'GLU1/2')!;
      expect(broken.notComputable?.reason).toBe('The comparison failed: forced failure of the comparison.');
      expect(broken.sdi).toBeNull();
      // No SDI or CVR flag (lab A's March data may still carry its outlier-exclusion flag).
      expect(broken.flags.filter((f) => f.kind !== 'exclusion')).toEqual([]);
      // The lab's own figures stay visible.
      expect(broken.lab.mean).toBe(net.table.glucose.A[PERIOD][2].mean);
      expectOthersIntact(report, baseline, 'GLU1/2');

      const csv = await asA(`/peer-report.csv?period=${PERIOD}`);
      expect(csv.status).toBe(200);
      const records: Record<string, string>[] = parse(csv.text, { columns: true });
      const csvRow = records.find((r) => r.procedure === 'GLU1' && r.level === '2')!;
      expect(csvRow.not_computable).toBe(broken.notComputable!.reason);
      expect(csvRow.sdi).toBe('');
      expect(records.filter((r) => r.not_computable === '')).toHaveLength(3);

      const pdf = await asA(`/peer-report.pdf?period=${PERIOD}`);
      expect(pdf.status).toBe(200);
      expect(pdf.headers['content-type']).toBe('application/pdf');

      const overview = await asA('/overview');
      expect(overview.status).toBe(200);
      const flags = (overview.body as LabOverview).flags!;
      expect(flags.rowsNotComputable).toBe(1);
      expect(Object.values(flags.rowsBySeverity).reduce((a, b) => a + b, 0)).toBe(3);
      expect((overview.body as LabOverview).attention.map((a) => a.kind)).toContain('rows-not-computable');

      const drill = await asA(
        `/report-rows/${net.labs.A.glucose}/${net.catalogue.lot.id}/2?period=${PERIOD}`,
      );
      expect(drill.status).toBe(200);
      const drilldown = drill.body as Drilldown;
      expect(drilldown.notComputable).toContain(
        `${PERIOD}: The comparison failed: forced failure of the comparison.`,
      );
      expect(drilldown.trend.find((p) => p.period === PERIOD)?.sdi).toBeNull();
      expect(drilldown.trend.find((p) => p.period === '2026-02')?.sdi).not.toBeNull();
    } finally {
      trap.mean = null;
    }
  });

  it('when the recompute could not compute the row’s peer group, then the row gives that reason and the coordinator sees the group', async () => {
    const baseline = await reportOfA();
    const [group] = await t.db
      .select()
      .from(peerGroups)
      .where(
        and(
          eq(peerGroups.controlLotId, net.catalogue.lot.id),
          eq(peerGroups.analyteId, net.catalogue.analytes.creatinine.id),
          eq(peerGroups.tier, 'instrument'),
        ),
      );
    // What a failed recompute leaves: no figures for the group, and the failure with its reason.
    await t.db
      .delete(peerStatistics)
      .where(
        and(
          eq(peerStatistics.peerGroupId, group.id),
          eq(peerStatistics.level, 1),
          eq(peerStatistics.period, PERIOD),
          eq(peerStatistics.scope, 'period'),
        ),
      );
    await t.db.insert(peerStatisticsFailures).values({
      peerGroupId: group.id,
      level: 1,
      period: PERIOD,
      scope: 'period',
      reason: 'the peer SD is not a finite number (Infinity)',
    });

    const report = await reportOfA();
    const row = report.rows.find((r) => keyOf(r) === 'CREA1/1')!;
    expect(row.notComputable?.reason).toBe(
      'The peer figures of the group with the same instrument model, method and reagent could not be computed: the peer SD is not a finite number (Infinity)',
    );
    expect(row.peer).toBeNull();
    expect(row.sdi).toBeNull();
    expectOthersIntact(report, baseline, 'CREA1/1');

    const listed = await request(t.app)
      .get(`/api/peer-groups/failures?period=${PERIOD}`)
      .set('Authorization', coordinator.auth);
    expect(listed.status).toBe(200);
    expect(listed.body).toEqual([
      expect.objectContaining({
        peerGroupId: group.id,
        tier: 'instrument',
        controlLot: { id: net.catalogue.lot.id, lotNumber: net.catalogue.lot.lotNumber },
        analyte: expect.objectContaining({ code: net.catalogue.analytes.creatinine.code }),
        level: 1,
        period: PERIOD,
        scope: 'period',
        reason: 'the peer SD is not a finite number (Infinity)',
      }),
    ]);
    // The coordinator's view of the groups marks the same group.
    const view = await request(t.app)
      .get('/api/peer-groups')
      .query({
        controlLotId: net.catalogue.lot.id,
        analyteId: net.catalogue.analytes.creatinine.id,
        level: 1,
        period: PERIOD,
      })
      .set('Authorization', coordinator.auth);
    expect(view.status).toBe(200);
    const groupsShown = (view.body as PeerGroupsView).tiers.flatMap((tier) => tier.groups);
    expect(groupsShown.find((g) => g.id === group.id)?.notComputable?.reason).toBe(
      'the peer SD is not a finite number (Infinity)',
    );

    const forbidden = await request(t.app)
      .get('/api/peer-groups/failures')
      .set('Authorization', net.labs.A.analyst.auth);
    expect(forbidden.status).toBe(403);
    const badPeriod = await request(t.app)
      .get('/api/peer-groups/failures?period=March')
      .set('Authorization', coordinator.auth);
    expect(badPeriod.status).toBe(400);
  });
});
