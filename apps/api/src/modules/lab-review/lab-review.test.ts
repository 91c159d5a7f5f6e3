import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { auditEvents } from '@plumbline/db';
import { createQcCatalogue, type QcCatalogue } from '@plumbline/db/testing';
import { commentSchema, signoffSchema } from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';

let t: TestApp;
let catalogue: QcCatalogue;
type Member = Awaited<ReturnType<TestApp['makeUser']>>;
let lab: { id: string; procedureId: string; analyst: Member; supervisor: Member };
let other: { id: string; procedureId: string; analyst: Member; supervisor: Member };
let coordinator: Member;

async function makeLab() {
  const { lab: created, procedures } = await catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
  return {
    id: created.id,
    procedureId: procedures[0].id,
    analyst: await t.makeUser('analyst', created.id),
    supervisor: await t.makeUser('supervisor', created.id),
  };
}

beforeAll(async () => {
  t = await createTestApp('labreview');
  catalogue = await createQcCatalogue(t.db);
  lab = await makeLab();
  other = await makeLab();
  coordinator = await t.makeUser('coordinator', null);
});
afterAll(async () => t?.close());

const commentBody = (period: string, body: string, level = 1) => ({
  period,
  procedureId: lab.procedureId,
  controlLotId: catalogue.lot.id,
  level,
  body,
});

async function auditKindsOf(entityId: string) {
  return (await t.db.select().from(auditEvents).where(eq(auditEvents.entityId, entityId))).map((e) => e.kind);
}

describe('comments', () => {
  it('when an analyst comments on a row, then it is stored with its author, listed and audited', async () => {
    const res = await request(t.app)
      .post(`/api/labs/${lab.id}/comments`)
      .set('Authorization', lab.analyst.auth)
      .send(commentBody('2026-01', '  Recalibrated after the reagent lot change.  '));
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      period: '2026-01',
      procedure: { id: lab.procedureId, code: 'GLU1' },
      analyte: { name: 'Glucose' },
      controlLot: { id: catalogue.lot.id },
      level: 1,
      body: 'Recalibrated after the reagent lot change.',
      author: { id: lab.analyst.id, name: lab.analyst.name },
    });
    commentSchema.parse(res.body);
    expect(await auditKindsOf(res.body.id)).toEqual(['review-comment.created']);
    const list = await request(t.app)
      .get(`/api/labs/${lab.id}/comments?period=2026-01`)
      .set('Authorization', lab.supervisor.auth);
    expect(list.body.map((c: { id: string }) => c.id)).toEqual([res.body.id]);
  });

  it('when the comment is invalid, names another lab’s procedure or a level the lot lacks, then 400, 404 or 422', async () => {
    const post = (body: object) =>
      request(t.app).post(`/api/labs/${lab.id}/comments`).set('Authorization', lab.analyst.auth).send(body);
    const empty = await post(commentBody('2026-01', '   '));
    expect(empty.status).toBe(400);
    expect(empty.body.error.details[0].path).toBe('body');
    expect((await post({ ...commentBody('2026-01', 'x'), procedureId: other.procedureId })).status).toBe(404);
    const level = await post(commentBody('2026-01', 'x', 5));
    expect(level.status).toBe(422);
    expect(level.body.error.message).toContain('no level 5');
  });

  it('when the author edits and deletes a comment of an unsigned period, then both work and are audited', async () => {
    const created = await request(t.app)
      .post(`/api/labs/${lab.id}/comments`)
      .set('Authorization', lab.analyst.auth)
      .send(commentBody('2026-01', 'first'));
    const edited = await request(t.app)
      .patch(`/api/labs/${lab.id}/comments/${created.body.id}`)
      .set('Authorization', lab.analyst.auth)
      .send({ body: 'second' });
    expect(edited.status).toBe(200);
    expect(edited.body.body).toBe('second');
    const removed = await request(t.app)
      .delete(`/api/labs/${lab.id}/comments/${created.body.id}`)
      .set('Authorization', lab.analyst.auth);
    expect(removed.status).toBe(204);
    expect(await auditKindsOf(created.body.id)).toEqual([
      'review-comment.created',
      'review-comment.edited',
      'review-comment.deleted',
    ]);
  });

  it('when someone else’s analyst, another lab or the coordinator tries to write, then 403 or 404', async () => {
    const created = await request(t.app)
      .post(`/api/labs/${lab.id}/comments`)
      .set('Authorization', lab.analyst.auth)
      .send(commentBody('2026-01', 'mine'));
    const colleague = await t.makeUser('analyst', lab.id);
    const patch = (auth: string) =>
      request(t.app)
        .patch(`/api/labs/${lab.id}/comments/${created.body.id}`)
        .set('Authorization', auth)
        .send({ body: 'changed' });
    expect((await patch(colleague.auth)).status).toBe(403);
    expect((await patch(other.supervisor.auth)).status).toBe(404);
    expect((await patch(lab.supervisor.auth)).status).toBe(200);
    const byCoordinator = await request(t.app)
      .post(`/api/labs/${lab.id}/comments`)
      .set('Authorization', coordinator.auth)
      .send(commentBody('2026-01', 'x'));
    expect(byCoordinator.status).toBe(403);
    expect(
      (await request(t.app).get(`/api/labs/${lab.id}/comments`).set('Authorization', other.analyst.auth))
        .status,
    ).toBe(404);
  });
});

describe('sign-off', () => {
  it('when an analyst signs, then 403; when the supervisor of another lab signs, then 404', async () => {
    const body = { period: '2026-02', statement: 'Reviewed.' };
    expect(
      (
        await request(t.app)
          .post(`/api/labs/${lab.id}/signoffs`)
          .set('Authorization', lab.analyst.auth)
          .send(body)
      ).status,
    ).toBe(403);
    expect(
      (
        await request(t.app)
          .post(`/api/labs/${lab.id}/signoffs`)
          .set('Authorization', other.supervisor.auth)
          .send(body)
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .post(`/api/labs/${lab.id}/signoffs`)
          .set('Authorization', coordinator.auth)
          .send(body)
      ).status,
    ).toBe(403);
  });

  it('when the supervisor signs a period, then it is read-only except for new comments (409 on edit and delete)', async () => {
    const before = await request(t.app)
      .post(`/api/labs/${lab.id}/comments`)
      .set('Authorization', lab.analyst.auth)
      .send(commentBody('2026-02', 'before'));
    const unsigned = await request(t.app)
      .get(`/api/labs/${lab.id}/signoffs/2026-02`)
      .set('Authorization', lab.analyst.auth);
    expect(unsigned.body).toEqual({ period: '2026-02', signoff: null });

    const signed = await request(t.app)
      .post(`/api/labs/${lab.id}/signoffs`)
      .set('Authorization', lab.supervisor.auth)
      .send({ period: '2026-02', statement: 'All flagged rows reviewed; corrective actions documented.' });
    expect(signed.status).toBe(201);
    expect(signed.body).toMatchObject({
      labId: lab.id,
      period: '2026-02',
      statement: 'All flagged rows reviewed; corrective actions documented.',
      signedBy: { id: lab.supervisor.id, name: lab.supervisor.name },
    });
    signoffSchema.parse(signed.body);
    expect(await auditKindsOf('2026-02')).toContain('period.signed-off');

    const again = await request(t.app)
      .post(`/api/labs/${lab.id}/signoffs`)
      .set('Authorization', lab.supervisor.auth)
      .send({ period: '2026-02', statement: 'Again.' });
    expect(again.status).toBe(409);
    expect(again.body.error.code).toBe('conflict');

    const edit = await request(t.app)
      .patch(`/api/labs/${lab.id}/comments/${before.body.id}`)
      .set('Authorization', lab.analyst.auth)
      .send({ body: 'after' });
    expect(edit.status).toBe(409);
    expect(edit.body.error.message).toContain('signed off');
    const remove = await request(t.app)
      .delete(`/api/labs/${lab.id}/comments/${before.body.id}`)
      .set('Authorization', lab.supervisor.auth);
    expect(remove.status).toBe(409);

    const late = await request(t.app)
      .post(`/api/labs/${lab.id}/comments`)
      .set('Authorization', lab.analyst.auth)
      .send(commentBody('2026-02', 'Follow-up after sign-off.'));
    expect(late.status).toBe(201);

    const read = await request(t.app)
      .get(`/api/labs/${lab.id}/signoffs/2026-02`)
      .set('Authorization', lab.analyst.auth);
    expect(read.body.signoff).toMatchObject({ period: '2026-02', signedBy: { id: lab.supervisor.id } });
    const list = await request(t.app)
      .get(`/api/labs/${lab.id}/signoffs`)
      .set('Authorization', lab.analyst.auth);
    expect(list.body.map((s: { period: string }) => s.period)).toEqual(['2026-02']);
    // Another lab's sign-off state is not revealed.
    expect(
      (
        await request(t.app)
          .get(`/api/labs/${lab.id}/signoffs/2026-02`)
          .set('Authorization', other.supervisor.auth)
      ).status,
    ).toBe(404);
  });

  it('when the period does not exist or is malformed, then 404 or 400', async () => {
    const unknown = await request(t.app)
      .post(`/api/labs/${lab.id}/signoffs`)
      .set('Authorization', lab.supervisor.auth)
      .send({ period: '2031-01', statement: 'x' });
    expect(unknown.status).toBe(404);
    expect(
      (
        await request(t.app)
          .get(`/api/labs/${lab.id}/signoffs/2026-2`)
          .set('Authorization', lab.supervisor.auth)
      ).status,
    ).toBe(400);
  });
});
