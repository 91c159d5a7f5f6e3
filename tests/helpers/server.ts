import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { randomBytes } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Redis } from 'ioredis';
import { createScratchDatabase, type ScratchDatabase } from '@plumbline/db/testing';
import { createApp } from '../../apps/api/src/app.ts';
import { loadEnv, type Env } from '../../apps/api/src/config/env.ts';
import { LocalFileStorage } from '../../apps/api/src/storage/local-storage.ts';
import { createIngestQueue } from '../../apps/api/src/queues/ingest-queue.ts';
import { startIngestWorker } from '../../apps/worker/src/queues/ingest.queue.ts';
import { LocalFileSource } from '../../apps/worker/src/storage/file-source.ts';

export const WEB_DIST = fileURLToPath(new URL('../../apps/web/dist', import.meta.url));

/**
 * The API (serving the built web app) on a random loopback port, backed by a fresh scratch database.
 * `prepare` runs against the database before the server starts (e.g. seeding the demo network).
 */
export async function startServer(
  label: string,
  prepare?: (scratch: ScratchDatabase) => Promise<void>,
  extraEnv: Record<string, string> = {},
) {
  if (!existsSync(`${WEB_DIST}/index.html`)) {
    throw new Error(
      `The web app is not built (${WEB_DIST}/index.html missing): run npm test, or npm run build first.`,
    );
  }
  const scratch = await createScratchDatabase(label);
  if (prepare) await prepare(scratch);
  // Own storage directory and queue prefix: browser tests never share files or jobs with other tests.
  const storageDir = mkdtempSync(join(tmpdir(), `plumbline-e2e-${label.replace(/[^a-z0-9]/gi, '')}-`));
  const queuePrefix = `plumbline-e2e-${label.replace(/[^a-z0-9]/gi, '')}-${randomBytes(4).toString('hex')}`;
  const env: Env = loadEnv({
    ...process.env,
    NODE_ENV: 'test',
    DATABASE_URL: scratch.url,
    JWT_SECRET: randomBytes(32).toString('hex'),
    WEB_DIST_DIR: WEB_DIST,
    STORAGE_DIR: storageDir,
    QUEUE_PREFIX: queuePrefix,
    S3_BUCKET: '',
    ...extraEnv,
  });
  const redis = new Redis(env.REDIS_URL, { maxRetriesPerRequest: null });
  const ingestQueue = createIngestQueue(redis, queuePrefix);
  const storage = new LocalFileStorage(storageDir);
  const app = createApp({ env, db: scratch.db, redis, storage, ingestQueue });
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const { port } = server.address() as AddressInfo;
  return {
    url: `http://127.0.0.1:${port}`,
    env,
    scratch,
    db: scratch.db,
    storageDir,
    queuePrefix,
    close: async () => {
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await ingestQueue.close().catch(() => {});
      redis.disconnect();
      await scratch.drop();
      rmSync(storageDir, { recursive: true, force: true });
    },
  };
}

/**
 * `startServer` plus the ingest worker on the same scratch database, storage directory and queue
 * prefix, all in this process: what a browser test of an upload journey needs.
 */
export async function startUploadStack(
  label: string,
  prepare?: (scratch: ScratchDatabase) => Promise<void>,
  options: { holdBeforeCommitMs?: number } = {},
) {
  const server = await startServer(label, prepare);
  const workerConnection = new Redis(server.env.REDIS_URL, { maxRetriesPerRequest: null });
  const worker = startIngestWorker(
    {
      db: server.db,
      pool: server.scratch.pool,
      files: new LocalFileSource(server.storageDir),
      minLabs: 3,
      holdBeforeCommitMs: options.holdBeforeCommitMs,
    },
    { connection: workerConnection, prefix: server.queuePrefix, concurrency: 1, recoveryIntervalMs: 0 },
  );
  return {
    ...server,
    close: async () => {
      await worker.close().catch(() => {});
      workerConnection.disconnect();
      await server.close();
    },
  };
}
