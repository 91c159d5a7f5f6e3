import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { auditEvents, procedureEvents } from '@plumbline/db';
import { detectShifts } from '@plumbline/stats';
import { procedureEventSchema, procedureShiftsSchema, type ProcedureShifts } from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import {
  seedWorkspaceNetwork,
  type WorkspaceNetwork,
} from '../report-drilldown/testing/workspace-network.ts';

let t: TestApp;
let net: WorkspaceNetwork;

beforeAll(async () => {
  t = await createTestApp('procedure-events');
  net = await seedWorkspaceNetwork(t);
});
afterAll(async () => {
  await t?.close();
});

const eventsUrl = (labId: string, procedureId: string) =>
  `/api/labs/${labId}/procedures/${procedureId}/events`;

describe('procedure events', () => {
  it('when a supervisor and an analyst record events, then the lab lists them newest first and each is audited', async () => {
    const A = net.labs.A;
    const first = await request(t.app)
      .post(eventsUrl(A.id, A.glucose))
      .set('Authorization', A.supervisor.auth)
      .send({ occurredOn: '2026-02-20', kind: 'reagent-lot', note: 'New reagent lot R-0420 opened' });
    expect(first.status).toBe(201);
    procedureEventSchema.parse(first.body);
    const second = await request(t.app)
      .post(eventsUrl(A.id, A.glucose))
      .set('Authorization', A.analyst.auth)
      .send({ occurredOn: '2025-10-01', kind: 'maintenance', note: '' });
    expect(second.status).toBe(201);

    const listed = await request(t.app).get(eventsUrl(A.id, A.glucose)).set('Authorization', A.analyst.auth);
    expect(listed.status).toBe(200);
    expect(listed.body.map((e: { occurredOn: string }) => e.occurredOn)).toEqual([
      '2026-02-20',
      '2025-10-01',
    ]);
    const audited = await t.db.select().from(auditEvents).where(eq(auditEvents.entityId, first.body.id));
    expect(audited.map((a) => a.kind)).toEqual(['procedure-event.recorded']);
  });

  it('when the input is bad, then 400 names the field', async () => {
    const A = net.labs.A;
    const res = await request(t.app)
      .post(eventsUrl(A.id, A.glucose))
      .set('Authorization', A.supervisor.auth)
      .send({ occurredOn: '2026-02-30', kind: 'new-moon' });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/occurredOn/);
    expect(res.body.error.message).toMatch(/kind/);
  });

  it('when another lab’s user reads or records events of the lab, then 404, and its events are never listed', async () => {
    const A = net.labs.A;
    const B = net.labs.B;
    await request(t.app)
      .post(eventsUrl(B.id, B.glucose))
      .set('Authorization', B.supervisor.auth)
      .send({ occurredOn: '2026-02-25', kind: 'calibrator-lot', note: 'Lab B only' })
      .expect(201);
    for (const res of [
      await request(t.app).get(eventsUrl(A.id, A.glucose)).set('Authorization', B.supervisor.auth),
      await request(t.app).get(`/api/labs/${A.id}/procedure-events`).set('Authorization', B.analyst.auth),
      await request(t.app)
        .get(`/api/labs/${A.id}/procedures/${A.glucose}/shifts`)
        .set('Authorization', B.analyst.auth),
      await request(t.app)
        .post(eventsUrl(A.id, A.glucose))
        .set('Authorization', B.supervisor.auth)
        .send({ occurredOn: '2026-02-01', kind: 'maintenance' }),
      // Lab B's procedure under lab A's id: not lab A's procedure.
      await request(t.app).get(eventsUrl(A.id, B.glucose)).set('Authorization', A.analyst.auth),
    ]) {
      expect(res.status).toBe(404);
    }
    const all = await request(t.app)
      .get(`/api/labs/${A.id}/procedure-events`)
      .set('Authorization', A.analyst.auth);
    expect(all.body.some((e: { note: string }) => e.note === 'Lab B only')).toBe(false);
  });

  it('when the coordinator records an event, then 403 (only the lab records its changes)', async () => {
    const coordinator = await t.makeUser('coordinator', null);
    const res = await request(t.app)
      .post(eventsUrl(net.labs.A.id, net.labs.A.glucose))
      .set('Authorization', coordinator.auth)
      .send({ occurredOn: '2026-02-01', kind: 'maintenance' });
    expect(res.status).toBe(403);
  });

  it('when middleware posts a CSV with the lab API token, then every row is stored; one bad row refuses the file naming line and column', async () => {
    const C = net.labs.C;
    const created = await request(t.app)
      .post(`/api/labs/${C.id}/api-tokens`)
      .set('Authorization', C.supervisor.auth)
      .send({ name: 'Middleware events' });
    const token = `Bearer ${created.body.token}`;
    const bad = await request(t.app)
      .post(`/api/labs/${C.id}/procedure-events`)
      .set('Authorization', token)
      .set('Content-Type', 'text/csv')
      .send('procedure,date,kind,note\nGLU1,2026-01-05,control-lot,ok\nNOPE,2026-13-01,reagent-lot,x\n');
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/line 3, procedure/);
    expect(bad.body.error.message).toMatch(/line 3, date/);
    expect(await t.db.select().from(procedureEvents).where(eq(procedureEvents.labId, C.id))).toHaveLength(0);

    const good = await request(t.app)
      .post(`/api/labs/${C.id}/procedure-events`)
      .set('Authorization', token)
      .set('Content-Type', 'text/csv')
      .send('procedure,date,kind,note\nGLU1,2026-01-05,control-lot,ok\ncrea1,2026-01-06,recalibration,\n');
    expect(good.status).toBe(201);
    expect(good.body).toEqual({ created: 2 });
    const listed = await request(t.app)
      .get(`/api/labs/${C.id}/procedure-events`)
      .set('Authorization', C.analyst.auth);
    expect(listed.body.map((e: { recordedBy: string }) => e.recordedBy)).toEqual(['API token', 'API token']);

    // The token of lab C cannot write to lab A.
    const other = await request(t.app)
      .post(`/api/labs/${net.labs.A.id}/procedure-events`)
      .set('Authorization', token)
      .set('Content-Type', 'text/csv')
      .send('procedure,date,kind,note\nGLU1,2026-01-05,control-lot,ok\n');
    expect(other.status).toBe(404);
  });
});

describe('shifts of a procedure', () => {
  it('when the SDI jumps in March and a reagent lot changed in February, then the shift is annotated with that event and not the older one', async () => {
    const A = net.labs.A;
    const res = await request(t.app)
      .get(`/api/labs/${A.id}/procedures/${A.glucose}/shifts`)
      .set('Authorization', A.analyst.auth);
    expect(res.status).toBe(200);
    const body = procedureShiftsSchema.parse(res.body) as ProcedureShifts;
    // The detector applied to the same SDI series gives the same shifts (combined Shewhart-CUSUM with
    // k 0.5, h 5 and a 3 SDI limit, methods.md §8). Lab A's March SDI is about 3.4 (seeded network).
    for (const series of body.series) {
      const expected = detectShifts(
        series.points.map((p) => p.sdi),
        { k: 0.5, h: 5, shewhart: 3 },
      );
      const found = body.shifts.filter(
        (s) => s.controlLotId === series.controlLotId && s.level === series.level,
      );
      expect(found.map((s) => s.period)).toEqual(expected.map((s) => series.points[s.index].period));
    }
    const march = body.shifts.filter((s) => s.period === '2026-03');
    expect(march.length).toBeGreaterThan(0);
    for (const shift of march) {
      expect(shift.direction).toBe('up');
      expect(shift.sizePct).toBeGreaterThan(0);
      // 2026-02-20 is within 92 days before March; 2025-10-01 is not.
      expect(shift.events.map((e) => `${e.occurredOn} ${e.kind}`)).toEqual(['2026-02-20 reagent-lot']);
    }
  });

  it('when the shift is signalled in the latest period, then the lab overview lists it under "needs attention" with the event', async () => {
    const A = net.labs.A;
    const res = await request(t.app).get(`/api/labs/${A.id}/overview`).set('Authorization', A.analyst.auth);
    expect(res.status).toBe(200);
    const shifts = res.body.attention.filter((a: { kind: string }) => a.kind === 'shift-detected');
    expect(shifts.length).toBeGreaterThan(0);
    expect(shifts[0].message).toMatch(
      /^GLU1 .*SDI shifted up .* from 2026-03; recorded before it: reagent-lot on 2026-02-20/,
    );
    // Lab B has no shift and sees none of lab A's.
    const other = await request(t.app)
      .get(`/api/labs/${net.labs.B.id}/overview`)
      .set('Authorization', net.labs.B.analyst.auth);
    expect(other.body.attention.filter((a: { kind: string }) => a.kind === 'shift-detected')).toEqual([]);
  });
});
