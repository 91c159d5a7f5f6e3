import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { randomUUID } from 'node:crypto';
import { createTestApp, type TestApp } from '../testing/test-app.ts';
import { expressRoutes, pathParams, type RouteEntry } from '../testing/routes.ts';

/** The routes the OpenAPI document describes, in Express form (`/api/labs/:labId`). */
async function documentedRoutes(): Promise<RouteEntry[]> {
  const res = await request(t.app).get('/api/openapi.json');
  expect(res.status).toBe(200);
  const paths = res.body.paths as Record<string, Record<string, unknown>>;
  return Object.entries(paths).flatMap(([path, item]) =>
    Object.keys(item).map((method) => ({
      method: method.toUpperCase(),
      path: `/api${path.replace(/\{(\w+)\}/g, ':$1')}`,
    })),
  );
}
const key = (r: RouteEntry) => `${r.method} ${r.path}`;

let t: TestApp;
let callers: { name: string; auth: string; labId: string }[];
beforeAll(async () => {
  t = await createTestApp('badinput');
  const lab = await t.makeLab();
  const coordinator = await t.makeUser('coordinator', null);
  const supervisor = await t.makeUser('supervisor', lab.id);
  callers = [
    { name: 'coordinator', auth: coordinator.auth, labId: lab.id },
    { name: 'supervisor', auth: supervisor.auth, labId: lab.id },
  ];
});
afterAll(async () => t?.close());

const LONG = 'x'.repeat(5000);
/** Malformed path segments: not ids, too long, encoded oddities, numbers out of range, injection attempts. */
const BAD_SEGMENTS = [
  'not-a-uuid',
  LONG,
  '00000000-0000-0000-0000-00000000000g',
  '-1',
  '1e309',
  '9999-99',
  'null',
  '%00',
  '%E0%A4%A',
  encodeURIComponent("' OR 1=1 --"),
  encodeURIComponent('../../etc/passwd'),
];
/** Query strings with malformed ids, wrong types, repeated keys and too-long values. */
const BAD_QUERIES = [
  'labId=not-a-uuid&period=2026-13&procedureId=x&analyteId=x&controlLotId=x&from=yesterday&to=x',
  `limit=abc&offset=-5&page=1e309&pageSize=0&kind=nope&status=nope&q=${LONG}&search=${LONG}`,
  'labId=a&labId=b&period=2026-01&period=2026-02&level=x&level=y',
  'labId[]=x&period[a]=1&actorId=x&entityId=x&kind[]=x',
];
/** Bodies of the wrong shape or type. */
const BAD_BODIES: unknown[] = [
  {},
  [],
  [1, 2, 3],
  {
    labId: 123,
    id: ['x'],
    period: { year: 2026 },
    name: LONG,
    code: LONG,
    email: 5,
    role: true,
    reason: LONG,
    procedureId: 'not-a-uuid',
    analyteId: 'not-a-uuid',
    controlLotId: null,
    level: 'high',
    ids: 'x',
    groupIds: ['not-a-uuid', 7],
    mapping: 'not-an-object',
    token: 9,
    password: ['x'],
    text: { nested: true },
  },
];

function fill(route: RouteEntry, labId: string, malformed?: { param: string; value: string }): string {
  const plausible: Record<string, string> = {
    labId,
    list: 'analytes',
    kind: 'qc-summary',
    period: '2026-01',
    level: '1',
    token: 'some-token',
  };
  return route.path.replace(/:(\w+)/g, (_m, name: string) =>
    malformed?.param === name ? malformed.value : (plausible[name] ?? randomUUID()),
  );
}

function send(method: string, path: string, auth: string, body?: unknown) {
  const req = request(t.app)[method.toLowerCase() as 'get'](path).set('Authorization', auth);
  return body === undefined ? req : req.send(body as object);
}

describe('route list', () => {
  it('when the API serves a route, then the OpenAPI document describes it, and the other way round', async () => {
    const served = expressRoutes(t.app).map(key).sort();
    const documented = (await documentedRoutes()).map(key).sort();
    expect(documented.filter((r) => !served.includes(r))).toEqual([]);
    expect(served.filter((r) => !documented.includes(r))).toEqual([]);
    expect((await request(t.app).get('/api/openapi.json')).body.openapi).toBe('3.1.0');
  });

  it('when the reference page is opened, then it and its script and style come from the API itself', async () => {
    const page = await request(t.app).get('/api/reference');
    expect(page.status).toBe(200);
    expect(page.text).not.toMatch(/https?:\/\//);
    expect(page.text).toMatch(/src="reference\.js"/);
    expect((await request(t.app).get('/api/reference.js')).status).toBe(200);
    expect((await request(t.app).get('/api/reference.css')).status).toBe(200);
  });
});

describe('lab isolation on every route', () => {
  it("when a supervisor calls any lab route with another lab's id, then nothing is answered with 2xx", async () => {
    const other = await t.makeLab();
    const own = await t.makeLab();
    const supervisor = await t.makeUser('supervisor', own.id);
    const routes = (await documentedRoutes()).filter(
      (r) => r.path.includes(':labId') && r.path !== '/api/labs/:labId',
    );
    expect(routes.length).toBeGreaterThan(25);
    const leaks: string[] = [];
    for (const route of routes) {
      const path = fill(route, other.id);
      const res = await send(route.method, path, supervisor.auth, route.method === 'GET' ? undefined : {});
      if (res.status < 300) leaks.push(`${route.method} ${path} → ${res.status}`);
    }
    const own200 = await request(t.app).get(`/api/labs/${own.id}`).set('Authorization', supervisor.auth);
    const other404 = await request(t.app).get(`/api/labs/${other.id}`).set('Authorization', supervisor.auth);
    expect([own200.status, other404.status]).toEqual([200, 404]);
    console.log(`lab isolation probes: ${routes.length + 2} requests, ${leaks.length} leaks`);
    expect(leaks).toEqual([]);
  });
});

describe('malformed input on every route', () => {
  it('when path parameters, query strings or bodies are malformed, then every answer is 4xx with an error body, never 5xx', async () => {
    // Signing out ends the caller's session, so it is probed last.
    const routes = (await documentedRoutes()).sort(
      (a, b) => Number(a.path === '/api/auth/logout') - Number(b.path === '/api/auth/logout'),
    );
    expect(routes.length).toBeGreaterThan(50);
    const failures: string[] = [];
    let probes = 0;
    for (const caller of callers) {
      for (const route of routes) {
        const cases: { path: string; body?: unknown }[] = [];
        for (const param of pathParams(route.path)) {
          for (const value of BAD_SEGMENTS) cases.push({ path: fill(route, caller.labId, { param, value }) });
        }
        for (const query of BAD_QUERIES) cases.push({ path: `${fill(route, caller.labId)}?${query}` });
        if (route.method !== 'GET') {
          for (const body of BAD_BODIES) cases.push({ path: fill(route, caller.labId), body });
        }
        for (const c of cases) {
          probes += 1;
          const res = await send(route.method, c.path, caller.auth, c.body);
          const label = `${caller.name} ${route.method} ${c.path.slice(0, 120)} ${JSON.stringify(c.body ?? null).slice(0, 80)}`;
          if (res.status >= 500) failures.push(`${label} → ${res.status} ${res.text.slice(0, 200)}`);
          else if (res.status >= 400 && !res.body?.error?.message)
            failures.push(`${label} → ${res.status} without an error body`);
        }
      }
    }
    console.log(
      `bad-input probes: ${probes} requests over ${routes.length} routes, ${failures.length} failures`,
    );
    expect(failures).toEqual([]);
  }, 300_000);

  it('when a coordinator previews an upload with labId=not-a-uuid, then 400 naming the field', async () => {
    const coordinator = await t.makeUser('coordinator', null);
    const res = await request(t.app)
      .post('/api/uploads/preview')
      .set('Authorization', coordinator.auth)
      .field('kind', 'qc-summary')
      .field('labId', 'not-a-uuid')
      .attach('file', Buffer.from('a,b\n1,2\n'), 'month.csv');
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/labId/);
  });
});
