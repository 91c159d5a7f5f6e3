import { Redis } from 'ioredis';
import { randomBytes, randomUUID, createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { eq } from 'drizzle-orm';
import { ingestJobId, type ColumnMapping, type UploadKind } from '@plumbline/contracts';
import { hasPendingPeerStatistics, uploads, type Database } from '@plumbline/db';
import { createScratchDatabase, createQcCatalogue, type ScratchDatabase } from '@plumbline/db/testing';
import { LocalFileSource } from '../storage/file-source.ts';
import { startIngestWorker, type IngestWorker } from '../queues/ingest.queue.ts';

export const REDIS_URL = process.env.REDIS_URL ?? 'redis://127.0.0.1:63790';

/**
 * A scratch database with a small QC catalogue, a storage directory, and a real BullMQ queue on Redis
 * under a prefix of its own. `startWorker` runs the ingest worker in this process.
 */
export async function createWorkerHarness(label: string) {
  const scratch: ScratchDatabase = await createScratchDatabase(label);
  const storageDir = mkdtempSync(join(tmpdir(), `plumbline-worker-${label}-`));
  const prefix = `plumbline-test-${label}-${randomBytes(4).toString('hex')}`;
  const connection = new Redis(REDIS_URL, { maxRetriesPerRequest: null });
  const catalogue = await createQcCatalogue(scratch.db);
  let worker: IngestWorker | null = null;

  function startWorker(options: { holdBeforeCommitMs?: number; stalledIntervalMs?: number } = {}) {
    worker = startIngestWorker(
      {
        db: scratch.db,
        pool: scratch.pool,
        files: new LocalFileSource(storageDir),
        minLabs: 3,
        holdBeforeCommitMs: options.holdBeforeCommitMs,
        log: process.env.PLUMBLINE_TEST_LOG ? (m: string) => console.log(m) : undefined,
      },
      {
        connection,
        prefix,
        concurrency: 2,
        recoveryIntervalMs: 0,
        stalledIntervalMs: options.stalledIntervalMs,
        recomputeDelayMs: 20,
      },
    );
    return worker;
  }

  /** Writes a file to storage and records an upload for it, as the API does; enqueue with `enqueue`. */
  async function addUpload(input: {
    labId: string;
    kind: UploadKind;
    content: string | Buffer;
    mapping?: ColumnMapping;
    filename?: string;
  }): Promise<string> {
    const id = randomUUID();
    const key = `uploads/test/${id}`;
    const body = typeof input.content === 'string' ? Buffer.from(input.content, 'utf8') : input.content;
    mkdirSync(dirname(join(storageDir, key)), { recursive: true });
    writeFileSync(join(storageDir, key), body);
    await scratch.db.insert(uploads).values({
      id,
      labId: input.labId,
      kind: input.kind,
      filename: input.filename ?? `${input.kind}.csv`,
      size: body.length,
      sha256: createHash('sha256').update(body).digest('hex'),
      storageKey: key,
      columnMapping: input.mapping ?? null,
    });
    return id;
  }

  async function enqueue(uploadId: string, phase: 'initial' | 'confirmed' = 'initial') {
    const queue = worker?.queue;
    if (!queue) throw new Error('start the worker first');
    await queue.add(
      'ingest',
      { uploadId },
      { jobId: ingestJobId(uploadId, phase), removeOnComplete: true, removeOnFail: true, attempts: 1 },
    );
  }

  /** Polls PostgreSQL until the upload reaches one of the statuses. */
  async function waitForStatus(uploadId: string, statuses: string[], timeoutMs = 20_000) {
    const started = Date.now();
    while (Date.now() - started < timeoutMs) {
      const [row] = await scratch.db.select().from(uploads).where(eq(uploads.id, uploadId));
      if (row && statuses.includes(row.status)) return row;
      await new Promise((r) => setTimeout(r, 50));
    }
    const [row] = await scratch.db.select().from(uploads).where(eq(uploads.id, uploadId));
    throw new Error(`upload ${uploadId} stayed ${row?.status} (waited for ${statuses.join('/')})`);
  }

  /** Waits until every requested peer statistic is recomputed. */
  async function waitForPeerStatistics(timeoutMs = 20_000) {
    const started = Date.now();
    while (Date.now() - started < timeoutMs) {
      await worker?.drainer.idle();
      if (!(await hasPendingPeerStatistics(scratch.db))) return;
      await new Promise((r) => setTimeout(r, 25));
    }
    throw new Error('peer statistics were not recomputed in time');
  }

  async function close() {
    await worker?.close().catch(() => {});
    // The queue's keys live under this harness's own prefix: remove them all.
    let cursor = '0';
    do {
      const [next, keys] = await connection.scan(cursor, 'MATCH', `${prefix}:*`, 'COUNT', 500);
      if (keys.length) await connection.del(...keys);
      cursor = next;
    } while (cursor !== '0');
    connection.disconnect();
    await scratch.drop();
    rmSync(storageDir, { recursive: true, force: true });
  }

  return {
    db: scratch.db as Database,
    pool: scratch.pool,
    url: scratch.url,
    storageDir,
    prefix,
    catalogue,
    startWorker,
    addUpload,
    enqueue,
    waitForStatus,
    waitForPeerStatistics,
    close,
  };
}
export type WorkerHarness = Awaited<ReturnType<typeof createWorkerHarness>>;
