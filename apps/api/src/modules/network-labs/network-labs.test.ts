import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { randomBytes } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import {
  analytes,
  auditEvents,
  instrumentModels,
  invitations,
  methods,
  procedures,
  reagents,
  users,
} from '@plumbline/db';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../../testing/test-app.ts';

let t: TestApp;
let coordinator: Awaited<ReturnType<TestApp['makeUser']>>;

beforeAll(async () => {
  t = await createTestApp('networklabs');
  coordinator = await t.makeUser('coordinator', null);
});
afterAll(async () => t?.close());

const code = (prefix = 'L') => `${prefix}-${randomBytes(3).toString('hex').toUpperCase()}`;
const email = () => `person-${randomBytes(4).toString('hex')}@lab.example`;

async function auditKinds(entityId: string) {
  const rows = await t.db.select().from(auditEvents).where(eq(auditEvents.entityId, entityId));
  return rows.map((r) => r.kind);
}

describe('labs', () => {
  it('when the coordinator enrols a lab, then it is created active and audited', async () => {
    const labCode = code();
    const res = await request(t.app)
      .post('/api/labs')
      .set('Authorization', coordinator.auth)
      .send({ code: labCode, name: 'Riverside Community Laboratory' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      code: labCode,
      name: 'Riverside Community Laboratory',
      active: true,
      preferredUnits: 'si',
    });
    expect(await auditKinds(res.body.id)).toEqual(['lab.enrol']);
  });

  it('when the lab code is taken, then 409; when code or name is bad, then 400 with field errors', async () => {
    const lab = await t.makeLab();
    const taken = await request(t.app)
      .post('/api/labs')
      .set('Authorization', coordinator.auth)
      .send({ code: lab.code, name: 'X' });
    expect(taken.status).toBe(409);
    expect(taken.body.error.message).toContain(lab.code);
    const bad = await request(t.app)
      .post('/api/labs')
      .set('Authorization', coordinator.auth)
      .send({ code: 'a b', name: '' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['code', 'name']);
  });

  it('when the coordinator edits a lab, then the changes are stored and audited with before and after', async () => {
    const lab = await t.makeLab();
    const res = await request(t.app)
      .patch(`/api/labs/${lab.id}`)
      .set('Authorization', coordinator.auth)
      .send({ name: 'Hillside Hospital Laboratory', preferredUnits: 'conventional', reason: 'renamed' });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ name: 'Hillside Hospital Laboratory', preferredUnits: 'conventional' });
    const [event] = await t.db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.entityId, lab.id), eq(auditEvents.kind, 'lab.update')));
    expect(event.details).toEqual({
      changes: {
        name: { from: lab.name, to: 'Hillside Hospital Laboratory' },
        preferredUnits: { from: 'si', to: 'conventional' },
      },
      reason: 'renamed',
    });
    const bad = await request(t.app)
      .patch(`/api/labs/${lab.id}`)
      .set('Authorization', coordinator.auth)
      .send({ preferredUnits: 'imperial' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('preferredUnits');
  });

  it('when the coordinator deactivates a lab, then it is inactive, audited, and a second time is 409', async () => {
    const lab = await t.makeLab();
    const res = await request(t.app)
      .post(`/api/labs/${lab.id}/deactivate`)
      .set('Authorization', coordinator.auth)
      .send({ reason: 'left the network' });
    expect(res.status).toBe(200);
    expect(res.body.active).toBe(false);
    expect(await auditKinds(lab.id)).toContain('lab.deactivate');
    const again = await request(t.app)
      .post(`/api/labs/${lab.id}/deactivate`)
      .set('Authorization', coordinator.auth);
    expect(again.status).toBe(409);
    const missing = await request(t.app)
      .post('/api/labs/00000000-0000-4000-8000-000000000000/deactivate')
      .set('Authorization', coordinator.auth);
    expect(missing.status).toBe(404);
  });

  it('when an analyst or a supervisor enrols, edits or deactivates a lab, then 403', async () => {
    const lab = await t.makeLab();
    for (const role of ['analyst', 'supervisor'] as const) {
      const user = await t.makeUser(role, lab.id);
      expect(
        (
          await request(t.app)
            .post('/api/labs')
            .set('Authorization', user.auth)
            .send({ code: code(), name: 'X' })
        ).status,
      ).toBe(403);
      expect(
        (
          await request(t.app)
            .patch(`/api/labs/${lab.id}`)
            .set('Authorization', user.auth)
            .send({ name: 'X' })
        ).status,
      ).toBe(403);
      expect(
        (await request(t.app).post(`/api/labs/${lab.id}/deactivate`).set('Authorization', user.auth)).status,
      ).toBe(403);
    }
  });
});

describe('invitations and lab users', () => {
  it('when the coordinator invites a user, the invitee opens the link, sets a password and signs in', async () => {
    const lab = await t.makeLab();
    const address = email();
    const invited = await request(t.app)
      .post(`/api/labs/${lab.id}/invitations`)
      .set('Authorization', coordinator.auth)
      .send({ email: address.toUpperCase(), name: 'Robin Example', role: 'analyst' });
    expect(invited.status).toBe(201);
    expect(invited.body.user).toMatchObject({ email: address, role: 'analyst', labId: lab.id });
    const link: string = invited.body.link;
    expect(link.startsWith(`${t.env.PUBLIC_URL.replace(/\/+$/, '')}/invitations/`)).toBe(true);
    const token = link.split('/invitations/')[1];

    // Only a hash of the token is stored, and the user cannot sign in before accepting.
    const [stored] = await t.db
      .select()
      .from(invitations)
      .where(eq(invitations.userId, invited.body.user.id));
    expect(stored.tokenHash).not.toContain(token);
    expect(stored.tokenHash).toMatch(/^[0-9a-f]{64}$/);
    const early = await request(t.app)
      .post('/api/auth/login')
      .send({ email: address, password: TEST_PASSWORD });
    expect(early.status).toBe(401);

    const info = await request(t.app).get(`/api/invitations/${token}`);
    expect(info.status).toBe(200);
    expect(info.body).toEqual({
      email: address,
      name: 'Robin Example',
      labName: lab.name,
      expiresAt: invited.body.expiresAt,
    });

    const accepted = await request(t.app)
      .post('/api/invitations/accept')
      .send({ token, password: TEST_PASSWORD });
    expect(accepted.status).toBe(200);
    const login = await request(t.app)
      .post('/api/auth/login')
      .send({ email: address, password: TEST_PASSWORD });
    expect(login.status).toBe(200);
    expect(login.body.user).toMatchObject({ email: address, role: 'analyst', labId: lab.id });
    expect(await auditKinds(invited.body.user.id)).toEqual(
      expect.arrayContaining(['lab-user.invite', 'lab-user.accept-invitation']),
    );

    // A used link answers 410; an unknown one 404.
    expect((await request(t.app).get(`/api/invitations/${token}`)).status).toBe(410);
    expect(
      (await request(t.app).post('/api/invitations/accept').send({ token, password: TEST_PASSWORD })).status,
    ).toBe(410);
    expect((await request(t.app).get('/api/invitations/not-a-real-token')).status).toBe(404);
  });

  it('when an invitation has expired, then 410 and the password is not set', async () => {
    const lab = await t.makeLab();
    const invited = await request(t.app)
      .post(`/api/labs/${lab.id}/invitations`)
      .set('Authorization', coordinator.auth)
      .send({ email: email(), name: 'Sam Example', role: 'supervisor' });
    await t.db
      .update(invitations)
      .set({ expiresAt: new Date(Date.now() - 1000) })
      .where(eq(invitations.id, invited.body.invitationId));
    const token = invited.body.link.split('/invitations/')[1];
    expect((await request(t.app).get(`/api/invitations/${token}`)).status).toBe(410);
    const res = await request(t.app).post('/api/invitations/accept').send({ token, password: TEST_PASSWORD });
    expect(res.status).toBe(410);
    const [user] = await t.db.select().from(users).where(eq(users.id, invited.body.user.id));
    expect(user.passwordHash).toBeNull();
  });

  it('when the password is too short, then 400 on password', async () => {
    const res = await request(t.app).post('/api/invitations/accept').send({ token: 'x', password: 'short' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('password');
  });

  it('when the password is 12 spaces, then 400 on password and the invitation stays open', async () => {
    const lab = await t.makeLab();
    const invited = await request(t.app)
      .post(`/api/labs/${lab.id}/invitations`)
      .set('Authorization', coordinator.auth)
      .send({ email: email(), name: 'Sam Example', role: 'analyst' });
    const token = invited.body.link.split('/invitations/')[1];
    const res = await request(t.app)
      .post('/api/invitations/accept')
      .send({ token, password: ' '.repeat(12) });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('password');
    expect((await request(t.app).get(`/api/invitations/${token}`)).status).toBe(200);
  });

  it('when the password is on the list of common passwords, then 400 on password', async () => {
    const lab = await t.makeLab();
    const invited = await request(t.app)
      .post(`/api/labs/${lab.id}/invitations`)
      .set('Authorization', coordinator.auth)
      .send({ email: email(), name: 'Sam Example', role: 'analyst' });
    const token = invited.body.link.split('/invitations/')[1];
    // "1q2w3e4r5t6y" is among the most common passwords of 12 characters in the SecLists top-1M list.
    const res = await request(t.app)
      .post('/api/invitations/accept')
      .send({ token, password: '1Q2W3E4R5T6Y' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0]).toMatchObject({ path: 'password' });
    expect(res.body.error.message).toMatch(/commonly used/);
    const [user] = await t.db.select().from(users).where(eq(users.id, invited.body.user.id));
    expect(user.passwordHash).toBeNull();
  });

  it('when a supervisor invites an address used in another lab, then the answer looks like any invitation and the coordinator sees the conflict', async () => {
    const own = await t.makeLab();
    const other = await t.makeLab();
    const supervisor = await t.makeUser('supervisor', own.id);
    const elsewhere = await t.makeUser('analyst', other.id);
    const res = await request(t.app)
      .post(`/api/labs/${own.id}/invitations`)
      .set('Authorization', supervisor.auth)
      .send({ email: elsewhere.email, name: 'Kim Example', role: 'analyst' });
    expect(res.status).toBe(201);
    expect(res.body.user).toMatchObject({ email: elsewhere.email, labId: own.id, role: 'analyst' });
    expect(res.body.user.id).not.toBe(elsewhere.id);
    expect(Object.keys(res.body).sort()).toEqual(['expiresAt', 'invitationId', 'link', 'user']);
    // The other lab's account is untouched and the conflict is in the coordinator's audit log.
    const [after] = await t.db.select().from(users).where(eq(users.id, elsewhere.id));
    expect(after).toMatchObject({ labId: other.id, active: true, name: elsewhere.name });
    expect(await auditKinds(elsewhere.id)).toEqual(['lab-user.invite-conflict']);
  });

  it('when someone is invited again before accepting, then the old link stops working and the new one works', async () => {
    const lab = await t.makeLab();
    const address = email();
    const first = await request(t.app)
      .post(`/api/labs/${lab.id}/invitations`)
      .set('Authorization', coordinator.auth)
      .send({ email: address, name: 'Alex Example', role: 'analyst' });
    const second = await request(t.app)
      .post(`/api/labs/${lab.id}/invitations`)
      .set('Authorization', coordinator.auth)
      .send({ email: address, name: 'Alex Example', role: 'supervisor' });
    expect(second.status).toBe(201);
    expect(second.body.user.id).toBe(first.body.user.id);
    expect(
      (await request(t.app).get(`/api/invitations/${first.body.link.split('/invitations/')[1]}`)).status,
    ).toBe(404);
    expect(
      (await request(t.app).get(`/api/invitations/${second.body.link.split('/invitations/')[1]}`)).status,
    ).toBe(200);
  });

  it('when the e-mail belongs to an existing user, then 409 on email; bad role or e-mail gives 400', async () => {
    const lab = await t.makeLab();
    const existing = await t.makeUser('analyst', lab.id);
    const taken = await request(t.app)
      .post(`/api/labs/${lab.id}/invitations`)
      .set('Authorization', coordinator.auth)
      .send({ email: existing.email, name: 'Dup', role: 'analyst' });
    expect(taken.status).toBe(409);
    const bad = await request(t.app)
      .post(`/api/labs/${lab.id}/invitations`)
      .set('Authorization', coordinator.auth)
      .send({ email: 'nope', name: 'X', role: 'coordinator' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['email', 'role']);
  });

  it('when a supervisor invites and manages users of their own lab, then it works; another lab answers 404; an analyst gets 403', async () => {
    const own = await t.makeLab();
    const other = await t.makeLab();
    const supervisor = await t.makeUser('supervisor', own.id);
    const analyst = await t.makeUser('analyst', own.id);

    const invited = await request(t.app)
      .post(`/api/labs/${own.id}/invitations`)
      .set('Authorization', supervisor.auth)
      .send({ email: email(), name: 'Jo Example', role: 'analyst' });
    expect(invited.status).toBe(201);
    const list = await request(t.app).get(`/api/labs/${own.id}/users`).set('Authorization', supervisor.auth);
    expect(list.status).toBe(200);
    const listed = list.body.find((u: { id: string }) => u.id === invited.body.user.id);
    expect(listed).toMatchObject({ active: false, invitationPending: true, role: 'analyst' });

    const promoted = await request(t.app)
      .patch(`/api/labs/${own.id}/users/${analyst.id}`)
      .set('Authorization', supervisor.auth)
      .send({ role: 'supervisor', reason: 'new QC lead' });
    expect(promoted.status).toBe(200);
    expect(promoted.body.role).toBe('supervisor');
    const deactivated = await request(t.app)
      .patch(`/api/labs/${own.id}/users/${analyst.id}`)
      .set('Authorization', supervisor.auth)
      .send({ active: false });
    expect(deactivated.body.active).toBe(false);
    expect(await auditKinds(analyst.id)).toEqual(['lab-user.update', 'lab-user.update']);
    // A deactivated user's session stops working at once.
    expect((await request(t.app).get('/api/me').set('Authorization', analyst.auth)).status).toBe(401);

    for (const [method, path, body] of [
      ['get', `/api/labs/${other.id}/users`, undefined],
      ['post', `/api/labs/${other.id}/invitations`, { email: email(), name: 'X', role: 'analyst' }],
      ['patch', `/api/labs/${other.id}/users/${analyst.id}`, { role: 'analyst' }],
    ] as const) {
      const res = await request(t.app)[method](path).set('Authorization', supervisor.auth).send(body);
      expect(res.status).toBe(404);
    }

    const colleague = await t.makeUser('analyst', own.id);
    for (const [method, path, body] of [
      ['get', `/api/labs/${own.id}/users`, undefined],
      ['post', `/api/labs/${own.id}/invitations`, { email: email(), name: 'X', role: 'analyst' }],
      ['patch', `/api/labs/${own.id}/users/${supervisor.id}`, { role: 'analyst' }],
    ] as const) {
      const res = await request(t.app)[method](path).set('Authorization', colleague.auth).send(body);
      expect(res.status).toBe(403);
    }
  });

  it('when a supervisor tries to demote or deactivate themselves, then 409', async () => {
    const lab = await t.makeLab();
    const supervisor = await t.makeUser('supervisor', lab.id);
    const res = await request(t.app)
      .patch(`/api/labs/${lab.id}/users/${supervisor.id}`)
      .set('Authorization', supervisor.auth)
      .send({ active: false });
    expect(res.status).toBe(409);
  });

  it('when someone activates an invited user who has not accepted, then 409; deactivating withdraws the invitation', async () => {
    const lab = await t.makeLab();
    const invited = await request(t.app)
      .post(`/api/labs/${lab.id}/invitations`)
      .set('Authorization', coordinator.auth)
      .send({ email: email(), name: 'Kim Example', role: 'analyst' });
    const userId = invited.body.user.id;
    const activate = await request(t.app)
      .patch(`/api/labs/${lab.id}/users/${userId}`)
      .set('Authorization', coordinator.auth)
      .send({ active: true });
    expect(activate.status).toBe(409);
    const withdraw = await request(t.app)
      .patch(`/api/labs/${lab.id}/users/${userId}`)
      .set('Authorization', coordinator.auth)
      .send({ active: false });
    expect(withdraw.status).toBe(200);
    expect(withdraw.body.invitationPending).toBe(false);
    expect(
      (await request(t.app).get(`/api/invitations/${invited.body.link.split('/invitations/')[1]}`)).status,
    ).toBe(404);
  });

  it('when the user update names no change, then 400', async () => {
    const lab = await t.makeLab();
    const analyst = await t.makeUser('analyst', lab.id);
    const res = await request(t.app)
      .patch(`/api/labs/${lab.id}/users/${analyst.id}`)
      .set('Authorization', coordinator.auth)
      .send({});
    expect(res.status).toBe(400);
  });
});

describe('procedures across the network', () => {
  it('when labs share keys at different tiers, then each procedure gets its lab counts and unpeerable ones are flagged', async () => {
    const suffix = randomBytes(3).toString('hex');
    const [analyte] = await t.db
      .insert(analytes)
      .values({ code: `GLU-${suffix}`, name: 'Glucose', unit: 'mmol/L' })
      .returning();
    const [lonely] = await t.db
      .insert(analytes)
      .values({ code: `ZZ-${suffix}`, name: 'Rare analyte', unit: 'mmol/L' })
      .returning();
    const [modelA, modelB] = await t.db
      .insert(instrumentModels)
      .values([
        { code: `IMA-${suffix}`, name: 'Analyser A' },
        { code: `IMB-${suffix}`, name: 'Analyser B' },
      ])
      .returning();
    const [hexokinase, oxidase] = await t.db
      .insert(methods)
      .values([
        { code: `HK-${suffix}`, name: 'Hexokinase' },
        { code: `GO-${suffix}`, name: 'Glucose oxidase' },
      ])
      .returning();
    const [reagent] = await t.db
      .insert(reagents)
      .values({ code: `R-${suffix}`, name: 'Reagent' })
      .returning();
    const labs = await Promise.all([1, 2, 3, 4, 5].map(() => t.makeLab()));
    const inactive = labs[4];
    await request(t.app).post(`/api/labs/${inactive.id}/deactivate`).set('Authorization', coordinator.auth);
    const base = { analyteId: analyte.id, reagentId: reagent.id, unit: 'mmol/L' };
    // Labs 0 and 1: model A + hexokinase; lab 2: model B + hexokinase; lab 3: model A + oxidase;
    // lab 0 also registers the same key twice (counts once); the inactive lab 4 shares lab 0's key.
    await t.db.insert(procedures).values([
      { ...base, labId: labs[0].id, code: 'GLU1', instrumentModelId: modelA.id, methodId: hexokinase.id },
      { ...base, labId: labs[0].id, code: 'GLU2', instrumentModelId: modelA.id, methodId: hexokinase.id },
      { ...base, labId: labs[1].id, code: 'GLU', instrumentModelId: modelA.id, methodId: hexokinase.id },
      { ...base, labId: labs[2].id, code: 'GLU', instrumentModelId: modelB.id, methodId: hexokinase.id },
      { ...base, labId: labs[3].id, code: 'GLU', instrumentModelId: modelA.id, methodId: oxidase.id },
      { ...base, labId: inactive.id, code: 'GLU', instrumentModelId: modelA.id, methodId: hexokinase.id },
      {
        ...base,
        analyteId: lonely.id,
        labId: labs[0].id,
        code: 'ZZ',
        instrumentModelId: modelA.id,
        methodId: hexokinase.id,
      },
    ]);

    const res = await request(t.app)
      .get(`/api/network/procedures?analyteId=${analyte.id}`)
      .set('Authorization', coordinator.auth);
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(6);
    const row = (labId: string, procedureCode: string) =>
      res.body.items.find(
        (i: { lab: { id: string }; code: string }) => i.lab.id === labId && i.code === procedureCode,
      );
    // Counted by hand from the rows above: active labs only, each lab once per key.
    expect(row(labs[0].id, 'GLU1').peerable).toEqual({
      instrument: { labs: 2, enough: false },
      method: { labs: 3, enough: true },
      analyte: { labs: 4, enough: true },
    });
    expect(row(labs[2].id, 'GLU').peerable.instrument.labs).toBe(1);
    expect(row(labs[3].id, 'GLU').peerable.method).toEqual({ labs: 1, enough: false });
    expect(row(labs[3].id, 'GLU')).toMatchObject({
      lab: { code: labs[3].code, name: labs[3].name },
      instrumentModel: { code: modelA.code },
      method: { code: oxidase.code },
      reagent: { code: reagent.code },
      unit: 'mmol/L',
      unpeerable: false,
    });

    const unpeerable = await request(t.app)
      .get(`/api/network/procedures?unpeerable=true&labId=${labs[0].id}`)
      .set('Authorization', coordinator.auth);
    expect(unpeerable.body.items.map((i: { code: string }) => i.code)).toEqual(['ZZ']);
    expect(unpeerable.body.items[0].peerable.analyte).toEqual({ labs: 1, enough: false });

    const stricter = await request(t.app)
      .get(`/api/network/procedures?analyteId=${analyte.id}&minLabs=5&unpeerable=true`)
      .set('Authorization', coordinator.auth);
    expect(stricter.body.total).toBe(6);

    const paged = await request(t.app)
      .get(
        `/api/network/procedures?analyteId=${analyte.id}&instrumentModelId=${modelA.id}&methodId=${hexokinase.id}&limit=2&offset=0`,
      )
      .set('Authorization', coordinator.auth);
    expect(paged.body.total).toBe(4);
    expect(paged.body.items).toHaveLength(2);
  });

  it('when the filters are malformed, then 400; an analyst or a supervisor gets 403', async () => {
    const bad = await request(t.app)
      .get('/api/network/procedures?analyteId=glucose&minLabs=0')
      .set('Authorization', coordinator.auth);
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual([
      'analyteId',
      'minLabs',
    ]);
    const lab = await t.makeLab();
    for (const role of ['analyst', 'supervisor'] as const) {
      const user = await t.makeUser(role, lab.id);
      expect(
        (await request(t.app).get('/api/network/procedures').set('Authorization', user.auth)).status,
      ).toBe(403);
    }
  });
});
