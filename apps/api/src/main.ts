import { Redis } from 'ioredis';
import { createDb } from '@plumbline/db';
import { loadEnv } from './config/env.ts';
import { createApp } from './app.ts';
import { createFileStorage } from './storage/index.ts';
import { createIngestQueue } from './queues/ingest-queue.ts';
import { installProcessGuards } from './process-guards.ts';

installProcessGuards('api');

const env = loadEnv();
const { db, pool } = createDb(env.DATABASE_URL);
const redis = new Redis(env.REDIS_URL, { maxRetriesPerRequest: null });
// ioredis reconnects by itself; without a listener it would print every failed attempt as unhandled.
redis.on('error', (error: Error) => logRedisError(error));
const ingestQueue = createIngestQueue(redis, env.QUEUE_PREFIX);
const app = createApp({ env, db, redis, storage: createFileStorage(env), ingestQueue });

const server = app.listen(env.PORT, env.HOST, () => {
  console.log(`api: listening on http://${env.HOST}:${env.PORT}`);
});

async function shutdown(signal: string) {
  console.log(`api: ${signal} received, shutting down`);
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
  console.error(`api: redis: ${error.message} (reconnecting)`);
}
redis.on('ready', () => {
  if (lastRedisError) console.log('api: redis: connected again');
  lastRedisError = '';
});
