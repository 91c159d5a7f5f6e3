import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createQcCatalogue, type QcCatalogue } from '@plumbline/db/testing';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import { spawnWorkerFor, type WorkerProcess } from '../../testing/worker-process.ts';

// Whatever a file holds, what is stored and answered about its errors stays small: a capped number of
// row errors (a worker setting) with the full count, every message cut to 200 characters, and upload
// lists that never carry error bodies.

const MAX_STORED = 10;
let t: TestApp;
let worker: WorkerProcess;
let catalogue: QcCatalogue;

beforeAll(async () => {
  t = await createTestApp('uploadsbounded');
  catalogue = await createQcCatalogue(t.db);
  worker = await spawnWorkerFor(t, { INGEST_MAX_ROW_ERRORS: String(MAX_STORED) });
});
afterAll(async () => {
  await worker?.stop();
  await t?.close();
});

const HEADER = 'period,procedure,control_lot,level,n,mean,sd,unit';

async function uploadAndWait(auth: string, content: string) {
  const res = await request(t.app)
    .post('/api/uploads')
    .set('Authorization', auth)
    .field('kind', 'qc-summary')
    .attach('file', Buffer.from(content, 'utf8'), 'qc.csv');
  expect(res.status).toBe(202);
  for (let i = 0; i < 600; i++) {
    const detail = await request(t.app).get(`/api/uploads/${res.body.id}`).set('Authorization', auth);
    if (['needs-review', 'failed', 'stored'].includes(detail.body.status)) return detail;
    await new Promise((resolve) => setTimeout(resolve, 50));
  }
  throw new Error(`upload never finished:\n${worker.output()}`);
}

describe('bounded row errors', () => {
  it('when a cell holds a 2 MB string, then its error message is cut to 200 characters and the answers stay small', async () => {
    const { lab } = await catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    const analyst = await t.makeUser('analyst', lab.id);
    const huge = 'x'.repeat(2 * 1024 * 1024);
    const lot = catalogue.lot.lotNumber;
    const file = [
      HEADER,
      `2026-02,GLU1,${lot},1,20,${huge},0.1,mmol/L`,
      `2026-02,GLU1,${lot},2,20,5.5,0.1,mmol/L`,
    ].join('\n');
    const detail = await uploadAndWait(analyst.auth, file);
    expect(detail.body.status).toBe('needs-review');
    expect(detail.body.errors.length).toBeGreaterThan(0);
    for (const error of detail.body.errors) expect(error.message.length).toBeLessThanOrEqual(200);
    expect(detail.text.length).toBeLessThan(20_000);

    const list = await request(t.app).get('/api/uploads').set('Authorization', analyst.auth);
    expect(list.status).toBe(200);
    expect(list.body[0]).not.toHaveProperty('errors');
    expect(list.text.length).toBeLessThan(5_000);
  });

  it('when a file has more bad rows than the setting keeps, then the first are stored and all are counted', async () => {
    const { lab } = await catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    const analyst = await t.makeUser('analyst', lab.id);
    const bad = Array.from(
      { length: 25 },
      (_, i) => `2026-02,GLU1,${catalogue.lot.lotNumber},${i + 1},20,not-a-number,0.1,mmol/L`,
    );
    const detail = await uploadAndWait(analyst.auth, [HEADER, ...bad].join('\n'));
    expect(detail.body.rowsRejected).toBe(25);
    expect(detail.body.errors).toHaveLength(MAX_STORED);
    expect(detail.body.errorsTotal).toBeGreaterThanOrEqual(25);
    expect(detail.body.errorsTruncated).toBe(true);
    expect(detail.body.errors[0].row).toBe(2);
  });
});
