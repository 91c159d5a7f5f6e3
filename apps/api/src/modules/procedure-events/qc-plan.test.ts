import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { qcPlanPageSchema, type QcPlanPage } from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import {
  seedWorkspaceNetwork,
  type WorkspaceNetwork,
} from '../report-drilldown/testing/workspace-network.ts';

let t: TestApp;
let net: WorkspaceNetwork;

beforeAll(async () => {
  t = await createTestApp('qc-plan');
  net = await seedWorkspaceNetwork(t);
});
afterAll(async () => {
  await t?.close();
});

async function page(auth = net.labs.A.analyst.auth, labId = net.labs.A.id) {
  const res = await request(t.app).get(`/api/labs/${labId}/qc-plan`).set('Authorization', auth);
  expect(res.status).toBe(200);
  return qcPlanPageSchema.parse(res.body) as QcPlanPage;
}

describe('QC plan page', () => {
  it('when the lab has data, then each row carries the peer report’s sigma, ΔSEcrit = σ − 1.65 and a plan that meets the settings when one is reached', async () => {
    const body = await page();
    expect(body.period).toBe('2026-03');
    expect(body.settings).toEqual({ minPed: 0.9, maxPfr: 0.05 });
    const report = await request(t.app)
      .get(`/api/labs/${net.labs.A.id}/peer-report?period=2026-03`)
      .set('Authorization', net.labs.A.analyst.auth);
    expect(body.rows).toHaveLength(report.body.rows.length);
    for (const row of body.rows) {
      const same = report.body.rows.find(
        (r: { procedure: { id: string }; level: number }) =>
          r.procedure.id === row.procedure.id && r.level === row.level,
      );
      expect(row.sigma).toBe(same.sigma);
      if (row.sigma === null) continue;
      expect(row.deltaSeCrit).toBeCloseTo(row.sigma - 1.65, 12); // definition (methods.md §8)
      if (row.reached) {
        expect(row.recommended!.ped).toBeGreaterThanOrEqual(0.9);
        expect(row.recommended!.pfr).toBeLessThanOrEqual(0.05);
      }
      expect(row.explanation).toMatch(/σ/);
    }
  });

  it('when an analyst enters the current plan, then the page shows it with its power; bad plans get 400', async () => {
    const A = net.labs.A;
    const url = `/api/labs/${A.id}/qc-plan/${A.glucose}/1`;
    await request(t.app)
      .put(url)
      .set('Authorization', A.analyst.auth)
      .send({ rules: ['1-2s'], n: 2 })
      .expect(204);
    const body = await page();
    const row = body.rows.find((r) => r.procedure.id === A.glucose && r.level === 1)!;
    expect(row.current).toMatchObject({ rules: ['1-2s'], n: 2, runs: 1 });
    // 1-2s with N = 2 rejects a good run with probability 1 − (2Φ(2) − 1)² ≈ 0.089 (closed form, from memory).
    expect(row.current!.pfr).toBeCloseTo(0.089, 2);
    const bad = await request(t.app)
      .put(url)
      .set('Authorization', A.analyst.auth)
      .send({ rules: ['1-9s'], n: 0 });
    expect(bad.status).toBe(400);
  });

  it('when another lab’s user reads or writes the plan, then 404; the coordinator may read but not enter a plan', async () => {
    const A = net.labs.A;
    const B = net.labs.B;
    expect(
      (await request(t.app).get(`/api/labs/${A.id}/qc-plan`).set('Authorization', B.analyst.auth)).status,
    ).toBe(404);
    const put = await request(t.app)
      .put(`/api/labs/${A.id}/qc-plan/${A.glucose}/1`)
      .set('Authorization', B.supervisor.auth)
      .send({ rules: ['1-3s'], n: 1 });
    expect(put.status).toBe(404);
    const own = await request(t.app)
      .put(`/api/labs/${B.id}/qc-plan/${A.glucose}/1`)
      .set('Authorization', B.supervisor.auth)
      .send({ rules: ['1-3s'], n: 1 });
    expect(own.status).toBe(404);
    const coordinator = await t.makeUser('coordinator', null);
    await page(coordinator.auth);
    const byCoordinator = await request(t.app)
      .put(`/api/labs/${A.id}/qc-plan/${A.glucose}/1`)
      .set('Authorization', coordinator.auth)
      .send({ rules: ['1-3s'], n: 1 });
    expect(byCoordinator.status).toBe(403);
  });
});
