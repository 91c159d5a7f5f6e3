// Benchmark of QC data ingest, against a baseline measured in the same run.
// Run with `npm run bench:ingest` (PostgreSQL at DATABASE_URL and Redis at REDIS_URL must be running).
//
//   Pipeline: 1,000,000 daily QC values of 500 labs — one qc-values file per lab (2,000 rows: 25
//   procedures × 2 levels × 40 values), as labs send them — are uploaded through the HTTP API (lab API
//   tokens, 8 uploads in flight), streamed to storage, validated, unit-checked, evaluated with the
//   multirule checks, stored with COPY, summarised per month, and the peer statistics of every group
//   recomputed. The clock stops when every upload is stored and no recompute is pending.
//   Baseline: PostgreSQL COPY of the same 1,000,000 rows (one CSV file) into a plain table without
//   indexes. Targets: ratio ≤ 2.0; the worker's peak resident memory ≤ 512 MB.
//
// Options: --labs=500 --workers=1 (worker processes) --concurrency=2 (jobs per worker) --keep (keep the
// scratch database) --single (upload the same rows as one file of one lab instead of one file per lab).
import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { createReadStream, createWriteStream, mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { once } from 'node:events';
import { pipeline } from 'node:stream/promises';
import { performance } from 'node:perf_hooks';
import { fileURLToPath } from 'node:url';
import type { AddressInfo } from 'node:net';
import { Redis } from 'ioredis';
import pg from 'pg';
import copyStreams from 'pg-copy-streams';
import { sql } from 'drizzle-orm';
import {
  analytes,
  controlLots,
  controlMaterials,
  instrumentModels,
  labApiTokens,
  labs,
  methods,
  periods,
  procedures,
  reagents,
} from '@plumbline/db';
import { createScratchDatabase, type ScratchDatabase } from '@plumbline/db/testing';
import { createApp } from '../apps/api/src/app.ts';
import { createLogger } from '@plumbline/db/logging';
import { loadEnv } from '../apps/api/src/config/env.ts';
import { LocalFileStorage } from '../apps/api/src/storage/local-storage.ts';
import { createIngestQueue } from '../apps/api/src/queues/ingest-queue.ts';
import { newLabToken } from '../apps/api/src/auth/lab-tokens.ts';

const args = new Map(process.argv.slice(2).map((a) => a.replace(/^--/, '').split('=') as [string, string]));
const LAB_COUNT = Number(args.get('labs') ?? 500);
const CONCURRENCY = Number(args.get('concurrency') ?? 2);
const WORKERS = Number(args.get('workers') ?? 1);
/** --single: the same rows as ONE file of one lab (a worst case for the worker's memory). */
const SINGLE = args.has('single');
const ANALYTES = 25;
const LEVELS = [1, 2];
const DAYS = 20;
const RUNS_PER_DAY = 2;
const ROWS_PER_LAB = ANALYTES * LEVELS.length * DAYS * RUNS_PER_DAY;
const UPLOADS_IN_FLIGHT = 8;
const PERIOD = '2026-03';
const REDIS_URL = process.env.REDIS_URL ?? 'redis://127.0.0.1:63790';
const repoRoot = fileURLToPath(new URL('../', import.meta.url));

const seconds = (ms: number) => `${(ms / 1000).toFixed(2)} s`;
const log = (message: string) => console.log(`bench:ingest: ${message}`);

/** Deterministic pseudo-random numbers (mulberry32), so every run ingests the same data. */
function random(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** One lab's qc-values file: its 25 procedures, two levels, two runs a day for 20 days. */
function labFile(labIndex: number, lotNumber: string, withHeader: boolean): string {
  const next = random(labIndex + 1);
  const lines: string[] = withHeader
    ? ['measured_at,procedure,control_lot,level,value,unit,run,comment']
    : [];
  const bias = (next() - 0.5) * 0.04;
  for (let day = 1; day <= DAYS; day++) {
    for (let run = 0; run < RUNS_PER_DAY; run++) {
      const at = `${PERIOD}-${String(day).padStart(2, '0')}T${run === 0 ? '08' : '16'}:00:00Z`;
      for (let a = 0; a < ANALYTES; a++) {
        for (const level of LEVELS) {
          const target = (a + 1) * (level === 1 ? 1 : 3);
          // Sum of uniforms: a cheap, roughly normal spread of about 2 %.
          const noise = (next() + next() + next() - 1.5) * 0.04;
          const value = target * (1 + bias + noise);
          lines.push(`${at},P${a + 1},${lotNumber},${level},${value.toFixed(4)},mmol/L,D${day}R${run + 1},`);
        }
      }
    }
  }
  return lines.join('\n') + '\n';
}

/**
 * What the run set up (scratch database, storage, queue keys, server, worker processes), undone in
 * reverse order however the run ends: normally, on an error, or on Ctrl-C / `timeout`. Without it a
 * failed run left its worker process running (connected to the scratch database, possibly in the
 * middle of a COPY) and the scratch database behind.
 */
const cleanups: (() => unknown)[] = [];
let cleaning: Promise<void> | null = null;
function cleanUp(): Promise<void> {
  cleaning ??= (async () => {
    for (const undo of cleanups.reverse()) {
      try {
        await undo();
      } catch (error) {
        log(`cleanup: ${(error as Error).message}`);
      }
    }
  })();
  return cleaning;
}
// `on`, not `once`: under `timeout` or Ctrl-C the signal can arrive twice (to the process group and
// relayed by tsx), and without a listener the second one would end the process in the middle of cleaning up.
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    if (cleaning) return;
    log(`${signal} received: cleaning up`);
    void cleanUp().finally(() => process.exit(130));
  });
}

const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/** Stops a worker process: SIGTERM (it finishes running jobs, up to 30 s), then SIGKILL. */
async function stopProcess(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const exited = once(child, 'exit');
  child.kill('SIGTERM');
  if ((await Promise.race([exited.then(() => true), sleep(35_000).then(() => false)])) === false) {
    child.kill('SIGKILL');
    await exited;
  }
}

/** Drops the scratch database; if its pool does not close in time (a stuck query), drops it by force. */
async function dropScratch(scratch: ScratchDatabase): Promise<void> {
  const dropped = scratch.drop().then(() => true);
  if (await Promise.race([dropped, sleep(15_000).then(() => false)])) return;
  const url = new URL(scratch.url);
  const name = url.pathname.slice(1);
  url.pathname = '/postgres';
  const admin = new pg.Client({ connectionString: url.toString() });
  await admin.connect();
  try {
    await admin.query(`drop database if exists "${name}" with (force)`);
  } finally {
    await admin.end();
  }
}

async function main() {
  log(`setting up a scratch database with ${LAB_COUNT} labs × ${ANALYTES} procedures`);
  const scratch = await createScratchDatabase('bench');
  scratch.pool.on('error', () => {}); // dropping the database at the end ends its connections
  cleanups.push(() =>
    args.has('keep') ? log(`scratch database kept: ${scratch.url}`) : dropScratch(scratch),
  );
  const storageDir = mkdtempSync(join(tmpdir(), 'plumbline-bench-'));
  cleanups.push(() => rmSync(storageDir, { recursive: true, force: true }));
  const queuePrefix = `plumbline-bench-${randomBytes(4).toString('hex')}`;
  const redis = new Redis(REDIS_URL, { maxRetriesPerRequest: null });
  cleanups.push(async () => {
    let cursor = '0';
    do {
      const [next, keys] = await redis.scan(cursor, 'MATCH', `${queuePrefix}:*`, 'COUNT', 500);
      if (keys.length) await redis.del(...keys);
      cursor = next;
    } while (cursor !== '0');
    redis.disconnect();
  });
  const db = scratch.db;

  // Catalogue: invented names; one control lot with two levels.
  const [material] = await db
    .insert(controlMaterials)
    .values({ code: 'BENCH-CM', name: 'Bench control material' })
    .returning();
  const [lot] = await db
    .insert(controlLots)
    .values({ materialId: material.id, lotNumber: 'BENCH-LOT-1', levels: LEVELS, expiresOn: '2027-12-31' })
    .returning();
  await db
    .insert(periods)
    .values({ period: PERIOD, state: 'open', deadline: new Date('2026-04-10T23:59:00Z') })
    .onConflictDoNothing();
  const analyteRows = await db
    .insert(analytes)
    .values(
      Array.from({ length: ANALYTES }, (_, i) => ({
        code: `BA${i + 1}`,
        name: `Bench analyte ${i + 1}`,
        unit: 'mmol/L',
        molarMass: 100 + i,
      })),
    )
    .returning();
  const methodRows = await db
    .insert(methods)
    .values([1, 2, 3].map((i) => ({ code: `BM${i}`, name: `Bench method ${i}` })))
    .returning();
  const modelRows = await db
    .insert(instrumentModels)
    .values([1, 2, 3, 4].map((i) => ({ code: `BI${i}`, name: `Bench analyser ${i}` })))
    .returning();
  const reagentRows = await db
    .insert(reagents)
    .values([1, 2].map((i) => ({ code: `BR${i}`, name: `Bench reagent ${i}` })))
    .returning();
  const labRows = await db
    .insert(labs)
    .values(
      Array.from({ length: LAB_COUNT }, (_, i) => ({
        code: `B${String(i + 1).padStart(4, '0')}`,
        name: `Bench lab ${i + 1}`,
      })),
    )
    .returning();
  const procedureValues = labRows.flatMap((lab, l) =>
    analyteRows.map((analyte, a) => ({
      labId: lab.id,
      code: `P${a + 1}`,
      analyteId: analyte.id,
      instrumentModelId: modelRows[l % modelRows.length].id,
      methodId: methodRows[(l + a) % methodRows.length].id,
      reagentId: reagentRows[l % reagentRows.length].id,
      unit: 'mmol/L',
    })),
  );
  for (let i = 0; i < procedureValues.length; i += 2000)
    await db.insert(procedures).values(procedureValues.slice(i, i + 2000));
  const tokens = labRows.map(() => newLabToken());
  await db.insert(labApiTokens).values(
    labRows.map((lab, i) => ({
      labId: lab.id,
      name: 'bench',
      prefix: tokens[i].prefix,
      tokenHash: tokens[i].tokenHash,
    })),
  );

  // The same rows as one file, for the COPY baseline.
  const combinedPath = join(storageDir, 'combined.csv');
  const combined = createWriteStream(combinedPath);
  for (let l = 0; l < LAB_COUNT; l++) {
    if (!combined.write(labFile(l, lot.lotNumber, l === 0))) await once(combined, 'drain');
  }
  combined.end();
  await once(combined, 'finish');
  const totalRows = LAB_COUNT * ROWS_PER_LAB;
  log(
    `generated ${totalRows.toLocaleString('en')} rows (${(statSync(combinedPath).size / 1e6).toFixed(1)} MB as one file)`,
  );

  // The API in this process, the worker as its own process (its memory is measured alone).
  const env = loadEnv({
    ...process.env,
    NODE_ENV: 'test',
    DATABASE_URL: scratch.url,
    STORAGE_DIR: join(storageDir, 'files'),
    QUEUE_PREFIX: queuePrefix,
    S3_BUCKET: '',
  });
  const ingestQueue = createIngestQueue(redis, queuePrefix);
  cleanups.push(() => ingestQueue.close());
  const app = createApp({
    env,
    db,
    redis,
    storage: new LocalFileStorage(env.STORAGE_DIR),
    ingestQueue,
    // The request log would drown the figures; the bench prints what it measures itself.
    logger: createLogger('api', { level: process.env.BENCH_DEBUG ? 'info' : 'silent' }),
  });
  const server = app.listen(0, '127.0.0.1');
  cleanups.push(() => {
    server.closeAllConnections();
    server.close();
  });
  await once(server, 'listening');
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

  // The worker's heap budget, as `npm start -w @plumbline/worker` sets it (docs/operations.md).
  const nodeArgs = (process.env.BENCH_WORKER_NODE_ARGS ?? '--max-old-space-size=384')
    .split(' ')
    .filter(Boolean);
  const workers = Array.from({ length: WORKERS }, () => {
    const child = spawn(
      process.execPath,
      [...nodeArgs, '--import', 'tsx', join(repoRoot, 'apps/worker/src/main.ts')],
      {
        cwd: repoRoot,
        env: {
          ...process.env,
          NODE_ENV: 'production',
          DATABASE_URL: scratch.url,
          REDIS_URL,
          QUEUE_PREFIX: queuePrefix,
          STORAGE_DIR: env.STORAGE_DIR,
          S3_BUCKET: '',
          INGEST_CONCURRENCY: String(CONCURRENCY),
        },
        stdio: ['ignore', 'pipe', 'inherit'],
      },
    );
    const state = { child, output: '' };
    child.stdout!.on('data', (d: Buffer) => {
      state.output += d.toString();
      if (process.env.BENCH_DEBUG) process.stdout.write(d);
    });
    return state;
  });
  // Registered before anything can fail, so the processes never outlive the run.
  cleanups.push(() => Promise.all(workers.map((w) => stopProcess(w.child))));
  const workerOutput = () => workers.map((w) => w.output).join('\n');
  for (const w of workers) {
    while (!/"name":"worker"[^\n]*"msg":"ready/.test(w.output)) {
      if (w.child.exitCode !== null) throw new Error(`worker exited:\n${w.output}`);
      await new Promise((r) => setTimeout(r, 50));
    }
  }
  const fileCount = SINGLE ? 1 : LAB_COUNT;
  log(
    SINGLE
      ? `uploading the rows as one file of one lab through the API (${WORKERS} worker process(es))`
      : `uploading ${LAB_COUNT} files through the API (${UPLOADS_IN_FLIGHT} in flight; ${WORKERS} worker process(es), ${CONCURRENCY} jobs each)`,
  );
  const started = performance.now();
  let nextLab = 0;
  async function uploader() {
    while (nextLab < LAB_COUNT) {
      const l = nextLab++;
      const form = new FormData();
      form.set('kind', 'qc-values');
      form.set('file', new Blob([labFile(l, lot.lotNumber, true)], { type: 'text/csv' }), `lab-${l + 1}.csv`);
      const res = await fetch(`${baseUrl}/api/uploads`, {
        method: 'POST',
        headers: { Authorization: `Bearer ${tokens[l].token}` },
        body: form,
      });
      if (res.status !== 202) throw new Error(`upload ${l} answered ${res.status}: ${await res.text()}`);
      await res.arrayBuffer();
    }
  }
  if (SINGLE) {
    // The combined file uses lab 1's procedure codes throughout, so it is a valid file of lab 1.
    const form = new FormData();
    form.set('kind', 'qc-values');
    form.set('file', new Blob([readFileSync(combinedPath)], { type: 'text/csv' }), 'one-lab.csv');
    const res = await fetch(`${baseUrl}/api/uploads`, {
      method: 'POST',
      headers: { Authorization: `Bearer ${tokens[0].token}` },
      body: form,
    });
    if (res.status !== 202) throw new Error(`upload answered ${res.status}: ${await res.text()}`);
  } else {
    await Promise.all(Array.from({ length: UPLOADS_IN_FLIGHT }, uploader));
  }
  const uploadedAt = performance.now();

  let storedAt = 0;
  while (true) {
    const { rows } = await scratch.pool.query<{ stored: number; failed: number; pending: number }>(
      `select count(*) filter (where status = 'stored')::int as stored,
              count(*) filter (where status in ('failed', 'needs-review', 'cancelled'))::int as failed,
              (select count(*)::int from peer_statistics_requests) as pending
         from uploads`,
    );
    const { stored, failed, pending } = rows[0];
    if (failed > 0) throw new Error(`${failed} upload(s) did not store:\n${workerOutput()}`);
    if (workers.some((w) => w.child.exitCode !== null || w.child.signalCode !== null))
      throw new Error(`a worker process exited during the run:\n${workerOutput()}`);
    if (stored === fileCount && !storedAt) storedAt = performance.now();
    if (stored === fileCount && pending === 0) break;
    await new Promise((r) => setTimeout(r, 100));
  }
  const finished = performance.now();
  const cpuSeconds = workers.map((w) => {
    const [utime, stime] = readFileSync(`/proc/${w.child.pid}/stat`, 'utf8')
      .split(') ')[1]
      .split(' ')
      .slice(11, 13)
      .map(Number);
    return (utime + stime) / 100;
  });
  const peakRssKb = Math.max(
    ...workers.map((w) =>
      Number(/VmHWM:\s+(\d+)/.exec(readFileSync(`/proc/${w.child.pid}/status`, 'utf8'))?.[1] ?? NaN),
    ),
  );

  const check = await db.execute<{ values: number; summaries: number; statistics: number }>(sql`
    select (select count(*)::int from qc_values) as "values", (select count(*)::int from qc_summaries) as summaries,
           (select count(*)::int from peer_statistics) as statistics`);
  const counts = check.rows[0];
  if (counts.values !== totalRows)
    throw new Error(`expected ${totalRows} stored values, found ${counts.values}`);

  // Baseline: COPY of the same rows into a plain table, in the same run.
  await scratch.pool
    .query(`create table bench_copy (measured_at timestamptz, procedure text, control_lot text, level int,
    value double precision, unit text, run text, comment text)`);
  const client = await scratch.pool.connect();
  let copyMs: number;
  try {
    const copyStarted = performance.now();
    await pipeline(
      createReadStream(combinedPath),
      client.query(copyStreams.from('COPY bench_copy FROM STDIN WITH (FORMAT csv, HEADER true)')),
    );
    copyMs = performance.now() - copyStarted;
    client.release();
  } catch (error) {
    client.release(error as Error); // the connection is closed: a COPY cut short must not stay open
    throw error;
  }
  const [{ n: copied }] = (
    await scratch.pool.query<{ n: number }>('select count(*)::int as n from bench_copy')
  ).rows;
  if (copied !== totalRows) throw new Error(`COPY loaded ${copied} rows, expected ${totalRows}`);

  const pipelineMs = finished - started;
  console.log('');
  console.log(
    `  rows                               ${totalRows.toLocaleString('en')} (${SINGLE ? 'one file of one lab' : `${LAB_COUNT} files of ${ROWS_PER_LAB}`})`,
  );
  console.log(`  uploads accepted (HTTP 202)        ${seconds(uploadedAt - started)}`);
  console.log(`  every upload stored                ${seconds(storedAt - started)}`);
  console.log(
    `  peer statistics recomputed         ${seconds(pipelineMs)}  (${counts.summaries.toLocaleString('en')} monthly summaries, ${counts.statistics.toLocaleString('en')} peer statistic rows)`,
  );
  console.log(`  PostgreSQL COPY, same rows         ${seconds(copyMs)}`);
  console.log(`  ratio pipeline / COPY              ${(pipelineMs / copyMs).toFixed(2)}  (target ≤ 2.0)`);
  console.log(
    `  worker peak RSS                    ${(peakRssKb / 1024).toFixed(0)} MB  (target ≤ 512 MB; the largest of ${WORKERS} process(es))`,
  );
  console.log(
    `  worker CPU time                    ${cpuSeconds.map((c) => `${c.toFixed(1)} s`).join(' + ')}`,
  );
  console.log('');
}

try {
  await main();
} finally {
  await cleanUp();
}
