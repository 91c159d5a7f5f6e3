import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { extractText, getDocumentProxy } from 'unpdf';
import { parse } from 'csv-parse/sync';
import { classifyCvr, classifySdi, standing } from '@plumbline/stats';
import { uploads } from '@plumbline/db';
import type { PeerReport } from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import {
  expectedPeer,
  seedWorkspaceNetwork,
  type Analyte,
  type WorkspaceNetwork,
} from '../report-drilldown/testing/workspace-network.ts';

let t: TestApp;
let net: WorkspaceNetwork;

beforeAll(async () => {
  t = await createTestApp('reportexport');
  net = await seedWorkspaceNetwork(t);
});
afterAll(async () => t?.close());

/** Binary response bodies as a Buffer (supertest only buffers text by default). */
function binary(res: unknown, callback: (err: Error | null, body: Buffer) => void) {
  const stream = res as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (chunk: Buffer) => chunks.push(chunk));
  stream.on('end', () => callback(null, Buffer.concat(chunks)));
}

async function pdfText(body: Buffer): Promise<string> {
  const pdf = await getDocumentProxy(new Uint8Array(body));
  const { text } = await extractText(pdf, { mergePages: true });
  // Spacing and line breaks depend on layout; compare words. The PDF prints a true minus sign (U+2212).
  return text.replace(/\s+/g, ' ').replace(/\u2212/g, '-');
}

/** An SDI as the PDF table prints it: two decimals (common practice for SDI), no "-0.00". */
const printed = (value: number) => {
  const text = value.toFixed(2);
  return text === '-0.00' ? '0.00' : text;
};

describe('the monthly PDF report', () => {
  const downloadPdf = (auth: string, query = 'period=2026-03&units=si') =>
    request(t.app)
      .get(`/api/labs/${net.labs.A.id}/peer-report.pdf?${query}`)
      .set('Authorization', auth)
      .buffer(true)
      .parse(binary);

  it('when an unsigned period with flagged rows is downloaded, then it says "not signed" and charts the flagged rows', async () => {
    // Lab A reads high in March: its glucose level-1 row is flagged (|SDI| > 2 or left out as an outlier; docs/methods.md §2–3).
    const peer = expectedPeer(net, 'glucose', '2026-03', 1);
    const sdi = standing(net.table.glucose.A['2026-03'][1], peer).sdi;
    expect(Math.abs(sdi) > 2 || peer.excluded.some((e) => e.id === net.labs.A.glucose)).toBe(true);

    const res = await downloadPdf(net.labs.A.supervisor.auth);
    expect(res.status).toBe(200);
    const text = await pdfText(res.body as Buffer);
    expect(text).toContain('Not signed off');
    expect(text).toContain('Charts of the flagged rows');
    expect(text).toContain('GLU1 (Glucose) · lot');
    expect(text).toMatch(/SDI over the last 3 period/);
    // Lab A has daily values in March, so the flagged glucose rows carry a control chart with their violations.
    expect(text).toContain('Control chart, 2026-03');
    expect(text).toContain('1-3s');
    // March's SDI jump of lab A's glucose (about 3.4 SDI) is listed as a detected shift (methods.md §8).
    expect(text).toContain('Detected shifts');
    expect(text).toMatch(/GLU1 · lot .* SDI shifted up by/);
  });

  it('when a signed period is downloaded, then the PDF holds the lab’s SDIs, the comments, the sign-off and the caution', async () => {
    const lab = net.labs.A;
    const comment = await request(t.app)
      .post(`/api/labs/${lab.id}/comments`)
      .set('Authorization', lab.analyst.auth)
      .send({
        period: '2026-03',
        procedureId: lab.glucose,
        controlLotId: net.catalogue.lot.id,
        level: 1,
        body: 'Calibration verified; bias traced to a reagent bottle left open.',
      });
    expect(comment.status).toBe(201);
    const statement = 'March review complete: flagged glucose rows investigated and documented.';
    const signoff = await request(t.app)
      .post(`/api/labs/${lab.id}/signoffs`)
      .set('Authorization', lab.supervisor.auth)
      .send({ period: '2026-03', statement });
    expect(signoff.status).toBe(201);

    const res = await downloadPdf(lab.analyst.auth);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['content-disposition']).toContain('.pdf');
    const body = res.body as Buffer;
    expect(body.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const text = await pdfText(body);

    expect(text).toContain(`Laboratory ${lab.code}`);
    expect(text).toContain('2026-03');
    expect(text).toContain('provisional');
    // Every row's SDI, recomputed here from the stored inputs with @plumbline/stats.
    for (const [analyte, level] of [
      ['glucose', 1],
      ['glucose', 2],
      ['creatinine', 1],
      ['creatinine', 2],
    ] as [Analyte, number][]) {
      const sdi = standing(
        net.table[analyte].A['2026-03'][level],
        expectedPeer(net, analyte, '2026-03', level),
      ).sdi;
      expect(text).toMatch(new RegExp(`(^|\\s)${printed(sdi).replace('.', '\\.')}(\\s|$)`));
    }
    expect(text).toContain(`Signed off by ${lab.supervisor.name}`);
    expect(text).toContain(statement);
    expect(text).toContain('Calibration verified; bias traced to a reagent bottle left open.');
    expect(text).toContain('Results support, and do not replace, the laboratory director');
    expect(text).toContain('remain the laboratory director');
    expect(text).toContain('under local regulation and accreditation');
  });

  it('when another lab asks for the PDF, then 404', async () => {
    const res = await request(t.app)
      .get(`/api/labs/${net.labs.A.id}/peer-report.pdf?period=2026-03`)
      .set('Authorization', net.labs.B.supervisor.auth);
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('CSV exports', () => {
  it('when the report is downloaded as CSV, then each row carries the same figures and flags as the API', async () => {
    const report = (
      await request(t.app)
        .get(`/api/labs/${net.labs.A.id}/peer-report?period=2026-03&units=conventional`)
        .set('Authorization', net.labs.A.analyst.auth)
    ).body as PeerReport;
    const res = await request(t.app)
      .get(`/api/labs/${net.labs.A.id}/peer-report.csv?period=2026-03&units=conventional`)
      .set('Authorization', net.labs.A.analyst.auth);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    const [header, ...lines] = parse(res.text) as string[][];
    expect(lines).toHaveLength(report.rows.length);
    const column = (name: string) => header.indexOf(name);
    lines.forEach((cells, i) => {
      const row = report.rows[i];
      expect(cells[column('procedure')]).toBe(row.procedure.code);
      expect(cells[column('unit')]).toBe(row.unit);
      expect(Number(cells[column('lab_mean')])).toBe(row.lab.mean);
      expect(Number(cells[column('sdi')])).toBe(row.sdi);
      const sdiSeverity = classifySdi(row.sdi!);
      const cvrSeverity = classifyCvr(row.cvr!);
      expect(cells[column('flags')]).toContain(`sdi:${sdiSeverity}`);
      expect(cells[column('flags')]).toContain(`cvr:${cvrSeverity}`);
    });
  });

  it('when comments, the test menu and uploads are downloaded, then each CSV lists them', async () => {
    const lab = net.labs.B;
    await request(t.app).post(`/api/labs/${lab.id}/comments`).set('Authorization', lab.analyst.auth).send({
      period: '2026-02',
      procedureId: lab.creatinine,
      controlLotId: net.catalogue.lot.id,
      level: 2,
      body: 'Checked, "no action", needed',
    });
    const comments = await request(t.app)
      .get(`/api/labs/${lab.id}/comments.csv?period=2026-02`)
      .set('Authorization', lab.analyst.auth);
    expect(comments.status).toBe(200);
    expect(comments.text.split('\r\n')[1]).toMatch(
      /^2026-02,CREA1,Creatinine,.*,2,Test analyst,.*,"Checked, ""no action"", needed"$/,
    );

    const menu = await request(t.app)
      .get(`/api/labs/${lab.id}/test-menu.csv`)
      .set('Authorization', lab.analyst.auth);
    expect((parse(menu.text) as string[][]).map((cells) => cells[0])).toEqual(['code', 'CREA1', 'GLU1']);

    await t.db.insert(uploads).values({
      labId: lab.id,
      uploadedBy: lab.analyst.id,
      kind: 'qc-summary',
      filename: 'march.csv',
      size: 1234,
      sha256: 'a'.repeat(64),
      storageKey: 'test/none',
      status: 'stored',
      rowsTotal: 12,
      rowsAccepted: 12,
    });
    const list = await request(t.app)
      .get(`/api/labs/${lab.id}/uploads.csv`)
      .set('Authorization', lab.supervisor.auth);
    const lines = list.text.trim().split('\r\n');
    expect(lines).toHaveLength(2);
    expect(lines[1]).toContain(',march.csv,qc-summary,stored,12,12,0,1234,');
    expect(
      (
        await request(t.app)
          .get(`/api/labs/${lab.id}/uploads.csv`)
          .set('Authorization', net.labs.A.supervisor.auth)
      ).status,
    ).toBe(404);
  });
});
