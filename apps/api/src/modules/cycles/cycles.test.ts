import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { randomBytes } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import {
  analytes,
  auditEvents,
  controlLots,
  controlMaterials,
  instrumentModels,
  labs,
  methods,
  periods,
  procedures,
  qcSummaries,
  reagents,
} from '@plumbline/db';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';

let t: TestApp;
let coordinator: Awaited<ReturnType<TestApp['makeUser']>>;

beforeAll(async () => {
  t = await createTestApp('cycles');
  coordinator = await t.makeUser('coordinator', null);
});
afterAll(async () => t?.close());

/** A period key no other test in this file uses. */
let nextYear = 2100;
const freshPeriod = () => `${nextYear++}-05`;
const deadlineFor = (period: string) => `${period.slice(0, 4)}-06-10T23:59:00Z`;

const asCoordinator = {
  post: (path: string, body?: object) =>
    request(t.app).post(`/api${path}`).set('Authorization', coordinator.auth).send(body),
  patch: (path: string, body?: object) =>
    request(t.app).patch(`/api${path}`).set('Authorization', coordinator.auth).send(body),
  get: (path: string) => request(t.app).get(`/api${path}`).set('Authorization', coordinator.auth),
};

async function auditKinds(period: string) {
  const rows = await t.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.entity, 'period'), eq(auditEvents.entityId, period)));
  return rows.map((r) => r.kind);
}

describe('periods', () => {
  it('when the coordinator creates a period, moves its deadline, closes and reopens it, then each step is stored and audited', async () => {
    const period = freshPeriod();
    const created = await asCoordinator.post('/periods', { period, deadline: deadlineFor(period) });
    expect(created.status).toBe(201);
    expect(created.body).toEqual({
      period,
      state: 'open',
      deadline: new Date(deadlineFor(period)).toISOString(),
      closedAt: null,
      publishedAt: null,
    });

    const moved = await asCoordinator.patch(`/periods/${period}`, {
      deadline: `${period.slice(0, 4)}-06-15T12:00:00+02:00`,
      reason: 'holiday',
    });
    expect(moved.status).toBe(200);
    expect(moved.body.deadline).toBe(`${period.slice(0, 4)}-06-15T10:00:00.000Z`);

    const closed = await asCoordinator.post(`/periods/${period}/close`);
    expect(closed.status).toBe(200);
    expect(closed.body.state).toBe('closed');
    expect(closed.body.closedAt).toEqual(expect.any(String));
    const [row] = await t.db.select().from(periods).where(eq(periods.period, period));
    expect(row.state).toBe('closed');

    expect((await asCoordinator.post(`/periods/${period}/close`)).status).toBe(409);

    const reopened = await asCoordinator.post(`/periods/${period}/reopen`, { reason: 'a lab had an outage' });
    expect(reopened.status).toBe(200);
    expect(reopened.body).toMatchObject({ state: 'open', closedAt: null });
    expect((await asCoordinator.post(`/periods/${period}/reopen`, { reason: 'again' })).status).toBe(409);

    expect((await auditKinds(period)).sort()).toEqual([
      'period.close',
      'period.create',
      'period.reopen',
      'period.update',
    ]);
  });

  it('when the period already exists, then 409', async () => {
    const period = freshPeriod();
    expect((await asCoordinator.post('/periods', { period, deadline: deadlineFor(period) })).status).toBe(
      201,
    );
    const again = await asCoordinator.post('/periods', { period, deadline: deadlineFor(period) });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toBe(`The period ${period} already exists.`);
  });

  it('when the period key, deadline or reopen reason is bad, then 400 naming the field', async () => {
    const badKey = await asCoordinator.post('/periods', { period: '2025-13', deadline: 'tomorrow' });
    expect(badKey.status).toBe(400);
    expect(badKey.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual([
      'deadline',
      'period',
    ]);

    const period = freshPeriod();
    const early = await asCoordinator.post('/periods', { period, deadline: `${period}-20T00:00:00Z` });
    expect(early.status).toBe(400);
    expect(early.body.error.details[0]).toMatchObject({
      path: 'deadline',
      message: expect.stringContaining('after the period has ended'),
    });

    await asCoordinator.post('/periods', { period, deadline: deadlineFor(period) });
    await asCoordinator.post(`/periods/${period}/close`);
    const noReason = await asCoordinator.post(`/periods/${period}/reopen`, {});
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.details[0].path).toBe('reason');

    expect((await asCoordinator.post('/periods/May-2025/close')).status).toBe(400);
    expect((await asCoordinator.post('/periods/1999-01/close')).status).toBe(404);
  });

  it('when a period is published, then closing, reopening and moving its deadline are 409', async () => {
    const period = freshPeriod();
    await t.db.insert(periods).values({
      period,
      deadline: new Date(deadlineFor(period)),
      state: 'published',
      closedAt: new Date(),
      publishedAt: new Date(),
    });
    const close = await asCoordinator.post(`/periods/${period}/close`);
    expect(close.status).toBe(409);
    expect(close.body.error.message).toContain('published');
    expect((await asCoordinator.post(`/periods/${period}/reopen`, { reason: 'late data' })).status).toBe(409);
    expect((await asCoordinator.patch(`/periods/${period}`, { deadline: deadlineFor(period) })).status).toBe(
      409,
    );
  });

  it('when an analyst or a supervisor uses any period route, then 403', async () => {
    const lab = await t.makeLab();
    const period = freshPeriod();
    await asCoordinator.post('/periods', { period, deadline: deadlineFor(period) });
    for (const role of ['analyst', 'supervisor'] as const) {
      const user = await t.makeUser(role, lab.id);
      const as = (req: request.Test) => req.set('Authorization', user.auth);
      expect(
        (
          await as(request(t.app).post('/api/periods')).send({
            period: freshPeriod(),
            deadline: deadlineFor(period),
          })
        ).status,
      ).toBe(403);
      expect(
        (await as(request(t.app).patch(`/api/periods/${period}`)).send({ deadline: deadlineFor(period) }))
          .status,
      ).toBe(403);
      expect((await as(request(t.app).post(`/api/periods/${period}/close`))).status).toBe(403);
      expect(
        (await as(request(t.app).post(`/api/periods/${period}/reopen`)).send({ reason: 'x' })).status,
      ).toBe(403);
      expect((await as(request(t.app).get(`/api/periods/${period}/participation`))).status).toBe(403);
    }
  });
});

describe('participation board', () => {
  it('when labs submit all, some or none of their procedures, some late, then the board counts them per lab', async () => {
    const suffix = randomBytes(3).toString('hex');
    const period = freshPeriod();
    await asCoordinator.post('/periods', { period, deadline: deadlineFor(period) });
    const [analyteA, analyteB] = await t.db
      .insert(analytes)
      .values([
        { code: `A-${suffix}`, name: 'Analyte A', unit: 'mmol/L' },
        { code: `B-${suffix}`, name: 'Analyte B', unit: 'mmol/L' },
      ])
      .returning();
    const [model] = await t.db
      .insert(instrumentModels)
      .values({ code: `IM-${suffix}`, name: 'Analyser' })
      .returning();
    const [method] = await t.db
      .insert(methods)
      .values({ code: `ME-${suffix}`, name: 'Method' })
      .returning();
    const [reagent] = await t.db
      .insert(reagents)
      .values({ code: `RE-${suffix}`, name: 'Reagent' })
      .returning();
    const [material] = await t.db
      .insert(controlMaterials)
      .values({ code: `CM-${suffix}`, name: 'Control' })
      .returning();
    const [lot] = await t.db
      .insert(controlLots)
      .values({
        materialId: material.id,
        lotNumber: `LOT-${suffix}`,
        levels: [1, 2],
        expiresOn: '2199-12-31',
      })
      .returning();

    const complete = await t.makeLab(`P1-${suffix}`);
    const partial = await t.makeLab(`P2-${suffix}`);
    const silent = await t.makeLab(`P3-${suffix}`);
    const gone = await t.makeLab(`P4-${suffix}`);
    await t.db.update(labs).set({ active: false }).where(eq(labs.id, gone.id));

    const shared = {
      instrumentModelId: model.id,
      methodId: method.id,
      reagentId: reagent.id,
      unit: 'mmol/L',
    };
    const made = await t.db
      .insert(procedures)
      .values([
        { ...shared, labId: complete.id, code: 'A', analyteId: analyteA.id },
        { ...shared, labId: complete.id, code: 'B', analyteId: analyteB.id },
        { ...shared, labId: partial.id, code: 'A', analyteId: analyteA.id },
        { ...shared, labId: partial.id, code: 'B', analyteId: analyteB.id },
        { ...shared, labId: silent.id, code: 'A', analyteId: analyteA.id },
        { ...shared, labId: gone.id, code: 'A', analyteId: analyteA.id },
      ])
      .returning();
    const procedureOf = (labId: string, code: string) =>
      made.find((p) => p.labId === labId && p.code === code)!;
    const summary = (labId: string, code: string, level: number, late: boolean) => ({
      labId,
      procedureId: procedureOf(labId, code).id,
      controlLotId: lot.id,
      level,
      period,
      n: 20,
      mean: 5,
      sd: 0.1,
      late,
    });
    await t.db
      .insert(qcSummaries)
      .values([
        summary(complete.id, 'A', 1, false),
        summary(complete.id, 'A', 2, false),
        summary(complete.id, 'B', 1, true),
        summary(partial.id, 'A', 1, true),
        summary(partial.id, 'A', 2, true),
      ]);

    const res = await asCoordinator.get(`/periods/${period}/participation?sort=missing&order=desc`);
    expect(res.status).toBe(200);
    expect(res.body.period).toMatchObject({ period, state: 'open' });
    const mine = res.body.labs.filter((l: { lab: { code: string } }) => l.lab.code.endsWith(suffix));
    // The inactive lab without data is left out; the others appear with counts worked out by hand.
    expect(mine.map((l: { lab: { code: string } }) => l.lab.code).sort()).toEqual([
      `P1-${suffix}`,
      `P2-${suffix}`,
      `P3-${suffix}`,
    ]);
    const byCode = Object.fromEntries(mine.map((l: { lab: { code: string } }) => [l.lab.code, l]));
    expect(byCode[`P1-${suffix}`]).toMatchObject({
      proceduresRegistered: 2,
      proceduresWithData: 2,
      lateCount: 1,
      status: 'complete',
      missing: [],
      flags: [],
    });
    expect(byCode[`P2-${suffix}`]).toMatchObject({
      proceduresRegistered: 2,
      proceduresWithData: 1,
      lateCount: 1,
      status: 'partial',
      missing: [
        {
          procedureId: procedureOf(partial.id, 'B').id,
          code: 'B',
          analyte: { code: `B-${suffix}`, name: 'Analyte B' },
        },
      ],
    });
    expect(byCode[`P3-${suffix}`]).toMatchObject({
      proceduresRegistered: 1,
      proceduresWithData: 0,
      lateCount: 0,
      status: 'none',
    });
    expect(byCode[`P3-${suffix}`].missing).toHaveLength(1);

    // Sorted by number of missing procedures, most first.
    const missingCounts = res.body.labs.map((l: { missing: unknown[] }) => l.missing.length);
    expect(missingCounts).toEqual([...missingCounts].sort((a, b) => b - a));
    expect(res.body.totals.labs).toBe(res.body.labs.length);
  });

  it('when the period is unknown or the sort key is not offered, then 404 or 400', async () => {
    expect((await asCoordinator.get('/periods/1999-02/participation')).status).toBe(404);
    const period = freshPeriod();
    await asCoordinator.post('/periods', { period, deadline: deadlineFor(period) });
    const bad = await asCoordinator.get(`/periods/${period}/participation?sort=colour`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('sort');
  });
});
