import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, TEST_PASSWORD, type TestApp } from '../testing/test-app.ts';
import { CSRF_COOKIE, SESSION_COOKIE } from '../auth/session-cookie.ts';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp('browsersecurity', { env: { PUBLIC_URL: 'http://app.plumbline.test' } });
});
afterAll(async () => t?.close());

/** Signs in through the API and returns the cookies as a browser would keep them. */
async function signInWithCookies() {
  const lab = await t.makeLab();
  const user = await t.makeUser('supervisor', lab.id);
  const res = await request(t.app)
    .post('/api/auth/login')
    .send({ email: user.email, password: TEST_PASSWORD });
  expect(res.status).toBe(200);
  const setCookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const value = (name: string) =>
    setCookies
      .find((c) => c.startsWith(`${name}=`))
      ?.split(';')[0]
      .split('=')[1] ?? '';
  return { res, user, lab, setCookies, session: value(SESSION_COOKIE), csrf: value(CSRF_COOKIE) };
}

describe('session cookie', () => {
  it('when a user signs in, then the token is only in an httpOnly SameSite=Strict cookie, not in the body', async () => {
    const { res, setCookies, session } = await signInWithCookies();
    expect(res.body.token).toBeUndefined();
    expect(JSON.stringify(res.body)).not.toContain(session);
    const sessionCookie = setCookies.find((c) => c.startsWith(`${SESSION_COOKIE}=`)) ?? '';
    expect(sessionCookie).toMatch(/HttpOnly/i);
    expect(sessionCookie).toMatch(/SameSite=Strict/i);
    expect(sessionCookie).toMatch(/Path=\/api/i);
    // Plain HTTP here, so not Secure (a Secure cookie would never be sent back).
    expect(sessionCookie).not.toMatch(/;\s*Secure/i);
    const csrfCookie = setCookies.find((c) => c.startsWith(`${CSRF_COOKIE}=`)) ?? '';
    expect(csrfCookie).not.toMatch(/HttpOnly/i);
    expect(csrfCookie).toMatch(/SameSite=Strict/i);
  });

  it('when the public address is HTTPS, then the cookies are Secure', async () => {
    const https = await createTestApp('browsersecurityhttps', {
      env: { PUBLIC_URL: 'https://app.plumbline.test' },
    });
    try {
      const user = await https.makeUser('coordinator', null);
      const res = await request(https.app)
        .post('/api/auth/login')
        .send({ email: user.email, password: TEST_PASSWORD });
      for (const cookie of ([] as string[]).concat(res.headers['set-cookie'] ?? []))
        expect(cookie).toMatch(/;\s*Secure/i);
    } finally {
      await https.close();
    }
  });

  it('when the cookie is sent, then reads work; a state-changing request needs the matching CSRF header', async () => {
    const { session, csrf, lab } = await signInWithCookies();
    const cookie = `${SESSION_COOKIE}=${session}; ${CSRF_COOKIE}=${csrf}`;
    expect((await request(t.app).get('/api/me').set('Cookie', cookie)).status).toBe(200);
    const body = { name: 'Middleware on the analyser bench' };
    const without = await request(t.app)
      .post(`/api/labs/${lab.id}/api-tokens`)
      .set('Cookie', cookie)
      .send(body);
    expect(without.status).toBe(403);
    expect(without.body.error.message).toMatch(/CSRF/);
    const wrong = await request(t.app)
      .post(`/api/labs/${lab.id}/api-tokens`)
      .set('Cookie', cookie)
      .set('X-CSRF-Token', 'x'.repeat(csrf.length))
      .send(body);
    expect(wrong.status).toBe(403);
    const right = await request(t.app)
      .post(`/api/labs/${lab.id}/api-tokens`)
      .set('Cookie', cookie)
      .set('X-CSRF-Token', csrf)
      .send(body);
    expect(right.status).toBe(201);
  });

  it('when a stale session cookie is still in the browser, then signing in again needs no CSRF token', async () => {
    const { user } = await signInWithCookies();
    const res = await request(t.app)
      .post('/api/auth/login')
      .set('Cookie', `${SESSION_COOKIE}=stale.token.value; ${CSRF_COOKIE}=stale`)
      .send({ email: user.email, password: TEST_PASSWORD });
    expect(res.status).toBe(200);
  });

  it('when the user signs out with the cookie, then the cookies are cleared and the session is refused', async () => {
    const { session, csrf } = await signInWithCookies();
    const cookie = `${SESSION_COOKIE}=${session}; ${CSRF_COOKIE}=${csrf}`;
    const out = await request(t.app).post('/api/auth/logout').set('Cookie', cookie).set('X-CSRF-Token', csrf);
    expect(out.status).toBe(204);
    expect(([] as string[]).concat(out.headers['set-cookie'] ?? []).join('\n')).toMatch(
      new RegExp(`${SESSION_COOKIE}=;`),
    );
    expect((await request(t.app).get('/api/me').set('Cookie', cookie)).status).toBe(401);
  });

  it('when a lab API token is put in the session cookie, then it is not accepted', async () => {
    const res = await request(t.app)
      .get('/api/uploads')
      .set('Cookie', `${SESSION_COOKIE}=plb_${'a'.repeat(43)}`);
    expect(res.status).toBe(401);
  });
});

describe('security headers and CORS', () => {
  it('when any page or API answer is sent, then CSP, frame, nosniff and referrer headers are set', async () => {
    for (const path of ['/api/health', '/api/nope']) {
      const res = await request(t.app).get(path);
      const csp = res.headers['content-security-policy'] ?? '';
      expect(csp).toMatch(/default-src 'self'/);
      expect(csp).toMatch(/frame-ancestors 'none'/);
      expect(csp).toMatch(/script-src 'self'(;|$)/);
      expect(res.headers['x-frame-options']).toBe('DENY');
      expect(res.headers['x-content-type-options']).toBe('nosniff');
      expect(res.headers['referrer-policy']).toBe('no-referrer');
    }
  });

  it('when a request comes from the public origin, then CORS allows it with credentials; any other origin is not allowed', async () => {
    const ok = await request(t.app).get('/api/health').set('Origin', 'http://app.plumbline.test');
    expect(ok.headers['access-control-allow-origin']).toBe('http://app.plumbline.test');
    expect(ok.headers['access-control-allow-credentials']).toBe('true');
    const evil = await request(t.app).get('/api/health').set('Origin', 'http://elsewhere.example');
    expect(evil.headers['access-control-allow-origin']).toBeUndefined();
    const preflight = await request(t.app)
      .options('/api/auth/logout')
      .set('Origin', 'http://elsewhere.example')
      .set('Access-Control-Request-Method', 'POST');
    expect(preflight.headers['access-control-allow-origin']).toBeUndefined();
  });
});
