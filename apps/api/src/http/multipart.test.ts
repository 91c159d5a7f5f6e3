import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { connect } from 'node:net';
import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import type { AddressInfo, Server } from 'node:net';
import { createTestApp, type TestApp } from '../testing/test-app.ts';

// Malformed multipart bodies must be answered with a 4xx and must never stop the process. Vitest fails
// the run on any uncaught exception or unhandled rejection, so a crash here fails these tests.

let t: TestApp;
let server: Server;
let analyst: { auth: string };
let coordinator: { auth: string };

beforeAll(async () => {
  t = await createTestApp('multipart', { env: { MAX_UPLOAD_BYTES: '4000' } });
  const lab = await t.makeLab();
  analyst = await t.makeUser('analyst', lab.id);
  coordinator = await t.makeUser('coordinator', null);
  server = t.app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
});
afterAll(async () => {
  await new Promise((resolve) => server?.close(resolve));
  await t?.close();
});

const BOUNDARY = 'plumbline-test-boundary';
const CONTENT_TYPE = `multipart/form-data; boundary=${BOUNDARY}`;

/** A multipart body whose file part never ends: no closing boundary (151 bytes). */
const TRUNCATED_BODY =
  `--${BOUNDARY}\r\n` +
  `Content-Disposition: form-data; name="file"; filename="qc.csv"\r\n` +
  `Content-Type: text/csv\r\n\r\n` +
  `period,procedure,mean\r\n2026-02,GLU`;

function part(name: string, content: string, filename?: string): string {
  const disposition = filename
    ? `form-data; name="${name}"; filename="${filename}"`
    : `form-data; name="${name}"`;
  return `--${BOUNDARY}\r\nContent-Disposition: ${disposition}\r\n\r\n${content}\r\n`;
}

const post = (path: string, auth: string, body: string | Buffer, contentType = CONTENT_TYPE) =>
  request(server).post(path).set('Authorization', auth).set('Content-Type', contentType).send(body);

async function expectAlive() {
  const res = await request(server).get('/api/health');
  expect(res.status).toBe(200);
}

function partialFiles(): string[] {
  const found: string[] = [];
  const walk = (dir: string) => {
    for (const entry of readdirSync(dir, { withFileTypes: true })) {
      if (entry.isDirectory()) walk(join(dir, entry.name));
      else if (entry.name.endsWith('.partial')) found.push(join(dir, entry.name));
    }
  };
  walk(t.storageDir);
  return found;
}

describe('multipart bodies that end inside the file part', () => {
  it('when the body has the size of the reported reproduction, then it is 151 bytes', () => {
    expect(Buffer.byteLength(TRUNCATED_BODY)).toBe(151);
  });

  it('when an upload ends inside the file part, then the answer is 400 and the API keeps serving', async () => {
    const res = await post('/api/uploads', analyst.auth, TRUNCATED_BODY);
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('bad_request');
    expect(res.body.error.message).toMatch(/multipart|interrupted|incomplete/i);
    await expectAlive();
    expect(partialFiles()).toEqual([]);
  });

  it('when a preview ends inside the file part, then the answer is 400 and the API keeps serving', async () => {
    const res = await post('/api/uploads/preview', analyst.auth, TRUNCATED_BODY);
    expect(res.status).toBe(400);
    await expectAlive();
  });

  it('when a catalogue import ends inside the file part, then the answer is 400 and the API keeps serving', async () => {
    const res = await post('/api/catalogue/methods/import', coordinator.auth, TRUNCATED_BODY);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/multipart|interrupted|incomplete/i);
    await expectAlive();
  });
});

describe('a second file part', () => {
  it('when an upload carries two files, then the answer is 400 and nothing is stored', async () => {
    const body =
      part('kind', 'qc-summary') +
      part('file', 'a,b\n1,2\n', 'one.csv') +
      part('file', 'a,b\n3,4\n', 'two.csv') +
      `--${BOUNDARY}--\r\n`;
    const res = await post('/api/uploads', analyst.auth, body);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/exactly one file/i);
    const files = readdirSync(t.storageDir, { recursive: true, withFileTypes: true }).filter((e) =>
      e.isFile(),
    );
    expect(files).toEqual([]);
  });

  it('when a catalogue import carries two files, then the answer is 400', async () => {
    const body =
      part('file', 'code,name\nM1,One\n', 'one.csv') +
      part('file', 'code,name\nM2,Two\n', 'two.csv') +
      `--${BOUNDARY}--\r\n`;
    const res = await post('/api/catalogue/methods/import', coordinator.auth, body);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/exactly one file/i);
  });
});

describe('an upload the client abandons', () => {
  it('when the connection closes in the middle of the file, then its partial file is deleted', async () => {
    const head =
      part('kind', 'qc-summary') +
      `--${BOUNDARY}\r\nContent-Disposition: form-data; name="file"; filename="big.csv"\r\n\r\n` +
      'period,procedure,control_lot,level,n,mean,sd,unit\n'.repeat(20);
    const { port } = server.address() as AddressInfo;
    const socket = connect(port, '127.0.0.1');
    await new Promise((resolve) => socket.once('connect', resolve));
    socket.write(
      `POST /api/uploads HTTP/1.1\r\nHost: 127.0.0.1\r\nAuthorization: ${analyst.auth}\r\n` +
        `Content-Type: ${CONTENT_TYPE}\r\nContent-Length: 3900\r\n\r\n${head}`,
    );
    // Wait until the API has started writing the file, then drop the connection.
    for (let i = 0; i < 200 && partialFiles().length === 0; i++) await sleep(10);
    expect(partialFiles().length).toBe(1);
    socket.destroy();
    for (let i = 0; i < 200 && partialFiles().length > 0; i++) await sleep(10);
    expect(partialFiles()).toEqual([]);
    await expectAlive();
  });
});

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
