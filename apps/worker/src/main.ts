import { Redis } from 'ioredis';
import { createDb } from '@plumbline/db';
import { createLogger } from '@plumbline/db/logging';
import { loadWorkerEnv } from './config/env.ts';
import { createFileSource } from './storage/file-source.ts';
import { startIngestWorker } from './queues/ingest.queue.ts';

const env = loadWorkerEnv();
const { db, pool } = createDb(env.DATABASE_URL);
const connection = new Redis(env.REDIS_URL, { maxRetriesPerRequest: null });
const logger = createLogger('worker');
const log = (message: string) => logger.info(message);

const ingest = startIngestWorker(
  {
    db,
    pool,
    files: createFileSource(env),
    minLabs: env.PEER_MIN_LABS,
    holdBeforeCommitMs: env.INGEST_HOLD_BEFORE_COMMIT_MS,
    log,
  },
  {
    connection,
    prefix: env.QUEUE_PREFIX,
    concurrency: env.INGEST_CONCURRENCY,
    recoveryIntervalMs: env.RECOVERY_INTERVAL_MS,
    recomputeDelayMs: env.PEER_RECOMPUTE_DELAY_MS,
    recomputeMaxWaitMs: env.PEER_RECOMPUTE_MAX_WAIT_MS,
    lockDurationMs: env.INGEST_LOCK_MS,
    stalledIntervalMs: env.INGEST_STALLED_CHECK_MS,
  },
);

const recovered = await ingest.recover();
log(
  `ready (queue prefix ${env.QUEUE_PREFIX}, concurrency ${env.INGEST_CONCURRENCY}; ${recovered} upload(s) re-enqueued)`,
);

let stopping = false;
async function shutdown(signal: string) {
  if (stopping) return;
  stopping = true;
  log(`${signal} received: finishing running jobs, then stopping`);
  // A job cut short here is rolled back by PostgreSQL and picked up again on the next start.
  const deadline = setTimeout(() => process.exit(1), 30_000);
  deadline.unref();
  await ingest.close().catch((error: Error) => log(`closing: ${error.message}`));
  await Promise.allSettled([pool.end(), connection.quit()]);
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));
