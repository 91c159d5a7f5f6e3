import { Redis } from 'ioredis';
import { createDb, thresholds } from '@plumbline/db';
import { createLogger } from '@plumbline/db/logging';
import { loadEnv } from './config/env.ts';
import { createApp } from './app.ts';
import { createFileStorage } from './storage/index.ts';
import { createIngestQueue } from './queues/ingest-queue.ts';
import { installProcessGuards } from './process-guards.ts';

installProcessGuards('api');

const env = loadEnv();
// Read now, so a bad threshold setting stops the API at start-up.
thresholds();
const { db, pool } = createDb(env.DATABASE_URL, { max: env.DB_POOL_MAX });
const redis = new Redis(env.REDIS_URL, { maxRetriesPerRequest: null });
// ioredis reconnects by itself; without a listener it would print every failed attempt as unhandled.
redis.on('error', (error: Error) => logRedisError(error));
const ingestQueue = createIngestQueue(redis, env.QUEUE_PREFIX);
const logger = createLogger('api');
const storage = createFileStorage(env);
const app = createApp({ env, db, redis, storage, ingestQueue, logger });

// Uploads cut off by a crash of this process leave partial files; sweep them now and every hour.
async function sweepPartials() {
  const removed = await storage.sweepAbandoned?.(env.STALE_PARTIAL_MS).catch((error: Error) => {
    logger.error({ err: error }, 'sweeping partial upload files failed');
    return 0;
  });
  if (removed) logger.info(`removed ${removed} partial upload file(s) left by interrupted uploads`);
}
void sweepPartials();
setInterval(() => void sweepPartials(), 3_600_000).unref();

const server = app.listen(env.PORT, env.HOST, () => {
  logger.info(`listening on http://${env.HOST}:${env.PORT}`);
});
// Idle keep-alive connections stay open longer than clients and proxies keep theirs (common practice:
// above the 60 s of most load balancers), so the server never closes one a client is about to reuse.
server.keepAliveTimeout = 65_000;
server.headersTimeout = 66_000;

async function shutdown(signal: string) {
  logger.info(`${signal} received, shutting down`);
  server.close();
  await ingestQueue.close().catch(() => {});
  await Promise.allSettled([pool.end(), redis.quit()]);
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));

let lastRedisError = '';
function logRedisError(error: Error) {
  if (error.message === lastRedisError) return; // one line per kind of failure, not one per retry
  lastRedisError = error.message;
  logger.warn(`redis: ${error.message} (reconnecting)`);
}
redis.on('ready', () => {
  if (lastRedisError) logger.info('redis: connected again');
  lastRedisError = '';
});
