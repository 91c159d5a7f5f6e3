import { Redis } from 'ioredis';
import { createDb, thresholds } from '@plumbline/db';
import { createLogger } from '@plumbline/db/logging';
import { loadWorkerEnv } from './config/env.ts';
import { createFileSource } from './storage/file-source.ts';
import { startIngestWorker } from './queues/ingest.queue.ts';
import { installProcessGuards } from './process-guards.ts';
import { startStudyWorker } from './queues/study.queue.ts';

installProcessGuards('worker');
const env = loadWorkerEnv();
// Read now, so a bad threshold setting stops the worker at start-up.
const limits = thresholds();
const { db, pool } = createDb(env.DATABASE_URL, { max: env.DB_POOL_MAX });
const connection = new Redis(env.REDIS_URL, {
  maxRetriesPerRequest: null,
  // Reconnect after a Redis restart with backoff: 100 ms, 200 ms, … at most 5 s between attempts.
  retryStrategy: (times) => Math.min(100 * 2 ** Math.min(times, 6), 5000),
});
const logger = createLogger('worker');
const log = (message: string) => logger.info(message);
let lastRedisError = '';
connection.on('error', (error: Error) => {
  if (error.message === lastRedisError) return; // one line per kind of failure, not one per retry
  lastRedisError = error.message;
  log(`redis: ${error.message} (reconnecting)`);
});
connection.on('ready', () => {
  if (lastRedisError) log('redis: connected again');
  lastRedisError = '';
});

const ingest = startIngestWorker(
  {
    db,
    pool,
    files: createFileSource(env),
    minLabs: limits.peerMinLabs,
    holdBeforeCommitMs: env.INGEST_HOLD_BEFORE_COMMIT_MS,
    maxStoredErrors: limits.maxRowErrors,
    sampleKeySalt: env.SAMPLE_KEY_SALT,
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

const studies = startStudyWorker(db, { connection, prefix: env.QUEUE_PREFIX, log });

const recovered = await recoverWithBackoff();
await studies.recover();
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
  await studies.close().catch((error: Error) => log(`closing studies: ${error.message}`));
  await Promise.allSettled([pool.end(), connection.quit()]);
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));

/** The start-up recovery needs PostgreSQL and Redis; while either is away, try again with backoff. */
async function recoverWithBackoff(): Promise<number> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await ingest.recover();
    } catch (error) {
      const waitMs = Math.min(500 * 2 ** attempt, 30_000);
      log(`start-up recovery failed (${(error as Error).message}); retrying in ${waitMs} ms`);
      await new Promise((resolve) => setTimeout(resolve, waitMs));
    }
  }
}
