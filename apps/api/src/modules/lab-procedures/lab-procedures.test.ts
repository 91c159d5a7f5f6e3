import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { auditEvents } from '@plumbline/db';
import { createQcCatalogue, type QcCatalogue } from '@plumbline/db/testing';
import { testMenuSchema } from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';

let t: TestApp;
let catalogue: QcCatalogue;
type Member = Awaited<ReturnType<TestApp['makeUser']>>;
type Lab = { id: string; procedureId: string; analyst: Member; supervisor: Member };
let labA: Lab;
let labB: Lab;

async function makeLab(): Promise<Lab> {
  const { lab, procedures } = await catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
  return {
    id: lab.id,
    procedureId: procedures[0].id,
    analyst: await t.makeUser('analyst', lab.id),
    supervisor: await t.makeUser('supervisor', lab.id),
  };
}

beforeAll(async () => {
  t = await createTestApp('labprocedures');
  catalogue = await createQcCatalogue(t.db);
  labA = await makeLab();
  labB = await makeLab();
});
afterAll(async () => t?.close());

const creatinine = () => ({
  code: 'CREA1',
  analyteId: catalogue.analytes.creatinine.id,
  instrumentModelId: catalogue.models.x1.id,
  methodId: catalogue.methods.hexokinase.id,
  reagentId: catalogue.reagents.r.id,
  unit: 'mg/dL',
});

describe('the test menu', () => {
  it('when the supervisor registers a procedure in a convertible unit, then it is listed and audited', async () => {
    const res = await request(t.app)
      .post(`/api/labs/${labA.id}/procedures`)
      .set('Authorization', labA.supervisor.auth)
      .send(creatinine());
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      code: 'CREA1',
      unit: 'mg/dL',
      analyte: { id: catalogue.analytes.creatinine.id, unit: 'umol/L' },
      instrumentModel: { id: catalogue.models.x1.id },
      retiredAt: null,
    });
    const audit = await t.db.select().from(auditEvents).where(eq(auditEvents.entityId, res.body.id));
    expect(audit.map((a) => a.kind)).toEqual(['procedure.created']);
    const menu = await request(t.app)
      .get(`/api/labs/${labA.id}/test-menu`)
      .set('Authorization', labA.analyst.auth);
    testMenuSchema.parse(menu.body);
    expect(menu.body.map((p: { code: string }) => p.code)).toEqual(['CREA1', 'GLU1']);
    // The lookups list used for uploads sees it too.
    const lookups = await request(t.app)
      .get(`/api/labs/${labA.id}/procedures`)
      .set('Authorization', labA.analyst.auth);
    expect(lookups.body.map((p: { code: string }) => p.code)).toContain('CREA1');
  });

  it('when the code is taken (in any case) then 409; a unit UCUM cannot convert or an unknown analyte gives 400 naming the field', async () => {
    const post = (body: object) =>
      request(t.app)
        .post(`/api/labs/${labA.id}/procedures`)
        .set('Authorization', labA.supervisor.auth)
        .send(body);
    const taken = await post({ ...creatinine(), code: 'glu1' });
    expect(taken.status).toBe(409);
    expect(taken.body.error.message).toContain('GLU1');
    const badUnit = await post({ ...creatinine(), code: 'CREA2', unit: 'mmHg' });
    expect(badUnit.status).toBe(400);
    expect(badUnit.body.error.details).toEqual([
      { path: 'unit', message: expect.stringContaining('umol/L') },
    ]);
    const notUcum = await post({ ...creatinine(), code: 'CREA3', unit: 'milligrams' });
    expect(notUcum.status).toBe(400);
    const unknown = await post({ ...creatinine(), code: 'CREA4', analyteId: labA.procedureId });
    expect(unknown.body.error.details[0]).toMatchObject({ path: 'analyteId' });
  });

  it('when the supervisor edits, retires and restores a procedure, then each step is audited and repeats give 409', async () => {
    const created = await request(t.app)
      .post(`/api/labs/${labA.id}/procedures`)
      .set('Authorization', labA.supervisor.auth)
      .send({ ...creatinine(), code: 'CR-OLD', unit: 'umol/L' });
    const path = `/api/labs/${labA.id}/procedures/${created.body.id}`;
    const edited = await request(t.app)
      .patch(path)
      .set('Authorization', labA.supervisor.auth)
      .send({ code: 'CR-NEW', unit: 'mmol/L' });
    expect(edited.status).toBe(200);
    expect(edited.body).toMatchObject({ code: 'CR-NEW', unit: 'mmol/L' });
    const retired = await request(t.app)
      .post(`${path}/retire`)
      .set('Authorization', labA.supervisor.auth)
      .send({ reason: 'analyser replaced' });
    expect(retired.status).toBe(200);
    expect(retired.body.retiredAt).not.toBeNull();
    expect(
      (await request(t.app).post(`${path}/retire`).set('Authorization', labA.supervisor.auth)).status,
    ).toBe(409);
    const lookups = await request(t.app)
      .get(`/api/labs/${labA.id}/procedures`)
      .set('Authorization', labA.analyst.auth);
    expect(lookups.body.map((p: { code: string }) => p.code)).not.toContain('CR-NEW');
    const menu = await request(t.app)
      .get(`/api/labs/${labA.id}/test-menu`)
      .set('Authorization', labA.analyst.auth);
    expect(menu.body.find((p: { code: string }) => p.code === 'CR-NEW').retiredAt).not.toBeNull();
    expect(
      (await request(t.app).post(`${path}/restore`).set('Authorization', labA.supervisor.auth)).status,
    ).toBe(200);
    expect(
      (await request(t.app).post(`${path}/restore`).set('Authorization', labA.supervisor.auth)).status,
    ).toBe(409);
    const audit = await t.db.select().from(auditEvents).where(eq(auditEvents.entityId, created.body.id));
    expect(audit.map((a) => a.kind)).toEqual([
      'procedure.created',
      'procedure.updated',
      'procedure.retired',
      'procedure.restored',
    ]);
    expect(audit[1].details).toMatchObject({
      changes: { code: { from: 'CR-OLD', to: 'CR-NEW' }, unit: { from: 'umol/L', to: 'mmol/L' } },
    });
    expect(audit[2].details).toMatchObject({ reason: 'analyser replaced' });
  });

  it('when an analyst changes the test menu, then 403', async () => {
    const res = await request(t.app)
      .post(`/api/labs/${labA.id}/procedures`)
      .set('Authorization', labA.analyst.auth)
      .send({ ...creatinine(), code: 'X1' });
    expect(res.status).toBe(403);
    expect(
      (
        await request(t.app)
          .post(`/api/labs/${labA.id}/procedures/${labA.procedureId}/retire`)
          .set('Authorization', labA.analyst.auth)
      ).status,
    ).toBe(403);
  });
});

describe('a supervisor of one lab and another lab', () => {
  it('when they touch the other lab’s procedures, then 404', async () => {
    const auth = labB.supervisor.auth;
    const base = `/api/labs/${labA.id}`;
    expect(
      (
        await request(t.app)
          .post(`${base}/procedures`)
          .set('Authorization', auth)
          .send({ ...creatinine(), code: 'B1' })
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .patch(`${base}/procedures/${labA.procedureId}`)
          .set('Authorization', auth)
          .send({ code: 'B2' })
      ).status,
    ).toBe(404);
    expect(
      (await request(t.app).post(`${base}/procedures/${labA.procedureId}/retire`).set('Authorization', auth))
        .status,
    ).toBe(404);
    expect((await request(t.app).get(`${base}/test-menu`).set('Authorization', auth)).status).toBe(404);
    // Their own lab's path with the other lab's procedure: not found either.
    expect(
      (
        await request(t.app)
          .patch(`/api/labs/${labB.id}/procedures/${labA.procedureId}`)
          .set('Authorization', auth)
          .send({ code: 'B3' })
      ).status,
    ).toBe(404);
  });

  it('when they touch the other lab’s users, then 404', async () => {
    const auth = labB.supervisor.auth;
    const base = `/api/labs/${labA.id}`;
    expect((await request(t.app).get(`${base}/users`).set('Authorization', auth)).status).toBe(404);
    expect(
      (
        await request(t.app)
          .patch(`${base}/users/${labA.analyst.id}`)
          .set('Authorization', auth)
          .send({ active: false })
      ).status,
    ).toBe(404);
    const invite = await request(t.app)
      .post(`${base}/invitations`)
      .set('Authorization', auth)
      .send({ email: 'new.person@lab.example', name: 'New Person', role: 'analyst' });
    expect(invite.status).toBe(404);
  });

  it('when they touch the other lab’s API tokens, then 404', async () => {
    const created = await request(t.app)
      .post(`/api/labs/${labA.id}/api-tokens`)
      .set('Authorization', labA.supervisor.auth)
      .send({ name: 'nightly push' });
    expect(created.status).toBe(201);
    const auth = labB.supervisor.auth;
    const base = `/api/labs/${labA.id}/api-tokens`;
    expect((await request(t.app).get(base).set('Authorization', auth)).status).toBe(404);
    expect((await request(t.app).post(base).set('Authorization', auth).send({ name: 'sneaky' })).status).toBe(
      404,
    );
    expect(
      (await request(t.app).delete(`${base}/${created.body.id}`).set('Authorization', auth)).status,
    ).toBe(404);
    const list = await request(t.app).get(base).set('Authorization', labA.supervisor.auth);
    expect(list.body.map((x: { revokedAt: string | null }) => x.revokedAt)).toEqual([null]);
  });
});
