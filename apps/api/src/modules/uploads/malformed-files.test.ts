import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { gzipSync } from 'node:zlib';
import { eq, sql } from 'drizzle-orm';
import { analytes, hasPendingPeerStatistics } from '@plumbline/db';
import { createQcCatalogue, type QcCatalogue } from '@plumbline/db/testing';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import { spawnWorkerFor, type WorkerProcess } from '../../testing/worker-process.ts';

/**
 * A corpus of malformed monthly files, each sent through the real upload route and the ingest worker
 * (run as its own process). Each must end refused (400) or failed / needs-review with a specific
 * error, store nothing, and leave the lab's peer report for the month byte-identical and answering 200.
 */

let t: TestApp;
let worker: WorkerProcess;
let catalogue: QcCatalogue;
let lab: { id: string };
let analyst: Awaited<ReturnType<TestApp['makeUser']>>;
let lot: string;

const PERIOD = '2026-02';
const HEADER = 'period,procedure,control_lot,level,n,mean,sd,unit';
/** Stands for the catalogue's lot number, which is made in beforeAll (after the cases are written). */
const LOT = '{LOT}';
const VALUES_HEADER = 'measured_at,procedure,control_lot,level,value,unit,run,comment';

beforeAll(async () => {
  t = await createTestApp('malformed');
  catalogue = await createQcCatalogue(t.db);
  lot = catalogue.lot.lotNumber;
  // Glucose gets plausibility limits (test values, common practice); creatinine keeps none, so the
  // checks that apply without limits are exercised too.
  await t.db
    .update(analytes)
    .set({ plausibleLow: 0.5, plausibleHigh: 50, plausibilitySource: 'common practice (test)' })
    .where(eq(analytes.id, catalogue.analytes.glucose.id));
  worker = await spawnWorkerFor(t);

  // Four labs with valid February figures, so the peer report has peer figures to keep intact.
  const means = [5.51, 5.44, 5.58, 5.49];
  for (const [index, mean] of means.entries()) {
    const made = await catalogue.makeLabWithProcedures([
      { code: 'GLU1' },
      { code: 'CREA1', analyte: catalogue.analytes.creatinine },
    ]);
    const user = await t.makeUser('analyst', made.lab.id);
    if (index === 0) {
      lab = made.lab;
      analyst = user;
    }
    const created = await send(user.auth, summaryBuffer(mean, index));
    expect(created.status).toBe(202);
    const done = await waitFor(user.auth, created.body.id);
    expect(done.status).toBe('stored');
  }
  // Another lab's procedure code, which the first lab must not be able to use.
  await catalogue.makeLabWithProcedures([{ code: 'OTHER1' }]);
  for (let i = 0; i < 400 && (await hasPendingPeerStatistics(t.db)); i++) await sleep(50);
}, 120_000);

afterAll(async () => {
  await worker?.stop();
  await t?.close();
});

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

function summaryBuffer(mean: number, index: number): Buffer {
  return Buffer.from(
    `${HEADER}\n${PERIOD},GLU1,${lot},1,20,${mean},0.12,mmol/L\n${PERIOD},CREA1,${lot},1,20,${88 + index},2.5,umol/L\n`,
  );
}

function send(auth: string, content: Buffer, kind = 'qc-summary') {
  return request(t.app)
    .post('/api/uploads')
    .set('Authorization', auth)
    .field('kind', kind)
    .attach('file', content, 'monthly.csv');
}

async function waitFor(auth: string, id: string) {
  for (let i = 0; i < 400; i++) {
    const res = await request(t.app).get(`/api/uploads/${id}`).set('Authorization', auth);
    if (['stored', 'needs-review', 'failed'].includes(res.body.status)) return res.body;
    await sleep(50);
  }
  throw new Error(`upload ${id} did not finish:\n${worker.output()}`);
}

async function counts() {
  const result = await t.db.execute<{ summaries: number; values: number }>(
    sql`select (select count(*)::int from qc_summaries) as summaries, (select count(*)::int from qc_values) as values`,
  );
  return result.rows[0];
}

async function peerReport() {
  return request(t.app)
    .get(`/api/labs/${lab.id}/peer-report?period=${PERIOD}`)
    .set('Authorization', analyst.auth);
}

type Case = {
  name: string;
  content: string | Buffer;
  kind?: 'qc-summary' | 'qc-values';
  /** The row error code (or the API's 400) the file must end with. */
  code: string;
  /** Words the error message must contain. */
  message: RegExp;
};

const row = (
  cells: Partial<Record<'period' | 'procedure' | 'lot' | 'level' | 'n' | 'mean' | 'sd' | 'unit', string>>,
) =>
  [
    cells.period ?? PERIOD,
    cells.procedure ?? 'GLU1',
    cells.lot ?? LOT,
    cells.level ?? '1',
    cells.n ?? '20',
    cells.mean ?? '5.5',
    cells.sd ?? '0.12',
    cells.unit ?? 'mmol/L',
  ].join(',');
const summary = (...rows: string[]) => [HEADER, ...rows].join('\n') + '\n';
const valueRow = (cells: Partial<Record<'at' | 'procedure' | 'value' | 'unit' | 'run', string>>) =>
  [
    cells.at ?? '2026-02-10T08:00',
    cells.procedure ?? 'GLU1',
    LOT,
    '1',
    cells.value ?? '5.5',
    cells.unit ?? 'mmol/L',
    cells.run ?? 'R1',
    '',
  ].join(',');
const values = (...rows: string[]) => [VALUES_HEADER, ...rows].join('\n') + '\n';

function utf16(text: string, bigEndian: boolean): Buffer {
  const le = Buffer.from(`\ufeff${text}`, 'utf16le');
  if (!bigEndian) return le;
  const be = Buffer.alloc(le.length);
  for (let i = 0; i < le.length; i += 2) {
    be[i] = le[i + 1];
    be[i + 1] = le[i];
  }
  return be;
}

const valid = () => summary(row({}));

const cases: Case[] = [
  // Not a CSV file at all.
  { name: 'an empty file', content: '', code: 'api-400', message: /empty/ },
  {
    name: 'blank lines only',
    content: '\n\n  \n',
    code: 'missing_column',
    message: /empty: it has no header/,
  },
  {
    name: 'a header only',
    content: `${HEADER}\n`,
    code: 'required',
    message: /header line but no data rows/,
  },
  {
    name: 'unknown columns only',
    content: 'alpha,beta\n1,2\n',
    code: 'missing_column',
    message: /No column of the file holds/,
  },
  {
    name: 'two mean columns',
    content: `period,procedure,control_lot,level,n,mean,sd,unit,mean\n${row({})},9.9\n`,
    code: 'duplicate_column',
    message: /"mean" more than once/,
  },
  {
    name: 'a column repeated in another case',
    content: `period,procedure,control_lot,level,n,mean,sd,unit,SD\n${row({})},0.2\n`,
    code: 'duplicate_column',
    message: /"SD" more than once/,
  },
  {
    name: 'a ragged row with extra cells',
    content: summary(`${row({})},7,8`),
    code: 'wrong_column_count',
    message: /10 cells but the header has 8/,
  },
  {
    name: 'a ragged row with missing cells',
    content: summary(`${PERIOD},GLU1,${LOT},1,20`),
    code: 'required',
    message: /mean is empty/,
  },
  {
    name: 'a quote never closed',
    content: summary(`${PERIOD},"GLU1,${LOT},1,20,5.5,0.12,mmol/L`),
    code: 'malformed_csv',
    message: /never closed/,
  },
  {
    name: 'UTF-16 with a little-endian BOM',
    content: utf16(valid(), false),
    code: 'not_text',
    message: /UTF-16/,
  },
  {
    name: 'UTF-16 with a big-endian BOM',
    content: utf16(valid(), true),
    code: 'not_text',
    message: /UTF-16/,
  },
  {
    name: 'binary data',
    content: Buffer.from([0x00, 0x01, 0x02, 0xff, 0x10, 0x80, 0x00, 0x7f, 0x33]),
    code: 'not_text',
    message: /not a text file: it looks like binary data/,
  },
  {
    name: 'a gzip file sent as CSV',
    content: gzipSync(Buffer.from(valid())),
    code: 'not_text',
    message: /not a text file: it looks like a gzip archive/,
  },
  {
    name: 'a zip archive',
    content: Buffer.concat([Buffer.from([0x50, 0x4b, 0x03, 0x04]), Buffer.alloc(60, 1)]),
    code: 'not_text',
    message: /zip archive/,
  },
  {
    name: 'a NUL byte inside text',
    content: Buffer.from(summary(`${PERIOD},GLU1\u0000,${LOT},1,20,5.5,0.12,mmol/L`)),
    code: 'not_text',
    message: /NUL byte/,
  },
  {
    name: 'bytes that are neither UTF-8 nor Windows-1252',
    content: Buffer.concat([
      Buffer.from(`${HEADER}\n${PERIOD},GLU`),
      Buffer.from([0x81, 0x01]),
      Buffer.from(`,${LOT},1,20,5.5,0.12,mmol/L\n`),
    ]),
    code: 'not_text',
    message: /neither UTF-8 nor Windows-1252/,
  },
  // Numbers.
  {
    name: 'mean NaN',
    content: summary(row({ mean: 'NaN' })),
    code: 'invalid_number',
    message: /mean "NaN" is not a number/,
  },
  {
    name: 'mean Infinity',
    content: summary(row({ mean: 'Infinity' })),
    code: 'invalid_number',
    message: /mean "Infinity" is not a number/,
  },
  {
    name: 'mean -Infinity',
    content: summary(row({ mean: '-Infinity' })),
    code: 'invalid_number',
    message: /is not a number/,
  },
  {
    name: 'mean 1e308',
    content: summary(row({ mean: '1e308' })),
    code: 'implausible_value',
    message: /outside the plausible range of Glucose/,
  },
  {
    name: 'mean 1e308 for an analyte without plausibility limits',
    content: summary(row({ procedure: 'CREA1', mean: '1e308', sd: '1e306', unit: 'umol/L' })),
    code: 'out_of_range',
    message: /outside the range figures are computed in/,
  },
  {
    name: 'mean 1e400 (beyond double precision)',
    content: summary(row({ mean: '1e400' })),
    code: 'invalid_number',
    message: /is not a number/,
  },
  {
    name: 'mean 1e-320 (subnormal)',
    content: summary(row({ procedure: 'CREA1', mean: '1e-320', unit: 'umol/L' })),
    code: 'out_of_range',
    message: /outside the range figures are computed in/,
  },
  {
    name: 'mean zero where the quantity cannot be negative',
    content: summary(row({ procedure: 'CREA1', mean: '0', unit: 'umol/L' })),
    code: 'mean_not_positive',
    message: /greater than 0 for Creatinine/,
  },
  {
    name: 'a negative mean',
    content: summary(row({ procedure: 'CREA1', mean: '-88', sd: '2', unit: 'umol/L' })),
    code: 'mean_not_positive',
    message: /greater than 0/,
  },
  {
    name: 'mean above the plausibility limit',
    content: summary(row({ mean: '550' })),
    code: 'implausible_value',
    message: /0.5 to 50 mmol\/L/,
  },
  {
    name: 'mean in mol/L, implausible once converted',
    content: summary(row({ mean: '5.5', sd: '0.1', unit: 'mol/L' })),
    code: 'implausible_value',
    message: /5500 mmol\/L/,
  },
  {
    name: 'a value made non-finite by unit conversion',
    content: summary(row({ mean: '1e306', sd: '1e305', unit: 'mol/L' })),
    code: 'not_finite',
    message: /not a finite number once converted to mmol\/L/,
  },
  {
    name: 'sd zero',
    content: summary(row({ sd: '0' })),
    code: 'sd_not_positive',
    message: /sd must be greater than 0/,
  },
  {
    name: 'sd negative',
    content: summary(row({ sd: '-0.12' })),
    code: 'sd_not_positive',
    message: /sd must be greater than 0/,
  },
  {
    name: 'sd 1e-320 (subnormal)',
    content: summary(row({ sd: '1e-320' })),
    code: 'out_of_range',
    message: /sd .* outside the range/,
  },
  {
    name: 'sd NaN',
    content: summary(row({ sd: 'NaN' })),
    code: 'invalid_number',
    message: /sd "NaN" is not a number/,
  },
  {
    name: 'a CV above the limit',
    content: summary(row({ mean: '5', sd: '4' })),
    code: 'cv_too_high',
    message: /CV .* is 80 %, above the network's limit of 50 %/,
  },
  {
    name: 'n of 0',
    content: summary(row({ n: '0' })),
    code: 'n_too_small',
    message: /n must be at least 2, got 0/,
  },
  {
    name: 'n of 1',
    content: summary(row({ n: '1' })),
    code: 'n_too_small',
    message: /n must be at least 2, got 1/,
  },
  {
    name: 'n of 2.5',
    content: summary(row({ n: '2.5' })),
    code: 'invalid_integer',
    message: /n "2.5" is not a whole number/,
  },
  {
    name: 'n of 1e15',
    content: summary(row({ n: '1e15' })),
    code: 'invalid_integer',
    message: /n "1e15" is not a whole number/,
  },
  {
    name: 'n of 10^15 written out',
    content: summary(row({ n: '1000000000000000' })),
    code: 'n_too_large',
    message: /n must be at most 10000/,
  },
  // Months, codes, units.
  {
    name: 'month 13',
    content: summary(row({ period: '2026-13' })),
    code: 'invalid_period',
    message: /not a month written as YYYY-MM/,
  },
  {
    name: 'month 00',
    content: summary(row({ period: '2026-00' })),
    code: 'invalid_period',
    message: /not a month/,
  },
  {
    name: 'a month that is not a cycle',
    content: summary(row({ period: '2031-01' })),
    code: 'unknown_period',
    message: /2031-01 is not a cycle/,
  },
  {
    name: 'an unknown procedure',
    content: summary(row({ procedure: 'NOPE9' })),
    code: 'unknown_procedure',
    message: /"NOPE9" is not a registered measurement procedure/,
  },
  {
    name: "another lab's procedure",
    content: summary(row({ procedure: 'OTHER1' })),
    code: 'unknown_procedure',
    message: /"OTHER1" is not a registered/,
  },
  {
    name: 'an unknown lot',
    content: summary(row({ lot: 'LOT-NOPE' })),
    code: 'unknown_control_lot',
    message: /"LOT-NOPE" is not in the network's catalogue/,
  },
  {
    name: 'an unknown level',
    content: summary(row({ level: '3' })),
    code: 'unknown_level',
    message: /has levels 1, 2, not 3/,
  },
  {
    name: 'a unit that is not UCUM',
    content: summary(row({ unit: 'mmol/Lx' })),
    code: 'invalid_unit',
    message: /not a UCUM unit/,
  },
  {
    name: 'a unit of another kind of quantity',
    content: summary(row({ unit: 'U/L' })),
    code: 'unit_not_convertible',
    message: /cannot be converted to mmol\/L/,
  },
  {
    name: 'the same row twice',
    content: summary(row({}), row({ mean: '5.6' })),
    code: 'duplicate_row',
    message: /already gives GLU1/,
  },
  // Formula injection.
  {
    name: 'a procedure cell starting with =',
    content: summary(row({ procedure: '=HYPERLINK(1)' })),
    code: 'formula_like',
    message: /starts with "="/,
  },
  {
    name: 'a lot cell starting with @',
    content: summary(row({ lot: '@SUM(A1)' })),
    code: 'formula_like',
    message: /starts with "@"/,
  },
  {
    name: 'a procedure cell starting with +',
    content: summary(row({ procedure: '+cmd' })),
    code: 'formula_like',
    message: /starts with "\+"/,
  },
  {
    name: 'a procedure cell starting with -',
    content: summary(row({ procedure: '-2+3' })),
    code: 'formula_like',
    message: /starts with "-"/,
  },
  {
    name: 'a control character in a code',
    content: summary(row({ procedure: 'GL\u0007U1' })),
    code: 'unknown_procedure',
    message: /"GLU1" is not a registered/,
  },
  // Daily values.
  {
    name: 'a daily value of 1e308',
    kind: 'qc-values',
    content: values(valueRow({ value: '1e308' })),
    code: 'implausible_value',
    message: /outside the plausible range of Glucose/,
  },
  {
    name: 'a daily value NaN',
    kind: 'qc-values',
    content: values(valueRow({ value: 'NaN' })),
    code: 'invalid_number',
    message: /value "NaN" is not a number/,
  },
  {
    name: 'a negative daily value',
    kind: 'qc-values',
    content: values(valueRow({ procedure: 'CREA1', value: '-5', unit: 'umol/L' })),
    code: 'implausible_value',
    message: /Creatinine cannot be negative/,
  },
  {
    name: 'a daily value in month 13',
    kind: 'qc-values',
    content: values(valueRow({ at: '2026-13-02' })),
    code: 'invalid_timestamp',
    message: /./,
  },
  {
    name: 'a run cell starting with =',
    kind: 'qc-values',
    content: values(valueRow({ run: '=1+1' })),
    code: 'formula_like',
    message: /run "=1\+1" starts with "="/,
  },
];

describe('malformed monthly files', () => {
  it(`has at least 40 cases (${cases.length})`, () => {
    expect(cases.length).toBeGreaterThanOrEqual(40);
  });

  it.each(cases.map((c) => [c.name, c] as const))(
    'when the file has %s, then it is refused with a specific error, nothing is stored and the peer report is unchanged',
    async (_name, c) => {
      const before = await counts();
      const reportBefore = await peerReport();
      expect(reportBefore.status).toBe(200);

      const content =
        typeof c.content === 'string' ? Buffer.from(c.content.replaceAll(LOT, lot), 'utf8') : c.content;
      const res = await send(analyst.auth, content, c.kind ?? 'qc-summary');
      if (c.code === 'api-400') {
        expect(res.status).toBe(400);
        expect(res.body.error.message).toMatch(c.message);
      } else {
        expect(res.status).toBe(202);
        const done = await waitFor(analyst.auth, res.body.id);
        expect(['failed', 'needs-review']).toContain(done.status);
        const errors: { code: string; message: string }[] = done.errors;
        const found = errors.find((e) => e.code === c.code);
        expect(found, JSON.stringify({ failure: done.failureMessage, errors })).toBeDefined();
        expect(found!.message).toMatch(c.message);
        // Stored texts carry no control characters (NUL included).
        for (const text of [...errors.map((e) => e.message), done.failureMessage ?? ''])
          // eslint-disable-next-line no-control-regex
          expect(text).not.toMatch(/[\u0000-\u001f\u007f]/);
        if (done.status === 'failed') expect(done.failureMessage).not.toMatch(/on our side/);
      }

      expect(await counts()).toEqual(before);
      const reportAfter = await peerReport();
      expect(reportAfter.status).toBe(200);
      expect(reportAfter.text).toBe(reportBefore.text);
    },
    30_000,
  );
});

describe('the upload preview', () => {
  const preview = (content: Buffer) =>
    request(t.app)
      .post('/api/uploads/preview')
      .set('Authorization', analyst.auth)
      .field('kind', 'qc-summary')
      .attach('file', content, 'monthly.csv');

  it('when the file is a gzip archive, then 400 says it is not a text file', async () => {
    const res = await preview(gzipSync(Buffer.from(`${HEADER}\n`)));
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe(
      '"monthly.csv": This is not a text file: it looks like a gzip archive.',
    );
  });

  it('when the header names a column twice, then 400 names the column', async () => {
    const res = await preview(Buffer.from(`${HEADER},mean\n`));
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/"mean" more than once/);
  });

  it('when the file is Windows-1252 text, then the preview decodes it', async () => {
    // E4 is "ä" in Windows-1252 (WHATWG index-windows-1252).
    const res = await preview(
      Buffer.concat([
        Buffer.from(`${HEADER},Bemerkung\n2026-02,GLU1,L,1,20,5.5,0.1,mmol/L,M`),
        Buffer.from([0xe4]),
        Buffer.from('rz\n'),
      ]),
    );
    expect(res.status).toBe(200);
    expect(res.body.rows[0].at(-1)).toBe('März');
  });
});
