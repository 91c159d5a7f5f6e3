import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { recordAudit } from '@plumbline/db';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp('audit');
});
afterAll(async () => t?.close());

describe('audit log', () => {
  it('when an analyst or a supervisor asks for the audit log, then 403', async () => {
    const lab = await t.makeLab();
    for (const role of ['analyst', 'supervisor'] as const) {
      const user = await t.makeUser(role, lab.id);
      const res = await request(t.app).get('/api/audit-events').set('Authorization', user.auth);
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('forbidden');
    }
  });

  it('when the coordinator filters by lab and kind, then only matching events come back, newest first', async () => {
    const coordinator = await t.makeUser('coordinator', null);
    const a = await t.makeLab();
    const b = await t.makeLab();
    await recordAudit(t.db, { kind: 'test.one', labId: a.id, actorId: coordinator.id, details: { n: 1 } });
    await recordAudit(t.db, { kind: 'test.one', labId: b.id, actorId: coordinator.id });
    await recordAudit(t.db, { kind: 'test.two', labId: a.id, actorId: coordinator.id, details: { n: 2 } });
    const res = await request(t.app)
      .get(`/api/audit-events?labId=${a.id}&kind=test.one`)
      .set('Authorization', coordinator.auth);
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(1);
    expect(res.body.items[0]).toMatchObject({
      kind: 'test.one',
      lab: { id: a.id, code: a.code },
      details: { n: 1 },
    });
    const csv = await request(t.app)
      .get(`/api/audit-events.csv?labId=${a.id}`)
      .set('Authorization', coordinator.auth);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    const lines = csv.text.trim().split('\r\n');
    expect(lines[0]).toBe('at,actor,actor_email,actor_label,lab,kind,entity,entity_id,details');
    expect(lines.slice(1).map((l) => l.split(',')[5])).toEqual(['test.two', 'test.one']);
  });

  it('when a filter is malformed, then 400 naming the field', async () => {
    const coordinator = await t.makeUser('coordinator', null);
    const res = await request(t.app)
      .get('/api/audit-events?from=yesterday')
      .set('Authorization', coordinator.auth);
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('from');
  });
});
