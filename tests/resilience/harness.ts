import { spawn, execFileSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { once } from 'node:events';
import { createServer, type AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Redis } from 'ioredis';
import { sql } from 'drizzle-orm';
import { labApiTokens, type Database } from '@plumbline/db';
import { createQcCatalogue, createScratchDatabase, type QcCatalogue } from '@plumbline/db/testing';
import { signSession } from '../../apps/api/src/auth/jwt.ts';
import { newLabToken } from '../../apps/api/src/auth/lab-tokens.ts';

/**
 * The fault and load tests run the API and the worker as real processes (the worker under the same
 * supervisor `npm start` uses) against PostgreSQL and Redis that the tests stop and start. They need
 * services of their own: `npm run test:resilience` starts throwaway ones.
 */
export const repoRoot = fileURLToPath(new URL('../../', import.meta.url));
const servicesScript = join(repoRoot, 'scripts/services.sh');

/** The worker's JSON log line that says it is ready. */
export const WORKER_READY = /"name":"worker"[^\n]*"msg":"ready/;

export const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/** Runs `scripts/services.sh <command>` for the services this run uses (PG_PORT, REDIS_PORT). */
export function services(command: 'pg-stop' | 'pg-start' | 'redis-stop' | 'redis-start'): void {
  execFileSync('bash', [servicesScript, command], { stdio: ['ignore', 'ignore', 'inherit'] });
}

async function freePort(): Promise<number> {
  const probe = createServer();
  probe.listen(0, '127.0.0.1');
  await once(probe, 'listening');
  const { port } = probe.address() as AddressInfo;
  probe.close();
  await once(probe, 'close');
  return port;
}

export type Proc = {
  child: ChildProcess;
  output: () => string;
  waitFor: (pattern: RegExp, timeoutMs?: number) => Promise<void>;
  stop: () => Promise<void>;
};

function run(command: string, args: string[], env: Record<string, string>): Proc {
  const child = spawn(command, args, {
    cwd: repoRoot,
    env: { ...process.env, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let output = '';
  const append = (d: Buffer) => {
    output += d.toString();
    if (process.env.RESILIENCE_DEBUG) process.stderr.write(d);
  };
  child.stdout!.on('data', append);
  child.stderr!.on('data', append);
  const exited = once(child, 'exit');
  return {
    child,
    output: () => output,
    async waitFor(pattern, timeoutMs = 60_000) {
      const deadline = Date.now() + timeoutMs;
      while (!pattern.test(output)) {
        if (child.exitCode !== null)
          throw new Error(`process exited while waiting for ${pattern}:\n${output}`);
        if (Date.now() > deadline) throw new Error(`timed out waiting for ${pattern}:\n${output}`);
        await sleep(50);
      }
    },
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null) return;
      child.kill('SIGTERM');
      const done = await Promise.race([exited.then(() => true), sleep(40_000).then(() => false)]);
      if (!done) {
        child.kill('SIGKILL');
        await exited;
      }
    },
  };
}

/** The ids of a process's children (the supervised process of a supervisor). */
export function childPids(pid: number): number[] {
  try {
    return execFileSync('ps', ['-o', 'pid=', '--ppid', String(pid)], { encoding: 'utf8' })
      .split('\n')
      .map((s) => Number(s.trim()))
      .filter((n) => n > 0);
  } catch {
    return [];
  }
}

const tsxArgs = ['--import', 'tsx'];

/**
 * A scratch database with an invented catalogue, storage, a queue prefix and the settings both
 * processes share; `close` undoes all of it.
 */
export async function createStack(label: string) {
  const scratch = await createScratchDatabase(label);
  scratch.pool.on('error', () => {}); // the tests restart PostgreSQL under this pool
  const catalogue = await createQcCatalogue(scratch.db);
  const storageDir = mkdtempSync(join(tmpdir(), `plumbline-${label}-`));
  const queuePrefix = `plumbline-${label}-${randomBytes(4).toString('hex')}`;
  const jwtSecret = randomBytes(32).toString('hex');
  const redisUrl = process.env.REDIS_URL ?? 'redis://127.0.0.1:63790';
  const shared = {
    NODE_ENV: 'test',
    // The processes log JSON lines (silent under test unless asked); their start-up lines are awaited.
    LOG_LEVEL: 'info',
    DATABASE_URL: scratch.url,
    REDIS_URL: redisUrl,
    QUEUE_PREFIX: queuePrefix,
    STORAGE_DIR: storageDir,
    S3_BUCKET: '',
    JWT_SECRET: jwtSecret,
  };
  const procs: Proc[] = [];

  async function startApi(env: Record<string, string> = {}) {
    const port = await freePort();
    const api = run(process.execPath, [...tsxArgs, 'apps/api/src/main.ts'], {
      ...shared,
      PORT: String(port),
      HOST: '127.0.0.1',
      WEB_DIST_DIR: join(storageDir, 'no-web-app'),
      ...env,
    });
    procs.push(api);
    await api.waitFor(/"msg":"listening on /);
    return { ...api, url: `http://127.0.0.1:${port}` };
  }

  /** The worker under scripts/supervise.sh at a lower CPU priority, as `npm start` runs it. */
  async function startSupervisedWorker(env: Record<string, string> = {}) {
    const worker = run(
      'nice',
      [
        '-n',
        process.env.WORKER_NICE ?? '10',
        'bash',
        'scripts/supervise.sh',
        'worker',
        process.execPath,
        ...tsxArgs,
        'apps/worker/src/main.ts',
      ],
      {
        ...shared,
        // Quick to notice a dead worker's job and the uploads a lost queue forgot, so tests stay short.
        INGEST_LOCK_MS: '5000',
        INGEST_STALLED_CHECK_MS: '2000',
        RECOVERY_INTERVAL_MS: '3000',
        PEER_RECOMPUTE_DELAY_MS: '200',
        SUPERVISE_MAX_DELAY: '2',
        ...env,
      },
    );
    procs.push(worker);
    await worker.waitFor(WORKER_READY);
    return worker;
  }

  async function makeLab(procedureCodes = ['GLU1', 'CREA1']) {
    const { lab, procedures } = await catalogue.makeLabWithProcedures(
      procedureCodes.map((code) => ({
        code,
        analyte: code.startsWith('CREA') ? catalogue.analytes.creatinine : catalogue.analytes.glucose,
      })),
    );
    const token = newLabToken();
    await scratch.db
      .insert(labApiTokens)
      .values({ labId: lab.id, name: 'resilience', prefix: token.prefix, tokenHash: token.tokenHash });
    return { lab, procedures, labToken: `Bearer ${token.token}` };
  }

  /** A signed session for an invented reader of a lab (no user row is needed for the token to verify). */
  async function makeReader(labId: string) {
    const { users } = await import('@plumbline/db');
    const [user] = await scratch.db
      .insert(users)
      .values({
        email: `reader-${randomBytes(4).toString('hex')}@test.example`,
        name: 'Test reader',
        role: 'analyst',
        labId,
        passwordHash: 'not-used',
      })
      .returning();
    return `Bearer ${signSession(user, jwtSecret, 3600).token}`;
  }

  async function close() {
    for (const p of procs.reverse()) await p.stop();
    const redis = new Redis(redisUrl, { maxRetriesPerRequest: 1 });
    let cursor = '0';
    do {
      const [next, keys] = await redis.scan(cursor, 'MATCH', `${queuePrefix}:*`, 'COUNT', 500);
      if (keys.length) await redis.del(...keys);
      cursor = next;
    } while (cursor !== '0');
    redis.disconnect();
    await scratch.drop();
    rmSync(storageDir, { recursive: true, force: true });
  }

  return {
    db: scratch.db,
    catalogue,
    storageDir,
    startApi,
    startSupervisedWorker,
    makeLab,
    makeReader,
    close,
  };
}
export type Stack = Awaited<ReturnType<typeof createStack>>;

/**
 * A qc-values file of `rows` rows for the procedures GLU1 and CREA1, two levels, in February 2026,
 * one value every three minutes per procedure and level. Values are invented.
 */
export function valuesFile(lotNumber: string, rows: number, seed = 1): string {
  const lines = ['measured_at,procedure,control_lot,level,value,unit,run,comment'];
  const series = [
    { procedure: 'GLU1', level: 1, target: 5.5, unit: 'mmol/L' },
    { procedure: 'GLU1', level: 2, target: 16.5, unit: 'mmol/L' },
    { procedure: 'CREA1', level: 1, target: 90, unit: 'umol/L' },
    { procedure: 'CREA1', level: 2, target: 450, unit: 'umol/L' },
  ];
  const start = Date.UTC(2026, 1, 1);
  let state = seed >>> 0;
  const next = () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 4294967296;
  };
  for (let i = 0; i < rows; i++) {
    const s = series[i % series.length];
    const at = new Date(start + Math.floor(i / series.length) * 180_000).toISOString();
    const value = s.target * (1 + (next() + next() + next() - 1.5) * 0.04);
    lines.push(`${at},${s.procedure},${lotNumber},${s.level},${value.toFixed(3)},${s.unit},,`);
  }
  return lines.join('\n') + '\n';
}

/** Sends a file as a lab would (multipart, lab API token). */
export async function uploadFile(apiUrl: string, labToken: string, content: string, name = 'qc.csv') {
  const form = new FormData();
  form.set('kind', 'qc-values');
  form.set('file', new Blob([content], { type: 'text/csv' }), name);
  const res = await fetch(`${apiUrl}/api/uploads`, {
    method: 'POST',
    headers: { authorization: labToken },
    body: form,
  });
  const body = (await res.json()) as { id?: string };
  if (res.status !== 202 || !body.id)
    throw new Error(`upload answered ${res.status}: ${JSON.stringify(body)}`);
  return body.id;
}

/** Waits (polling PostgreSQL) until the upload is stored or finally failed; returns its status. */
export async function waitStored(db: Database, uploadId: string, timeoutMs = 240_000) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const status = await uploadStatus(db, uploadId).catch(() => null);
    if (status === 'stored' || status === 'failed' || status === 'needs-review') return status;
    await sleep(200);
  }
  throw new Error(`upload ${uploadId} was not stored within ${timeoutMs} ms`);
}

export async function uploadStatus(db: Database, uploadId: string): Promise<string | null> {
  const result = await db.execute<{ status: string }>(sql`select status from uploads where id = ${uploadId}`);
  return result.rows[0]?.status ?? null;
}

/** Rows of qc_values that came from an upload (a file stored twice would show twice as many). */
export async function storedRows(db: Database, uploadId: string): Promise<number> {
  const result = await db.execute<{ n: string }>(
    sql`select count(*)::text as n from qc_values where upload_id = ${uploadId}`,
  );
  return Number(result.rows[0].n);
}

/**
 * What storage holds that it should not: partial files, and files no upload row points to. A deleted
 * upload (cancelled) may have removed its file; the reverse — a file without a row — is an orphan.
 */
export async function storageLeftovers(db: Database, storageDir: string) {
  const files = readdirSync(storageDir, { recursive: true, withFileTypes: true })
    .filter((e) => e.isFile())
    .map((e) => join(e.parentPath, e.name).slice(storageDir.length + 1));
  const keys = new Set(
    (await db.execute<{ storage_key: string }>(sql`select storage_key from uploads`)).rows.map(
      (r) => r.storage_key,
    ),
  );
  return {
    partial: files.filter((f) => f.endsWith('.partial')),
    orphans: files.filter((f) => !f.endsWith('.partial') && !keys.has(f)),
  };
}

export type QcNetwork = QcCatalogue;
