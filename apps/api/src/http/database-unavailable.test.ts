import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createServer } from 'node:net';
import type { AddressInfo } from 'node:net';
import { createDb } from '@plumbline/db';
import { createApp } from '../app.ts';
import { createTestApp, type TestApp } from '../testing/test-app.ts';

// While PostgreSQL is away every route that needs it answers 503 with Retry-After (not 500), so
// clients and load balancers know to come back; the resilience suite checks recovery after a restart.

let t: TestApp;
let away: ReturnType<typeof createDb>;

beforeAll(async () => {
  t = await createTestApp('dbaway');
  // A port nobody listens on: connections are refused, as while the database restarts.
  const probe = createServer();
  await new Promise<void>((resolve) => probe.listen(0, '127.0.0.1', resolve));
  const { port } = probe.address() as AddressInfo;
  await new Promise((resolve) => probe.close(resolve));
  away = createDb(`postgres://postgres@127.0.0.1:${port}/plumbline`);
});
afterAll(async () => {
  await away?.pool.end();
  await t?.close();
});

describe('when the database cannot be reached', () => {
  it('then a signed-in request is answered 503 with Retry-After and a clear message', async () => {
    const lab = await t.makeLab();
    const analyst = await t.makeUser('analyst', lab.id);
    const app = createApp({ ...t.deps, db: away.db });
    const res = await request(app).get('/api/uploads').set('Authorization', analyst.auth);
    expect(res.status).toBe(503);
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
    expect(res.body.error.code).toBe('service_unavailable');
    expect(res.body.error.message).toMatch(/try again/i);
  });

  it('then the health check says the database is down, with Retry-After', async () => {
    const app = createApp({ ...t.deps, db: away.db });
    const res = await request(app).get('/api/health');
    expect(res.status).toBe(503);
    expect(res.body.db).toBe('down');
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
  });
});
