import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { and, eq } from 'drizzle-orm';
import { peerStatistics as computePeerStatistics } from '@plumbline/stats';
import { auditEvents, periods, peerStatistics, qcSummaries, recomputeAllPeerStatistics } from '@plumbline/db';
import { createQcCatalogue, type QcCatalogue } from '@plumbline/db/testing';
import type { PeerReportRow } from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import { spawnWorkerFor, type WorkerProcess } from '../../testing/worker-process.ts';

let t: TestApp;
let worker: WorkerProcess;
let catalogue: QcCatalogue;
let coordinator: Awaited<ReturnType<TestApp['makeUser']>>;

type Lab = { id: string; procedureId: string; auth: string };
const labs: Record<string, Lab> = {};
const PERIOD = '2026-03';

// Level-1 glucose (mmol/L) of four invented labs in one instrument group; E joins after publication.
const march: Record<string, { n: number; mean: number; sd: number }> = {
  A: { n: 20, mean: 5.48, sd: 0.11 },
  B: { n: 18, mean: 5.52, sd: 0.12 },
  C: { n: 21, mean: 5.45, sd: 0.1 },
  D: { n: 19, mean: 5.55, sd: 0.13 },
  E: { n: 20, mean: 5.9, sd: 0.12 },
};
const inputsOf = (names: string[]) => names.map((n) => ({ id: labs[n].procedureId, ...march[n] }));

const asCoordinator = {
  post: (path: string, body?: object) =>
    request(t.app).post(`/api${path}`).set('Authorization', coordinator.auth).send(body),
  get: (path: string) => request(t.app).get(`/api${path}`).set('Authorization', coordinator.auth),
};

async function statisticsOf(version: number) {
  return t.db
    .select()
    .from(peerStatistics)
    .where(and(eq(peerStatistics.period, PERIOD), eq(peerStatistics.version, version)));
}

async function reportRow(lab: Lab): Promise<{ published: { version: number } | null; row: PeerReportRow }> {
  for (let i = 0; i < 400; i++) {
    const res = await request(t.app)
      .get(`/api/labs/${lab.id}/peer-report?period=${PERIOD}`)
      .set('Authorization', lab.auth);
    expect(res.status).toBe(200);
    if (res.body.statisticsPending === false)
      return { published: res.body.published, row: res.body.rows.find((r: PeerReportRow) => r.level === 1) };
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error('peer statistics stayed pending');
}

beforeAll(async () => {
  t = await createTestApp('publishing');
  catalogue = await createQcCatalogue(t.db);
  coordinator = await t.makeUser('coordinator', null);
  for (const name of ['A', 'B', 'C', 'D', 'E']) {
    const { lab, procedures } = await catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    const analyst = await t.makeUser('analyst', lab.id);
    labs[name] = { id: lab.id, procedureId: procedures[0].id, auth: analyst.auth };
    if (name === 'E') continue;
    await t.db.insert(qcSummaries).values({
      labId: lab.id,
      procedureId: procedures[0].id,
      controlLotId: catalogue.lot.id,
      level: 1,
      period: PERIOD,
      ...march[name],
    });
  }
  await recomputeAllPeerStatistics(t.db);
  worker = await spawnWorkerFor(t);
});
afterAll(async () => {
  await worker?.stop();
  await t?.close();
});

describe('publishing a period', () => {
  it('when the period is still open, then publishing is refused with 409', async () => {
    const res = await asCoordinator.post(`/periods/${PERIOD}/publish`, {});
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/still open: close it before publishing/);
    expect(await statisticsOf(1)).toEqual([]);
  });

  it('when the closed period is published, then version 1 freezes the provisional figures, the period is published and the step is audited', async () => {
    expect((await asCoordinator.post(`/periods/${PERIOD}/close`, {})).status).toBe(200);
    const provisional = await statisticsOf(0);
    expect(provisional.length).toBeGreaterThan(0);

    const res = await asCoordinator.post(`/periods/${PERIOD}/publish`, { reason: 'monthly release' });
    expect(res.status).toBe(201);
    expect(res.body.period).toMatchObject({
      period: PERIOD,
      state: 'published',
      publishedAt: expect.any(String),
    });
    expect(res.body.publication).toMatchObject({
      period: PERIOD,
      version: 1,
      reason: 'monthly release',
      publishedBy: { id: coordinator.id, name: coordinator.name },
      statistics: provisional.length,
    });

    const frozen = await statisticsOf(1);
    const comparable = (rows: typeof frozen) =>
      rows
        .map(({ id: _id, version: _v, ...rest }) => rest)
        .sort((a, b) => `${a.peerGroupId}|${a.scope}`.localeCompare(`${b.peerGroupId}|${b.scope}`));
    expect(comparable(frozen)).toEqual(comparable(provisional));
    const [period] = await t.db.select().from(periods).where(eq(periods.period, PERIOD));
    expect(period.state).toBe('published');
    const audit = await t.db.select().from(auditEvents).where(eq(auditEvents.kind, 'period.publish'));
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({
      actorId: coordinator.id,
      entityId: PERIOD,
      details: expect.objectContaining({ version: 1 }),
    });

    const again = await asCoordinator.post(`/periods/${PERIOD}/publish`, {});
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already published \(version 1\); republish it with a reason/);
  });

  it('when a lab uploads after publication, then the provisional figures change and the published version does not', async () => {
    const before = await statisticsOf(1);
    const lines = [
      'period,procedure,control_lot,level,n,mean,sd,unit',
      `${PERIOD},GLU1,${catalogue.lot.lotNumber},1,20,5.9,0.12,mmol/L`,
    ];
    const upload = await request(t.app)
      .post('/api/uploads')
      .set('Authorization', labs.E.auth)
      .field('kind', 'qc-summary')
      .attach('file', Buffer.from(lines.join('\n')), 'march.csv');
    expect(upload.status).toBe(202);
    for (let i = 0; ; i++) {
      const status = await request(t.app)
        .get(`/api/uploads/${upload.body.id}`)
        .set('Authorization', labs.E.auth);
      if (status.body.status === 'stored') break;
      if (i === 300) throw new Error(`upload not stored: ${JSON.stringify(status.body)}\n${worker.output()}`);
      await new Promise((r) => setTimeout(r, 50));
    }

    // The report keeps showing version 1 (four labs) …
    const { published, row } = await reportRow(labs.A);
    expect(published).toMatchObject({ version: 1 });
    const four = computePeerStatistics(inputsOf(['A', 'B', 'C', 'D']), { minLabs: 3 });
    expect(row.peer).toMatchObject({ tier: 'instrument', labs: 4 });
    expect(row.peer!.mean).toBeCloseTo(four.mean, 12);
    expect(await statisticsOf(1)).toEqual(before);

    // … while the provisional figures hold E as well.
    const five = computePeerStatistics(inputsOf(['A', 'B', 'C', 'D', 'E']), { minLabs: 3 });
    const provisional = (await statisticsOf(0)).filter((r) => r.scope === 'period' && r.level === 1);
    const instrument = provisional.find(
      (r) => r.members.includes(labs.E.procedureId) && r.labs === 5 && r.members.length === 5,
    )!;
    expect(instrument.mean).toBeCloseTo(five.mean, 12);
  });

  it('when the period is republished with a reason, then version 2 holds the new figures and version 1 stays readable', async () => {
    const noReason = await asCoordinator.post(`/periods/${PERIOD}/republish`, {});
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.details).toEqual([
      { path: 'reason', message: 'say why the period is published again' },
    ]);

    const version1 = await statisticsOf(1);
    const res = await asCoordinator.post(`/periods/${PERIOD}/republish`, {
      reason: 'late data from one lab',
    });
    expect(res.status).toBe(201);
    expect(res.body.publication).toMatchObject({ version: 2, reason: 'late data from one lab' });
    expect(await statisticsOf(1)).toEqual(version1);

    const { published, row } = await reportRow(labs.A);
    expect(published).toMatchObject({ version: 2 });
    const five = computePeerStatistics(inputsOf(['A', 'B', 'C', 'D', 'E']), { minLabs: 3 });
    expect(row.peer).toMatchObject({ labs: 5 });
    expect(row.peer!.mean).toBeCloseTo(five.mean, 12);

    const list = await asCoordinator.get(`/periods/${PERIOD}/publications`);
    expect(list.status).toBe(200);
    expect(list.body.map((p: { version: number; reason: string | null }) => [p.version, p.reason])).toEqual([
      [1, 'monthly release'],
      [2, 'late data from one lab'],
    ]);
    expect(list.body[0].statistics).toBe(version1.length);
    const audit = await t.db.select().from(auditEvents).where(eq(auditEvents.kind, 'period.republish'));
    expect(audit[0].details).toMatchObject({ version: 2, reason: 'late data from one lab' });
  });

  it('when a period is unknown or malformed, or was never published, then 404, 400 or 409', async () => {
    expect((await asCoordinator.post('/periods/2031-07/publish', {})).status).toBe(404);
    expect((await asCoordinator.get('/periods/2031-07/publications')).status).toBe(404);
    const bad = await asCoordinator.post('/periods/2026-3/publish', {});
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('period');
    const notYet = await asCoordinator.post('/periods/2026-04/republish', { reason: 'x' });
    expect(notYet.status).toBe(409);
    expect(notYet.body.error.message).toMatch(/has not been published yet/);
  });

  it('when an analyst or a supervisor publishes, republishes or lists publications, then 403', async () => {
    const supervisor = await t.makeUser('supervisor', labs.A.id);
    for (const auth of [labs.A.auth, supervisor.auth]) {
      expect(
        (await request(t.app).post(`/api/periods/${PERIOD}/publish`).set('Authorization', auth).send({}))
          .status,
      ).toBe(403);
      expect(
        (
          await request(t.app)
            .post(`/api/periods/${PERIOD}/republish`)
            .set('Authorization', auth)
            .send({ reason: 'x' })
        ).status,
      ).toBe(403);
      expect(
        (await request(t.app).get(`/api/periods/${PERIOD}/publications`).set('Authorization', auth)).status,
      ).toBe(403);
    }
  });
});
