import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import fc from 'fast-check';
import { readdirSync } from 'node:fs';
import type { Server } from 'node:net';
import { uploads } from '@plumbline/db';
import { createTestApp, type TestApp } from '../testing/test-app.ts';
import { MAX_CATALOGUE_CSV_BYTES } from '../modules/catalogue-admin/csv-body.ts';

// Property: whatever malformed multipart body reaches an upload or import route, the API answers 4xx
// and keeps serving, and nothing is stored. Vitest fails the run on any uncaught exception, so a body
// that stopped the process would fail this test even if its own request looked answered.

const MAX_UPLOAD_BYTES = 4000;
const RUNS = Number(process.env.MULTIPART_FUZZ_RUNS ?? 500);

let t: TestApp;
let server: Server;
let analystAuth: string;
let coordinatorAuth: string;

beforeAll(async () => {
  t = await createTestApp('multipartfuzz', { env: { MAX_UPLOAD_BYTES: String(MAX_UPLOAD_BYTES) } });
  const lab = await t.makeLab();
  analystAuth = (await t.makeUser('analyst', lab.id)).auth;
  coordinatorAuth = (await t.makeUser('coordinator', null)).auth;
  server = t.app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
});
afterAll(async () => {
  await new Promise((resolve) => server?.close(resolve));
  await t?.close();
});

/** Every route that reads a multipart body, with who may call it and its file limit. */
const ROUTES = [
  { path: '/api/uploads', role: 'analyst', maxBytes: MAX_UPLOAD_BYTES },
  // The preview reads the head of a file of any size, so a large file is no error there.
  { path: '/api/uploads/preview', role: 'analyst', maxBytes: Number.POSITIVE_INFINITY },
  ...['analytes', 'methods', 'instrument-models', 'reagents', 'control-materials'].map((list) => ({
    path: `/api/catalogue/${list}/import`,
    role: 'coordinator',
    maxBytes: MAX_CATALOGUE_CSV_BYTES,
  })),
] as const;

const BOUNDARY = 'fuzz-boundary-7f3a';
const CRLF = '\r\n';

function filePart(content: string, field = 'file', filename = 'qc.csv'): string {
  return (
    `--${BOUNDARY}${CRLF}Content-Disposition: form-data; name="${field}"; filename="${filename}"${CRLF}` +
    `Content-Type: text/csv${CRLF}${CRLF}${content}${CRLF}`
  );
}
const fieldPart = (name: string, value: string) =>
  `--${BOUNDARY}${CRLF}Content-Disposition: form-data; name="${name}"${CRLF}${CRLF}${value}${CRLF}`;
const closing = `--${BOUNDARY}--${CRLF}`;

const csvText = fc
  .array(fc.stringMatching(/^[A-Za-z0-9 .,;"-]{0,40}$/), { minLength: 1, maxLength: 20 })
  .map((lines) => ['period,procedure,control_lot,level,n,mean,sd,unit', ...lines].join('\n'));

type Case = { label: string; contentType: string; body: (maxBytes: number) => Buffer };

/** A complete, well-formed body cut anywhere before its closing boundary has been read. */
const truncated: fc.Arbitrary<Case> = fc
  .tuple(csvText, fc.double({ min: 0, max: 1, noNaN: true }), fc.boolean())
  .map(([csv, at, withField]) => ({
    label: 'truncated',
    contentType: `multipart/form-data; boundary=${BOUNDARY}`,
    body: () => {
      const whole = (withField ? fieldPart('kind', 'qc-summary') : '') + filePart(csv) + closing;
      const cutBefore = whole.length - closing.length + 2 + BOUNDARY.length; // inside "--boundary--"
      return Buffer.from(whole.slice(0, Math.floor(at * cutBefore)));
    },
  }));

/** A part whose header lines are garbage (no colon, stray bytes, unterminated). */
const badHeader: fc.Arbitrary<Case> = fc
  .tuple(csvText, fc.string({ minLength: 1, maxLength: 60 }), fc.boolean())
  .map(([csv, junk, unterminated]) => ({
    label: 'bad header',
    contentType: `multipart/form-data; boundary=${BOUNDARY}`,
    body: () =>
      Buffer.from(
        `--${BOUNDARY}${CRLF}${junk.replace(/:/g, '')}${unterminated ? '' : CRLF + CRLF + csv + CRLF + closing}`,
      ),
  }));

/** The header names a boundary the body never uses, or none at all. */
const wrongBoundary: fc.Arbitrary<Case> = fc
  .tuple(csvText, fc.constantFrom('other-boundary', '', '"', 'x'.repeat(80)))
  .map(([csv, boundary]) => ({
    label: 'wrong boundary',
    contentType: boundary ? `multipart/form-data; boundary=${boundary}` : 'multipart/form-data',
    body: () => Buffer.from(filePart(csv) + closing),
  }));

/** A well-formed body whose file is over the route's limit. */
const oversized: fc.Arbitrary<Case> = fc
  .tuple(fc.integer({ min: 1, max: 3000 }), fc.constantFrom('1,', 'x', '\n'))
  .map(([extra, unit]) => ({
    label: 'oversized',
    contentType: `multipart/form-data; boundary=${BOUNDARY}`,
    body: (maxBytes: number) =>
      Buffer.from(
        fieldPart('kind', 'qc-summary') +
          filePart('period\n' + unit.repeat(Math.ceil((maxBytes + extra) / unit.length))) +
          closing,
      ),
  }));

/** Two file parts, or a file under another field name. */
const extraFile: fc.Arbitrary<Case> = fc
  .tuple(csvText, csvText, fc.constantFrom('file', 'other', 'attachment'))
  .map(([a, b, secondField]) => ({
    label: 'extra file',
    contentType: `multipart/form-data; boundary=${BOUNDARY}`,
    body: () => Buffer.from(filePart(a) + filePart(b, secondField, 'second.csv') + closing),
  }));

/** Random bytes under a multipart content type. */
const noise: fc.Arbitrary<Case> = fc.uint8Array({ minLength: 0, maxLength: 400 }).map((bytes) => ({
  label: 'noise',
  contentType: `multipart/form-data; boundary=${BOUNDARY}`,
  body: () => Buffer.from(bytes),
}));

const anyCase = fc.oneof(truncated, badHeader, wrongBoundary, oversized, extraFile, noise);
const anyCaseButOversized = fc.oneof(truncated, badHeader, wrongBoundary, extraFile, noise);
const routeAndCase = fc
  .constantFrom(...ROUTES)
  .chain((route) =>
    fc.tuple(fc.constant(route), Number.isFinite(route.maxBytes) ? anyCase : anyCaseButOversized),
  );

function storedFiles(): string[] {
  return readdirSync(t.storageDir, { recursive: true, withFileTypes: true })
    .filter((entry) => entry.isFile())
    .map((entry) => entry.name);
}

describe('malformed multipart bodies on every upload and import route', () => {
  it(`when ${RUNS} truncated, malformed, oversized or doubled bodies are sent, then each is answered 4xx and the API keeps serving`, async () => {
    const seen = new Map<string, number>();
    await fc.assert(
      fc.asyncProperty(routeAndCase, async ([route, c]) => {
        const auth = route.role === 'coordinator' ? coordinatorAuth : analystAuth;
        const res = await request(server)
          .post(route.path)
          .set('Authorization', auth)
          .set('Content-Type', c.contentType)
          .send(c.body(route.maxBytes));
        const key = `${c.label} → ${res.status}`;
        seen.set(key, (seen.get(key) ?? 0) + 1);
        expect(
          res.status,
          `${c.label} on ${route.path}: ${JSON.stringify(res.body).slice(0, 300)}`,
        ).toBeGreaterThanOrEqual(400);
        expect(res.status).toBeLessThan(500);
        expect(res.body.error?.code).toEqual(expect.any(String));
        expect(res.body.error?.message).toEqual(expect.any(String));
      }),
      { numRuns: RUNS },
    );
    console.log(`multipart fuzz: ${RUNS} cases; ${[...seen].map(([k, n]) => `${k}: ${n}`).join('; ')}`);
    expect((await request(server).get('/api/health')).status).toBe(200);
    expect(storedFiles()).toEqual([]);
    expect(await t.db.select().from(uploads)).toEqual([]);
  }, 300_000);
});
