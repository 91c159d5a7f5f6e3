import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { readdirSync } from 'node:fs';
import { eq } from 'drizzle-orm';
import { auditEvents, columnMappings, qcSummaries, uploads } from '@plumbline/db';
import { createQcCatalogue, type QcCatalogue } from '@plumbline/db/testing';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import { spawnWorkerFor, type WorkerProcess } from '../../testing/worker-process.ts';

let t: TestApp;
let worker: WorkerProcess;
let catalogue: QcCatalogue;

beforeAll(async () => {
  t = await createTestApp('uploads', { env: { MAX_UPLOAD_BYTES: '20000' } });
  catalogue = await createQcCatalogue(t.db);
  worker = await spawnWorkerFor(t);
});
afterAll(async () => {
  await worker?.stop();
  await t?.close();
});

const HEADER = 'period,procedure,control_lot,level,n,mean,sd,unit';
const summaryFile = (rows: string[]) => [HEADER, ...rows].join('\n') + '\n';

async function labWithAnalyst(code = 'GLU1') {
  const { lab, procedures } = await catalogue.makeLabWithProcedures([{ code }]);
  const analyst = await t.makeUser('analyst', lab.id);
  return { lab, procedure: procedures[0], analyst };
}

function upload(
  auth: string,
  content: string,
  fields: Record<string, string> = { kind: 'qc-summary' },
  filename = 'qc.csv',
) {
  let req = request(t.app).post('/api/uploads').set('Authorization', auth);
  for (const [name, value] of Object.entries(fields)) req = req.field(name, value);
  return req.attach('file', Buffer.from(content, 'utf8'), filename);
}

async function waitFor(auth: string, id: string, statuses: string[]) {
  for (let i = 0; i < 300; i++) {
    const res = await request(t.app).get(`/api/uploads/${id}`).set('Authorization', auth);
    if (statuses.includes(res.body.status)) return res.body;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`upload ${id} never reached ${statuses.join('/')}:\n${worker.output()}`);
}

describe('uploading a QC file', () => {
  it('when an analyst uploads a valid summary file, then it is accepted (202), stored, and listed', async () => {
    const { lab, analyst } = await labWithAnalyst();
    const res = await upload(
      analyst.auth,
      summaryFile([`2026-02,GLU1,${catalogue.lot.lotNumber},1,20,5.5,0.1,mmol/L`]),
    );
    expect(res.status).toBe(202);
    expect(res.body).toEqual({ id: expect.any(String), status: 'queued' });
    const done = await waitFor(analyst.auth, res.body.id, ['stored', 'needs-review', 'failed']);
    expect(done).toMatchObject({
      status: 'stored',
      progress: 1,
      rowsTotal: 1,
      rowsAccepted: 1,
      rowsRejected: 0,
      errors: [],
      via: 'user',
    });
    expect(done.sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(done.uploadedBy).toEqual({ id: analyst.id, name: analyst.name });

    const list = await request(t.app).get('/api/uploads').set('Authorization', analyst.auth);
    expect(list.status).toBe(200);
    expect(list.body.map((u: { id: string }) => u.id)).toEqual([res.body.id]);
    expect(list.body[0]).not.toHaveProperty('errors');
    const [row] = await t.db.select().from(qcSummaries).where(eq(qcSummaries.labId, lab.id));
    expect(row).toMatchObject({ n: 20, mean: 5.5, sd: 0.1 });
  });

  it('when the fields come after the file in the form, then the upload still works', async () => {
    const { analyst } = await labWithAnalyst();
    const res = await request(t.app)
      .post('/api/uploads')
      .set('Authorization', analyst.auth)
      .attach(
        'file',
        Buffer.from(summaryFile([`2026-02,GLU1,${catalogue.lot.lotNumber},2,20,16,0.3,mmol/L`])),
        'late-fields.csv',
      )
      .field('kind', 'qc-summary');
    expect(res.status).toBe(202);
    expect((await waitFor(analyst.auth, res.body.id, ['stored', 'failed'])).status).toBe('stored');
  });

  it('when a file has bad rows, then it waits for review with row and column errors and nothing is stored until confirmed', async () => {
    const { lab, analyst } = await labWithAnalyst();
    const lot = catalogue.lot.lotNumber;
    const res = await upload(
      analyst.auth,
      summaryFile([
        `2026-03,GLU1,${lot},1,20,5.5,0.1,mmol/L`,
        `2026-03,GLU1,${lot},2,20,16.1,0,mmol/L`,
        `2026-03,GLU1,${lot},3,20,16.1,0.2,mmol/L`,
      ]),
    );
    const review = await waitFor(analyst.auth, res.body.id, ['needs-review', 'stored', 'failed']);
    expect(review).toMatchObject({
      status: 'needs-review',
      rowsTotal: 3,
      rowsAccepted: 1,
      rowsRejected: 2,
      errorsTruncated: false,
    });
    expect(review.errors).toEqual([
      { row: 3, column: 'sd', code: 'sd_not_positive', message: expect.any(String) },
      {
        row: 4,
        column: 'level',
        code: 'unknown_level',
        message: expect.stringMatching(/levels 1, 2, not 3/),
      },
    ]);
    expect(await t.db.select().from(qcSummaries).where(eq(qcSummaries.labId, lab.id))).toEqual([]);

    const confirm = await request(t.app)
      .post(`/api/uploads/${res.body.id}/confirm`)
      .set('Authorization', analyst.auth);
    expect(confirm.status).toBe(200);
    // The worker may already have picked the confirmed upload up by the time the answer is read.
    expect(['queued', 'processing', 'stored']).toContain(confirm.body.status);
    const stored = await waitFor(analyst.auth, res.body.id, ['stored', 'failed']);
    expect(stored).toMatchObject({ status: 'stored', rowsAccepted: 1, rowsRejected: 2 });
    expect(stored.confirmedAt).not.toBeNull();
    const rows = await t.db.select().from(qcSummaries).where(eq(qcSummaries.labId, lab.id));
    expect(rows.map((r) => r.level)).toEqual([1]);

    const again = await request(t.app)
      .post(`/api/uploads/${res.body.id}/confirm`)
      .set('Authorization', analyst.auth);
    expect(again.status).toBe(409);
    const cancelStored = await request(t.app)
      .post(`/api/uploads/${res.body.id}/cancel`)
      .set('Authorization', analyst.auth);
    expect(cancelStored.status).toBe(409);
    expect(cancelStored.body.error.message).toMatch(/stored/);
  });

  it('when a file waiting for review is cancelled, then nothing of it is stored', async () => {
    const { lab, analyst } = await labWithAnalyst();
    const res = await upload(
      analyst.auth,
      summaryFile([
        `2026-03,GLU1,${catalogue.lot.lotNumber},1,20,5.5,0.1,mmol/L`,
        `2026-03,NOPE,x,1,1,a,b,c`,
      ]),
    );
    await waitFor(analyst.auth, res.body.id, ['needs-review']);
    const cancel = await request(t.app)
      .post(`/api/uploads/${res.body.id}/cancel`)
      .set('Authorization', analyst.auth);
    expect(cancel.status).toBe(200);
    expect(cancel.body.status).toBe('cancelled');
    expect(await t.db.select().from(qcSummaries).where(eq(qcSummaries.labId, lab.id))).toEqual([]);
    const confirm = await request(t.app)
      .post(`/api/uploads/${res.body.id}/confirm`)
      .set('Authorization', analyst.auth);
    expect(confirm.status).toBe(409);
    const audit = await t.db.select().from(auditEvents).where(eq(auditEvents.entityId, res.body.id));
    expect(audit.map((a) => a.kind)).toEqual(expect.arrayContaining(['upload.received', 'upload.cancelled']));
  });

  it('when the same file is uploaded twice, then the second says it is a duplicate of the first; a changed file replaces the data', async () => {
    const { lab, analyst } = await labWithAnalyst();
    const content = summaryFile([`2026-01,GLU1,${catalogue.lot.lotNumber},1,20,5.5,0.1,mmol/L`]);
    const first = await upload(analyst.auth, content);
    await waitFor(analyst.auth, first.body.id, ['stored']);
    const second = await upload(analyst.auth, content, { kind: 'qc-summary' }, 'renamed.csv');
    expect(second.status).toBe(202);
    expect(second.body.duplicateOf).toBe(first.body.id);
    expect(second.body.message).toMatch(/identical to "qc.csv"/);
    await waitFor(analyst.auth, second.body.id, ['stored']);
    expect((await t.db.select().from(qcSummaries).where(eq(qcSummaries.labId, lab.id))).length).toBe(1);

    const changed = await upload(
      analyst.auth,
      summaryFile([`2026-01,GLU1,${catalogue.lot.lotNumber},1,22,5.6,0.12,mmol/L`]),
    );
    expect(changed.body.duplicateOf).toBeUndefined();
    await waitFor(analyst.auth, changed.body.id, ['stored']);
    const rows = await t.db.select().from(qcSummaries).where(eq(qcSummaries.labId, lab.id));
    expect(rows.map((r) => [r.n, r.mean, r.uploadId])).toEqual([[22, 5.6, changed.body.id]]);
  });

  it('when a semicolon file with decimal commas is uploaded, then the numbers are read correctly', async () => {
    const { lab, analyst } = await labWithAnalyst();
    const content = `period;procedure;control_lot;level;n;mean;sd;unit\r\n2026-02;GLU1;${catalogue.lot.lotNumber};1;20;5,53;0,115;mmol/L\r\n`;
    const res = await upload(analyst.auth, content);
    await waitFor(analyst.auth, res.body.id, ['stored']);
    const [row] = await t.db.select().from(qcSummaries).where(eq(qcSummaries.labId, lab.id));
    expect([row.mean, row.sd]).toEqual([5.53, 0.115]);
  });

  it('when the file is larger than the limit, then 413 and nothing is kept', async () => {
    const { lab, analyst } = await labWithAnalyst();
    const big = summaryFile(
      Array.from({ length: 600 }, () => `2026-02,GLU1,${catalogue.lot.lotNumber},1,20,5.5,0.1,mmol/L`),
    );
    expect(big.length).toBeGreaterThan(20000);
    const before = readdirSync(t.storageDir, { recursive: true }).length;
    const res = await upload(analyst.auth, big);
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('payload_too_large');
    expect(await t.db.select().from(uploads).where(eq(uploads.labId, lab.id))).toEqual([]);
    const files = readdirSync(t.storageDir, { recursive: true }).filter((f) => String(f).includes('partial'));
    expect(files).toEqual([]);
    expect(readdirSync(t.storageDir, { recursive: true }).length).toBe(before);
  });

  it('when the request is not multipart, has no file or an unknown kind, then a specific error', async () => {
    const { analyst } = await labWithAnalyst();
    const json = await request(t.app)
      .post('/api/uploads')
      .set('Authorization', analyst.auth)
      .send({ kind: 'qc-summary' });
    expect(json.status).toBe(415);
    const noFile = await request(t.app)
      .post('/api/uploads')
      .set('Authorization', analyst.auth)
      .field('kind', 'qc-summary');
    expect(noFile.status).toBe(400);
    expect(noFile.body.error.message).toMatch(/No file/);
    const badKind = await upload(analyst.auth, 'a,b\n1,2\n', { kind: 'patients' });
    expect(badKind.status).toBe(400);
    expect(badKind.body.error.details[0].path).toBe('kind');
    const empty = await upload(analyst.auth, '');
    expect(empty.status).toBe(400);
    expect(empty.body.error.message).toMatch(/empty/);
    const badMapping = await upload(analyst.auth, 'a\n1\n', {
      kind: 'qc-summary',
      mapping: '{"average": "a"}',
    });
    expect(badMapping.status).toBe(400);
    expect(badMapping.body.error.message).toMatch(/'average' is not a column/);
  });

  it('when a coordinator uploads, then the lab must be named', async () => {
    const { lab } = await labWithAnalyst();
    const coordinator = await t.makeUser('coordinator', null);
    const content = summaryFile([`2026-02,GLU1,${catalogue.lot.lotNumber},1,20,5.5,0.1,mmol/L`]);
    const missing = await upload(coordinator.auth, content);
    expect(missing.status).toBe(400);
    expect(missing.body.error.message).toMatch(/labId/);
    const ok = await upload(coordinator.auth, content, { kind: 'qc-summary', labId: lab.id });
    expect(ok.status).toBe(202);
    expect((await waitFor(coordinator.auth, ok.body.id, ['stored'])).labId).toBe(lab.id);
  });
});

describe('another lab', () => {
  it('when an analyst of another lab asks for an upload, confirms or cancels it, then 404', async () => {
    const { analyst } = await labWithAnalyst();
    const other = await labWithAnalyst();
    const res = await upload(
      analyst.auth,
      summaryFile([`2026-02,GLU1,${catalogue.lot.lotNumber},1,20,5.5,0.1,mmol/L`]),
    );
    for (const path of [`/api/uploads/${res.body.id}`]) {
      const get = await request(t.app).get(path).set('Authorization', other.analyst.auth);
      expect(get.status).toBe(404);
    }
    expect(
      (
        await request(t.app)
          .post(`/api/uploads/${res.body.id}/cancel`)
          .set('Authorization', other.analyst.auth)
      ).status,
    ).toBe(404);
    expect(
      (
        await request(t.app)
          .post(`/api/uploads/${res.body.id}/confirm`)
          .set('Authorization', other.analyst.auth)
      ).status,
    ).toBe(404);
    const list = await request(t.app)
      .get(`/api/uploads?labId=${analyst.labId}`)
      .set('Authorization', other.analyst.auth);
    expect(list.status).toBe(404);
    const onBehalf = await upload(other.analyst.auth, 'x\n1\n', {
      kind: 'qc-summary',
      labId: analyst.labId!,
    });
    expect(onBehalf.status).toBe(404);
  });
});

describe('lab API tokens', () => {
  it('when a supervisor creates a token, then it is shown once, can upload and read its upload, and nothing else', async () => {
    const { lab } = await labWithAnalyst();
    const supervisor = await t.makeUser('supervisor', lab.id);
    const created = await request(t.app)
      .post(`/api/labs/${lab.id}/api-tokens`)
      .set('Authorization', supervisor.auth)
      .send({ name: 'Middleware nightly push' });
    expect(created.status).toBe(201);
    expect(created.body.token).toMatch(/^plb_/);
    const token = `Bearer ${created.body.token}`;

    const listed = await request(t.app)
      .get(`/api/labs/${lab.id}/api-tokens`)
      .set('Authorization', supervisor.auth);
    expect(listed.body).toEqual([
      expect.objectContaining({
        id: created.body.id,
        name: 'Middleware nightly push',
        prefix: created.body.token.slice(0, 10),
      }),
    ]);
    expect(JSON.stringify(listed.body)).not.toContain(created.body.token);

    const pushed = await upload(
      token,
      summaryFile([`2026-02,GLU1,${catalogue.lot.lotNumber},1,20,5.5,0.1,mmol/L`]),
    );
    expect(pushed.status).toBe(202);
    const status = await waitFor(token, pushed.body.id, ['stored']);
    expect(status).toMatchObject({ via: 'api-token', uploadedBy: null, labId: lab.id });

    expect((await request(t.app).get('/api/uploads').set('Authorization', token)).status).toBe(403);
    expect(
      (await request(t.app).get(`/api/labs/${lab.id}/peer-report?period=2026-02`).set('Authorization', token))
        .status,
    ).toBe(403);
    expect(
      (await request(t.app).post(`/api/uploads/${pushed.body.id}/cancel`).set('Authorization', token)).status,
    ).toBe(403);

    const revoked = await request(t.app)
      .delete(`/api/labs/${lab.id}/api-tokens/${created.body.id}`)
      .set('Authorization', supervisor.auth);
    expect(revoked.status).toBe(204);
    const refused = await upload(
      token,
      summaryFile([`2026-02,GLU1,${catalogue.lot.lotNumber},1,20,5.5,0.1,mmol/L`]),
    );
    expect(refused.status).toBe(401);
    expect(refused.body.error.message).toMatch(/revoked/);
    expect(
      (await request(t.app).get(`/api/uploads/${pushed.body.id}`).set('Authorization', token)).status,
    ).toBe(401);
    const audit = await t.db.select().from(auditEvents).where(eq(auditEvents.entityId, created.body.id));
    expect(audit.map((a) => a.kind).sort()).toEqual(['lab-token.created', 'lab-token.revoked']);
  });

  it('when an analyst or another lab’s supervisor manages tokens, then 403 or 404', async () => {
    const { lab, analyst } = await labWithAnalyst();
    const otherSupervisor = await t.makeUser('supervisor', (await labWithAnalyst()).lab.id);
    expect(
      (
        await request(t.app)
          .post(`/api/labs/${lab.id}/api-tokens`)
          .set('Authorization', analyst.auth)
          .send({ name: 'x' })
      ).status,
    ).toBe(403);
    expect(
      (await request(t.app).get(`/api/labs/${lab.id}/api-tokens`).set('Authorization', otherSupervisor.auth))
        .status,
    ).toBe(404);
  });

  it('when a token of another lab asks for an upload, then 404', async () => {
    const { analyst } = await labWithAnalyst();
    const res = await upload(
      analyst.auth,
      summaryFile([`2026-02,GLU1,${catalogue.lot.lotNumber},1,20,5.5,0.1,mmol/L`]),
    );
    const { lab: otherLab } = await labWithAnalyst();
    const supervisor = await t.makeUser('supervisor', otherLab.id);
    const created = await request(t.app)
      .post(`/api/labs/${otherLab.id}/api-tokens`)
      .set('Authorization', supervisor.auth)
      .send({ name: 'LIS' });
    const get = await request(t.app)
      .get(`/api/uploads/${res.body.id}`)
      .set('Authorization', `Bearer ${created.body.token}`);
    expect(get.status).toBe(404);
  });
});

describe('column mappings', () => {
  const ownHeaders = 'Monat;Kennung;Charge;Stufe;Anzahl;Mittel;Streuung;Einheit';
  const mapping = {
    period: 'Monat',
    procedure: 'Kennung',
    control_lot: 'Charge',
    level: 'Stufe',
    n: 'Anzahl',
    mean: 'Mittel',
    sd: 'Streuung',
    unit: 'Einheit',
  };

  it('when a file is uploaded with a mapping, then the mapping is saved and offered for the next file, which uses it', async () => {
    const { lab, analyst } = await labWithAnalyst();
    const file = (level: number) =>
      `${ownHeaders}\n2026-02;GLU1;${catalogue.lot.lotNumber};${level};20;5,5;0,1;mmol/L\n`;

    const before = await request(t.app)
      .post('/api/uploads/preview')
      .set('Authorization', analyst.auth)
      .field('kind', 'qc-summary')
      .attach('file', Buffer.from(file(1)), 'own.csv');
    expect(before.status).toBe(200);
    expect(before.body).toMatchObject({
      delimiter: ';',
      decimalComma: true,
      mappingSource: 'detected',
      headers: ownHeaders.split(';'),
    });
    expect(before.body.missingColumns).toContain('mean');

    const first = await upload(analyst.auth, file(1), {
      kind: 'qc-summary',
      mapping: JSON.stringify(mapping),
    });
    expect(first.status).toBe(202);
    await waitFor(analyst.auth, first.body.id, ['stored']);
    const saved = await request(t.app)
      .get(`/api/labs/${lab.id}/column-mappings/qc-summary`)
      .set('Authorization', analyst.auth);
    expect(saved.body).toMatchObject({ kind: 'qc-summary', mapping });

    const after = await request(t.app)
      .post('/api/uploads/preview')
      .set('Authorization', analyst.auth)
      .field('kind', 'qc-summary')
      .attach('file', Buffer.from(file(2)), 'own.csv');
    expect(after.body).toMatchObject({
      mappingSource: 'saved',
      suggestedMapping: mapping,
      missingColumns: [],
    });
    expect(after.body.rows).toEqual([
      ['2026-02', 'GLU1', catalogue.lot.lotNumber, '2', '20', '5,5', '0,1', 'mmol/L'],
    ]);

    const second = await upload(analyst.auth, file(2));
    expect((await waitFor(analyst.auth, second.body.id, ['stored', 'failed'])).status).toBe('stored');
    expect(
      (await t.db.select().from(qcSummaries).where(eq(qcSummaries.labId, lab.id))).map((r) => r.level).sort(),
    ).toEqual([1, 2]);
  });

  it('when a mapping is saved with PUT, then it is returned; another lab gets 404; a bad mapping gets 400', async () => {
    const { lab, analyst } = await labWithAnalyst();
    const put = await request(t.app)
      .put(`/api/labs/${lab.id}/column-mappings/qc-values`)
      .set('Authorization', analyst.auth)
      .send({ mapping: { measured_at: 'When', value: 'Result' } });
    expect(put.status).toBe(200);
    const [row] = await t.db.select().from(columnMappings).where(eq(columnMappings.labId, lab.id));
    expect(row.mapping).toEqual({ measured_at: 'When', value: 'Result' });
    const other = await labWithAnalyst();
    expect(
      (
        await request(t.app)
          .get(`/api/labs/${lab.id}/column-mappings/qc-values`)
          .set('Authorization', other.analyst.auth)
      ).status,
    ).toBe(404);
    const twice = await request(t.app)
      .put(`/api/labs/${lab.id}/column-mappings/qc-values`)
      .set('Authorization', analyst.auth)
      .send({ mapping: { measured_at: 'When', value: 'When' } });
    expect(twice.status).toBe(400);
    expect(twice.body.error.message).toMatch(/mapped to both/);
  });
});

describe('signed-off months', () => {
  it("when the lab's supervisor has signed a month off, then rows for that month are rejected and nothing changes", async () => {
    const { periodSignoffs } = await import('@plumbline/db');
    const { lab, analyst } = await labWithAnalyst();
    const supervisor = await t.makeUser('supervisor', lab.id);
    const first = await upload(
      analyst.auth,
      summaryFile([`2026-02,GLU1,${catalogue.lot.lotNumber},1,20,5.5,0.1,mmol/L`]),
    );
    expect((await waitFor(analyst.auth, first.body.id, ['stored', 'needs-review', 'failed'])).status).toBe(
      'stored',
    );
    await t.db
      .insert(periodSignoffs)
      .values({ labId: lab.id, period: '2026-02', signedBy: supervisor.id, statement: 'Reviewed.' });

    const again = await upload(
      analyst.auth,
      summaryFile([`2026-02,GLU1,${catalogue.lot.lotNumber},1,20,9.9,0.1,mmol/L`]),
    );
    const done = await waitFor(analyst.auth, again.body.id, ['stored', 'needs-review', 'failed']);
    expect(done.status).toBe('needs-review');
    expect(done.errors).toEqual([
      expect.objectContaining({ row: 2, column: 'period', code: 'period_signed_off' }),
    ]);
    const rows = await t.db.select().from(qcSummaries).where(eq(qcSummaries.labId, lab.id));
    expect(rows.map((r) => r.mean)).toEqual([5.5]);
  });
});
