import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import jwt from 'jsonwebtoken';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../../testing/test-app.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp('auth');
});
afterAll(async () => t?.close());

describe('sign-in', () => {
  it('when the password is right, then 200 with a token and the user', async () => {
    const lab = await t.makeLab();
    const user = await t.makeUser('analyst', lab.id);
    const res = await request(t.app)
      .post('/api/auth/login')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(res.status).toBe(200);
    expect(res.body.user).toEqual({
      id: user.id,
      email: user.email,
      name: user.name,
      role: 'analyst',
      labId: lab.id,
    });
    const me = await request(t.app)
      .get('/api/me')
      .set('Cookie', res.headers['set-cookie'] ?? []);
    expect(me.status).toBe(200);
    expect(me.body.lab).toEqual({ id: lab.id, code: lab.code, name: lab.name });
  });

  it('when the e-mail differs only in case, then sign-in still works', async () => {
    const user = await t.makeUser('coordinator', null);
    const res = await request(t.app)
      .post('/api/auth/login')
      .send({ email: user.email.toUpperCase(), password: TEST_PASSWORD });
    expect(res.status).toBe(200);
  });

  it('when the password is wrong, then 401 with a message', async () => {
    const user = await t.makeUser('analyst', (await t.makeLab()).id);
    const res = await request(t.app).post('/api/auth/login').send({ email: user.email, password: 'wrong' });
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
    expect(res.body.error.message).toMatch(/e-mail address or password is incorrect/);
  });

  it('when the account is deactivated, then 401', async () => {
    const user = await t.makeUser('analyst', (await t.makeLab()).id, { active: false });
    const res = await request(t.app)
      .post('/api/auth/login')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(res.status).toBe(401);
  });

  it('when the body is not a valid sign-in, then 400 with field errors', async () => {
    const res = await request(t.app).post('/api/auth/login').send({ email: 'not-an-email' });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_request');
    const paths = res.body.error.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['email', 'password']));
  });
});

describe('session tokens', () => {
  it('when no token is sent, then 401', async () => {
    const res = await request(t.app).get('/api/me');
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  it('when the token has expired, then 401 saying so', async () => {
    const user = await t.makeUser('analyst', (await t.makeLab()).id);
    const expired = jwt.sign({ role: 'analyst', labId: user.labId }, t.env.JWT_SECRET, {
      subject: user.id,
      jwtid: 'expired-one',
      expiresIn: -10,
      algorithm: 'HS256',
    });
    const res = await request(t.app).get('/api/me').set('Authorization', `Bearer ${expired}`);
    expect(res.status).toBe(401);
    expect(res.body.error.message).toMatch(/expired/);
  });

  it('when the token is tampered with, then 401', async () => {
    const user = await t.makeUser('analyst', (await t.makeLab()).id);
    const [header, payload, signature] = user.token.split('.');
    const claims = JSON.parse(Buffer.from(payload, 'base64url').toString());
    const forged = Buffer.from(JSON.stringify({ ...claims, role: 'coordinator' })).toString('base64url');
    const res = await request(t.app)
      .get('/api/me')
      .set('Authorization', `Bearer ${header}.${forged}.${signature}`);
    expect(res.status).toBe(401);
  });

  it('when the token is signed with another secret, then 401', async () => {
    const user = await t.makeUser('analyst', (await t.makeLab()).id);
    const other = jwt.sign({ role: 'coordinator' }, 'x'.repeat(40), {
      subject: user.id,
      jwtid: 'j',
      expiresIn: 60,
    });
    const res = await request(t.app).get('/api/me').set('Authorization', `Bearer ${other}`);
    expect(res.status).toBe(401);
  });

  it('when the user signs out, then the same token is refused', async () => {
    const user = await t.makeUser('supervisor', (await t.makeLab()).id);
    expect((await request(t.app).get('/api/me').set('Authorization', user.auth)).status).toBe(200);
    expect((await request(t.app).post('/api/auth/logout').set('Authorization', user.auth)).status).toBe(204);
    const after = await request(t.app).get('/api/me').set('Authorization', user.auth);
    expect(after.status).toBe(401);
    expect(after.body.error.message).toMatch(/ended/);
  });
});

describe('lab scoping', () => {
  it('when an analyst asks for another lab, then 404; for their own lab, then 200', async () => {
    const own = await t.makeLab();
    const other = await t.makeLab();
    const analyst = await t.makeUser('analyst', own.id);
    expect((await request(t.app).get(`/api/labs/${own.id}`).set('Authorization', analyst.auth)).status).toBe(
      200,
    );
    const res = await request(t.app).get(`/api/labs/${other.id}`).set('Authorization', analyst.auth);
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });

  it('when the coordinator lists labs, then every lab is there; an analyst sees only their own', async () => {
    const a = await t.makeLab();
    const b = await t.makeLab();
    const coordinator = await t.makeUser('coordinator', null);
    const analyst = await t.makeUser('analyst', a.id);
    const all = await request(t.app).get('/api/labs').set('Authorization', coordinator.auth);
    expect(all.body.map((l: { id: string }) => l.id)).toEqual(expect.arrayContaining([a.id, b.id]));
    const mine = await request(t.app).get('/api/labs').set('Authorization', analyst.auth);
    expect(mine.body.map((l: { id: string }) => l.id)).toEqual([a.id]);
  });
});

describe('health', () => {
  it('when PostgreSQL and Redis answer, then 200 ok', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', db: 'ok', redis: 'ok' });
  });

  it('when an unknown API route is called, then 404 with an error body', async () => {
    const res = await request(t.app).get('/api/nope');
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('deactivated labs', () => {
  it('when a lab is deactivated, then its users can neither sign in nor use an existing session', async () => {
    const { labs } = await import('@plumbline/db');
    const { eq } = await import('drizzle-orm');
    const lab = await t.makeLab();
    const user = await t.makeUser('analyst', lab.id);
    await t.db.update(labs).set({ active: false }).where(eq(labs.id, lab.id));
    const login = await request(t.app)
      .post('/api/auth/login')
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(login.status).toBe(401);
    expect((await request(t.app).get('/api/me').set('Authorization', user.auth)).status).toBe(401);
  });
});
