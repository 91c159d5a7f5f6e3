import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { randomBytes } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import { analytes, auditEvents } from '@plumbline/db';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';

let t: TestApp;
let coordinator: Awaited<ReturnType<TestApp['makeUser']>>;

beforeAll(async () => {
  t = await createTestApp('analytelimits');
  coordinator = await t.makeUser('coordinator', null);
});
afterAll(async () => t?.close());

const unique = (prefix: string) => `${prefix}-${randomBytes(3).toString('hex').toUpperCase()}`;
const post = (path: string, body: object) =>
  request(t.app).post(`/api${path}`).set('Authorization', coordinator.auth).send(body);
const patch = (path: string, body: object) =>
  request(t.app).patch(`/api${path}`).set('Authorization', coordinator.auth).send(body);
const paths = (res: request.Response) => res.body.error.details.map((d: { path: string }) => d.path).sort();

// Limits and TEa parts below are test inputs (common practice), not published figures.
const glucose = (overrides: Record<string, unknown> = {}) => ({
  code: unique('GLU'),
  name: 'Glucose',
  unit: 'mmol/L',
  ...overrides,
});

describe('plausibility limits and the absolute part of the total allowable error', () => {
  it('when the coordinator creates an analyte with limits, a source and a TEa absolute part, then they come back and are stored', async () => {
    const res = await post(
      '/catalogue/analytes',
      glucose({
        plausibleLow: 0.5,
        plausibleHigh: 50,
        plausibilitySource: 'common practice',
        teaPct: 8,
        teaAbsolute: 0.33,
        teaSource: 'test rule',
        teaDate: '2024-07-01',
      }),
    );
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      plausibleLow: 0.5,
      plausibleHigh: 50,
      plausibilitySource: 'common practice',
      allowsNegative: false,
      teaPct: 8,
      teaAbsolute: 0.33,
    });
    const [row] = await t.db.select().from(analytes).where(eq(analytes.id, res.body.id));
    expect(row).toMatchObject({ plausibleLow: 0.5, plausibleHigh: 50, teaAbsolute: 0.33 });
  });

  it('when limits have no source, or the high limit is not above the low one, then 400 naming the fields', async () => {
    const noSource = await post('/catalogue/analytes', glucose({ plausibleLow: 0.5, plausibleHigh: 50 }));
    expect(noSource.status).toBe(400);
    expect(paths(noSource)).toEqual(['plausibilitySource']);
    const inverted = await post(
      '/catalogue/analytes',
      glucose({ plausibleLow: 50, plausibleHigh: 50, plausibilitySource: 'common practice' }),
    );
    expect(inverted.status).toBe(400);
    expect(paths(inverted)).toEqual(['plausibleHigh']);
  });

  it('when only a TEa absolute part is given, then its source and date are required as for the percentage', async () => {
    const res = await post('/catalogue/analytes', glucose({ teaAbsolute: 0.33 }));
    expect(res.status).toBe(400);
    expect(paths(res)).toEqual(['teaDate', 'teaSource']);
  });

  it('when an edit moves the low limit above the stored high one, then 400; a valid edit is audited with before and after', async () => {
    const created = (
      await post(
        '/catalogue/analytes',
        glucose({ plausibleLow: 0.5, plausibleHigh: 50, plausibilitySource: 'common practice' }),
      )
    ).body;
    const bad = await patch(`/catalogue/analytes/${created.id}`, { plausibleLow: 60 });
    expect(bad.status).toBe(400);
    expect(paths(bad)).toEqual(['plausibleHigh']);

    const good = await patch(`/catalogue/analytes/${created.id}`, {
      plausibleHigh: 45,
      allowsNegative: true,
      reason: 'narrower limit',
    });
    expect(good.status).toBe(200);
    const [event] = await t.db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.kind, 'catalogue.analyte.update'), eq(auditEvents.entityId, created.id)));
    expect(event.details).toEqual({
      code: created.code,
      changes: { plausibleHigh: { from: 50, to: 45 }, allowsNegative: { from: false, to: true } },
      reason: 'narrower limit',
    });
  });

  it('when analytes are imported from CSV with limits and allows_negative, then they are stored', async () => {
    const code = unique('BE');
    const csv =
      'code,name,unit,plausible_low,plausible_high,plausibility_source,allows_negative\n' +
      `${code},Base excess,mmol/L,-30,30,common practice,yes\n`;
    const res = await request(t.app)
      .post('/api/catalogue/analytes/import?dryRun=false')
      .set('Authorization', coordinator.auth)
      .set('Content-Type', 'text/csv')
      .send(csv);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ created: 1, rejected: 0, applied: true });
    const [row] = await t.db.select().from(analytes).where(eq(analytes.code, code));
    expect(row).toMatchObject({ plausibleLow: -30, plausibleHigh: 30, allowsNegative: true });
  });
});
