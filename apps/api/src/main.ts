import { Redis } from 'ioredis';
import { createDb } from '@plumbline/db';
import { createLogger } from '@plumbline/db/logging';
import { loadEnv } from './config/env.ts';
import { createApp } from './app.ts';
import { createFileStorage } from './storage/index.ts';
import { createIngestQueue } from './queues/ingest-queue.ts';

const env = loadEnv();
const { db, pool } = createDb(env.DATABASE_URL);
const redis = new Redis(env.REDIS_URL, { maxRetriesPerRequest: null });
const ingestQueue = createIngestQueue(redis, env.QUEUE_PREFIX);
const logger = createLogger('api');
const app = createApp({ env, db, redis, storage: createFileStorage(env), ingestQueue, logger });

const server = app.listen(env.PORT, env.HOST, () => {
  logger.info(`listening on http://${env.HOST}:${env.PORT}`);
});

async function shutdown(signal: string) {
  logger.info(`${signal} received, shutting down`);
  server.close();
  await ingestQueue.close().catch(() => {});
  await Promise.allSettled([pool.end(), redis.quit()]);
  process.exit(0);
}
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('SIGINT', () => void shutdown('SIGINT'));
