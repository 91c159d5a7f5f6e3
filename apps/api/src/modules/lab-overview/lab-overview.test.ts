import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { inArray } from 'drizzle-orm';
import { classifyCvr, classifySdi, standing, type Flag } from '@plumbline/stats';
import { periods, procedures, uploads } from '@plumbline/db';
import { labOverviewSchema, type LabOverview } from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import {
  expectedPeer,
  seedWorkspaceNetwork,
  type Analyte,
  type WorkspaceNetwork,
} from '../report-drilldown/testing/workspace-network.ts';

let t: TestApp;
let net: WorkspaceNetwork;

beforeAll(async () => {
  t = await createTestApp('laboverview');
  net = await seedWorkspaceNetwork(t);
  // January and February are closed, so March (open) is the period labs submit for.
  await t.db
    .update(periods)
    .set({ state: 'closed', closedAt: new Date() })
    .where(inArray(periods.period, ['2026-01', '2026-02']));
});
afterAll(async () => t?.close());

async function overview(auth = net.labs.A.analyst.auth, labId = net.labs.A.id) {
  return request(t.app).get(`/api/labs/${labId}/overview`).set('Authorization', auth);
}

describe('the lab overview', () => {
  it('when lab A opens it, then it shows March as the current period, submitted, with its flags counted as @plumbline/stats classifies them', async () => {
    const res = await overview();
    expect(res.status).toBe(200);
    const body = labOverviewSchema.parse(res.body) as LabOverview;
    expect(body.lab).toEqual({
      id: net.labs.A.id,
      code: net.labs.A.code,
      name: expect.any(String),
      preferredUnits: 'si',
    });
    expect(body.currentPeriod).toMatchObject({
      period: '2026-03',
      state: 'open',
      submitted: true,
      late: false,
      signoff: null,
    });
    const deadline = new Date(body.currentPeriod!.deadline).getTime();
    expect(body.currentPeriod!.daysToDeadline).toBe(Math.floor((deadline - Date.now()) / 86_400_000));

    // Expected flags: SDI and CVR bands (docs/methods.md §3) of each row, plus an action flag when the lab was left out as an outlier.
    const expected: Record<Flag, number> = { fine: 0, acceptable: 0, warning: 0, action: 0 };
    for (const analyte of ['glucose', 'creatinine'] as Analyte[]) {
      for (const level of [1, 2]) {
        const peer = expectedPeer(net, analyte, '2026-03', level);
        const position = standing(net.table[analyte].A['2026-03'][level], peer);
        expected[classifySdi(position.sdi)] += 1;
        expected[classifyCvr(position.cvr)] += 1;
        if (peer.excluded.some((e) => e.id === net.labs.A[analyte])) expected.action += 1;
      }
    }
    expect(body.flags).toMatchObject({ period: '2026-03', published: false, rows: 4, bySeverity: expected });
    expect(body.attention.find((a) => a.kind === 'action-flags')).toMatchObject({
      severity: 'action',
      period: '2026-03',
      count: body.flags!.rowsBySeverity.action,
    });
  });

  it('when earlier periods are unsigned, an upload waits for review and a procedure has no data, then each is an attention item', async () => {
    const [extra] = await t.db
      .insert(procedures)
      .values({
        labId: net.labs.A.id,
        code: 'GLU2',
        analyteId: net.catalogue.analytes.glucose.id,
        instrumentModelId: net.catalogue.models.y2.id,
        methodId: net.catalogue.methods.hexokinase.id,
        reagentId: net.catalogue.reagents.r.id,
        unit: 'mmol/L',
      })
      .returning();
    const [upload] = await t.db
      .insert(uploads)
      .values({
        labId: net.labs.A.id,
        uploadedBy: net.labs.A.analyst.id,
        kind: 'qc-summary',
        filename: 'march-second-analyser.csv',
        size: 300,
        sha256: 'b'.repeat(64),
        storageKey: 'test/none',
        status: 'needs-review',
        rowsTotal: 4,
        rowsAccepted: 3,
        rowsRejected: 1,
      })
      .returning();

    const body = (await overview()).body as LabOverview;
    expect(body.recentUploads.map((u) => u.id)).toEqual([upload.id]);
    expect(body.attention).toContainEqual(
      expect.objectContaining({ kind: 'unsigned-period', period: '2026-02', count: 2 }),
    );
    expect(body.attention).toContainEqual(
      expect.objectContaining({ kind: 'upload-needs-review', uploadId: upload.id, count: 1 }),
    );
    expect(body.attention).toContainEqual(
      expect.objectContaining({
        kind: 'missing-data',
        period: '2026-03',
        count: 1,
        message: expect.stringContaining(extra.code),
      }),
    );
    const order = { action: 0, warning: 1, info: 2 } as const;
    const ranks = body.attention.map((a) => order[a.severity]);
    expect(ranks).toEqual([...ranks].sort((a, b) => a - b));

    await request(t.app)
      .post(`/api/labs/${net.labs.A.id}/signoffs`)
      .set('Authorization', net.labs.A.supervisor.auth)
      .send({ period: '2026-01', statement: 'Reviewed.' });
    const after = (await overview()).body as LabOverview;
    expect(after.attention).toContainEqual(
      expect.objectContaining({ kind: 'unsigned-period', period: '2026-02', count: 1 }),
    );
  });

  it('when a lab has no data for the open period, then the data is due; another lab’s analyst gets 404', async () => {
    const { lab } = await net.catalogue.makeLabWithProcedures([{ code: 'K1' }]);
    const analyst = await t.makeUser('analyst', lab.id);
    const body = (await overview(analyst.auth, lab.id)).body as LabOverview;
    expect(body.currentPeriod).toMatchObject({ period: '2026-03', submitted: false });
    expect(body.flags).toBeNull();
    expect(body.attention.map((a) => a.kind)).toContain('data-due');
    expect((await overview(net.labs.B.analyst.auth)).status).toBe(404);
  });
});
