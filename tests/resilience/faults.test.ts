import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { utimesSync, writeFileSync, mkdirSync } from 'node:fs';
import { connect } from 'node:net';
import { join } from 'node:path';
import {
  childPids,
  createStack,
  services,
  sleep,
  storageLeftovers,
  storedRows,
  uploadFile,
  uploadStatus,
  valuesFile,
  waitStored,
  type Stack,
  WORKER_READY,
} from './harness.ts';
import { recordFigure } from './figures.ts';

// Faults a running network meets — a worker killed mid-upload, Redis restarting, PostgreSQL restarting
// under readers and an upload, the API killed mid-write — and what must hold afterwards: every upload
// stored exactly once (row counts), nothing half-stored, no partial or orphan file in storage, and the
// API answering throughout (503 with Retry-After while the database is away).

const LARGE_ROWS = Number(process.env.RESILIENCE_LARGE_ROWS ?? 120_000);
const READERS = 50;

let stack: Stack;
let api: Awaited<ReturnType<Stack['startApi']>>;
let worker: Awaited<ReturnType<Stack['startSupervisedWorker']>>;
let labA: Awaited<ReturnType<Stack['makeLab']>>;
const expectedRows = new Map<string, number>();

beforeAll(async () => {
  stack = await createStack('faults');
  // A partial file an earlier API process left when it was killed mid-write, hours ago.
  mkdirSync(join(stack.storageDir, 'uploads/2026/01'), { recursive: true });
  const stale = join(stack.storageDir, 'uploads/2026/01/killed-mid-write.0badc0de.partial');
  writeFileSync(stale, 'measured_at,procedure\n2026-01-01');
  utimesSync(stale, new Date(Date.now() - 3 * 3600_000), new Date(Date.now() - 3 * 3600_000));
  api = await stack.startApi();
  worker = await stack.startSupervisedWorker();
  labA = await stack.makeLab();
});
afterAll(async () => {
  await stack?.close();
});

async function waitProcessing(uploadId: string, minProgress = 0.05) {
  for (let i = 0; i < 2400; i++) {
    const result = await stack.db.execute<{ status: string; progress: number }>(
      sql`select status, progress from uploads where id = ${uploadId}`,
    );
    const row = result.rows[0];
    if (row?.status === 'processing' && row.progress >= minProgress) return;
    if (row && ['stored', 'failed', 'needs-review'].includes(row.status))
      throw new Error(`upload ${uploadId} finished (${row.status}) before the fault could be injected`);
    await sleep(25);
  }
  throw new Error(`upload ${uploadId} never started processing:\n${worker.output()}`);
}

const count = (text: string, pattern: RegExp) => (text.match(new RegExp(pattern, 'g')) ?? []).length;

describe('faults', () => {
  it('when the API starts, then partial files left by an earlier crash are swept from storage', async () => {
    await api.waitFor(/removed 1 partial upload file/);
    expect((await storageLeftovers(stack.db, stack.storageDir)).partial).toEqual([]);
  });

  it('when the worker is killed (kill -9) in the middle of a large upload, then its supervisor restarts it and the upload is stored once', async () => {
    const content = valuesFile(stack.catalogue.lot.lotNumber, LARGE_ROWS, 11);
    const id = await uploadFile(api.url, labA.labToken, content);
    expectedRows.set(id, LARGE_ROWS);
    await waitProcessing(id);
    const [workerPid] = childPids(worker.child.pid!);
    expect(workerPid).toBeGreaterThan(0);
    const killedAt = Date.now();
    process.kill(workerPid, 'SIGKILL');
    await worker.waitFor(/worker: was killed by signal KILL/);
    while (count(worker.output(), WORKER_READY) < 2) await sleep(50);
    const restartedMs = Date.now() - killedAt;

    expect(await waitStored(stack.db, id)).toBe('stored');
    const storedAfterMs = Date.now() - killedAt;
    expect(await storedRows(stack.db, id)).toBe(LARGE_ROWS);
    recordFigure(
      'worker kill -9 mid-upload',
      `worker restarted by the supervisor ${(restartedMs / 1000).toFixed(1)} s after the kill; upload of ${LARGE_ROWS.toLocaleString('en')} rows stored once ${(storedAfterMs / 1000).toFixed(1)} s after the kill`,
    );
  });

  it('when Redis stops and starts during an upload (and another upload arrives meanwhile), then both are stored once', async () => {
    const lab = await stack.makeLab();
    const first = await uploadFile(
      api.url,
      lab.labToken,
      valuesFile(stack.catalogue.lot.lotNumber, LARGE_ROWS, 12),
    );
    expectedRows.set(first, LARGE_ROWS);
    await waitProcessing(first);
    const stoppedAt = Date.now();
    services('redis-stop');
    // Accepted while Redis is away: the upload row waits as 'queued' for the worker's recovery sweep.
    // (Another lab's file: a lab's newer file of the same month would replace the first one's values.)
    const otherLab = await stack.makeLab();
    const second = await uploadFile(
      api.url,
      otherLab.labToken,
      valuesFile(stack.catalogue.lot.lotNumber, 2_000, 13),
    );
    expectedRows.set(second, 2_000);
    await sleep(2000);
    services('redis-start');
    const downMs = Date.now() - stoppedAt;

    expect(await waitStored(stack.db, first)).toBe('stored');
    expect(await waitStored(stack.db, second)).toBe('stored');
    expect(await storedRows(stack.db, first)).toBe(LARGE_ROWS);
    expect(await storedRows(stack.db, second)).toBe(2_000);
    expect(api.child.exitCode).toBeNull();
    recordFigure(
      'Redis stop/start during an upload',
      `Redis away ${(downMs / 1000).toFixed(1)} s; the running upload and one accepted meanwhile both stored once ${((Date.now() - stoppedAt) / 1000).toFixed(1)} s after the stop; API never restarted`,
    );
  });

  it(`when PostgreSQL restarts while ${READERS} readers read the peer report and an upload is stored, then the API answers 503 with Retry-After meanwhile, recovers by itself, and the upload is stored once`, async () => {
    const reader = await stack.makeReader(labA.lab.id);
    const lab = await stack.makeLab();
    const id = await uploadFile(
      api.url,
      lab.labToken,
      valuesFile(stack.catalogue.lot.lotNumber, LARGE_ROWS, 14),
    );
    expectedRows.set(id, LARGE_ROWS);

    const statuses = new Map<string, number>();
    let missingRetryAfter = 0;
    let okAfterRestart = 0;
    let restarted = false;
    let stop = false;
    const readOnce = async () => {
      try {
        const res = await fetch(`${api.url}/api/labs/${labA.lab.id}/peer-report?period=2026-02`, {
          headers: { authorization: reader },
        });
        await res.arrayBuffer();
        const key = String(res.status);
        statuses.set(key, (statuses.get(key) ?? 0) + 1);
        if (res.status === 503 && !res.headers.get('retry-after')) missingRetryAfter += 1;
        if (res.status === 200 && restarted) okAfterRestart += 1;
      } catch (error) {
        const key = `network error: ${(error as Error).message}`;
        statuses.set(key, (statuses.get(key) ?? 0) + 1);
      }
    };
    const readers = Array.from({ length: READERS }, async () => {
      while (!stop) await readOnce();
    });

    // Past 0.6 the rows are going into PostgreSQL (COPY): the restart breaks the storing transaction.
    await waitProcessing(id, 0.6);
    const failedBefore = count(worker.output(), /attempt \d+ failed/);
    const apiPid = api.child.pid;
    services('pg-stop');
    const stoppedAt = Date.now();
    await sleep(2000);
    services('pg-start');
    restarted = true;
    const downMs = Date.now() - stoppedAt;
    for (let i = 0; i < 600 && okAfterRestart < READERS; i++) await sleep(50);
    stop = true;
    await Promise.all(readers);

    expect(await waitStored(stack.db, id)).toBe('stored');
    expect(await storedRows(stack.db, id)).toBe(LARGE_ROWS);
    const unexpected = [...statuses].filter(([status]) => status !== '200' && status !== '503');
    expect(unexpected).toEqual([]);
    expect(missingRetryAfter).toBe(0);
    expect(okAfterRestart).toBeGreaterThan(0);
    expect(api.child.exitCode).toBeNull();
    expect(api.child.pid).toBe(apiPid);
    const failedAttempts = count(worker.output(), /attempt \d+ failed/) - failedBefore;
    recordFigure(
      `PostgreSQL restart under ${READERS} readers and an upload`,
      `database away ${(downMs / 1000).toFixed(1)} s; report answers ${[...statuses].map(([s, n]) => `${s}: ${n}`).join(', ')}; every 503 carried Retry-After; API recovered without a restart; the storing job failed ${failedAttempts} time(s) on the lost connection and was retried; upload of ${LARGE_ROWS.toLocaleString('en')} rows stored once`,
    );
  });

  it('when the API is killed in the middle of receiving a file, then the partial file is swept when it starts again', async () => {
    const lab = await stack.makeLab();
    const { port } = new URL(api.url);
    const socket = connect(Number(port), '127.0.0.1');
    await new Promise((resolve) => socket.once('connect', resolve));
    const boundary = 'resilience-boundary';
    socket.write(
      `POST /api/uploads HTTP/1.1\r\nHost: 127.0.0.1\r\nAuthorization: ${lab.labToken}\r\n` +
        `Content-Type: multipart/form-data; boundary=${boundary}\r\nContent-Length: 10000000\r\n\r\n` +
        `--${boundary}\r\nContent-Disposition: form-data; name="kind"\r\n\r\nqc-values\r\n` +
        `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="big.csv"\r\n\r\n` +
        valuesFile(stack.catalogue.lot.lotNumber, 500, 15),
    );
    socket.on('error', () => {});
    for (let i = 0; i < 200; i++) {
      if ((await storageLeftovers(stack.db, stack.storageDir)).partial.length) break;
      await sleep(25);
    }
    expect((await storageLeftovers(stack.db, stack.storageDir)).partial).toHaveLength(1);
    api.child.kill('SIGKILL');
    await new Promise((resolve) => api.child.once('exit', resolve));
    socket.destroy();
    await sleep(1100);
    api = await stack.startApi({ STALE_PARTIAL_MS: '1000' });
    await api.waitFor(/removed 1 partial upload file/);
    expect((await storageLeftovers(stack.db, stack.storageDir)).partial).toEqual([]);
    recordFigure('API kill -9 mid-upload', 'the partial file it left was swept when the API started again');
  });

  it('afterwards, every upload is stored exactly once, nothing is half-stored and storage holds no leftovers', async () => {
    const rows = (
      await stack.db.execute<{ id: string; status: string; rows_accepted: number }>(
        sql`select id, status, rows_accepted from uploads`,
      )
    ).rows;
    expect(rows.map((r) => r.status).sort()).toEqual(rows.map(() => 'stored'));
    for (const [id, expected] of expectedRows) {
      expect(await uploadStatus(stack.db, id)).toBe('stored');
      expect(await storedRows(stack.db, id)).toBe(expected);
    }
    // Nothing half-stored: no value rows belong to an upload that is not stored.
    const stray = await stack.db.execute<{ n: string }>(
      sql`select count(*)::text as n from qc_values v left join uploads u on u.id = v.upload_id
           where u.id is null or u.status <> 'stored'`,
    );
    expect(Number(stray.rows[0].n)).toBe(0);
    expect(await storageLeftovers(stack.db, stack.storageDir)).toEqual({ partial: [], orphans: [] });
    recordFigure(
      'after the faults',
      `${rows.length} uploads, each stored exactly once (row counts checked); no half-stored rows; no partial or orphan files`,
    );
  });
});
