import { Redis } from 'ioredis';
import { createDb, thresholds } from '@plumbline/db';
import { loadEnv } from './config/env.ts';
import { createApp } from './app.ts';
import { createFileStorage } from './storage/index.ts';
import { createIngestQueue } from './queues/ingest-queue.ts';

const env = loadEnv();
// Read now, so a bad threshold setting stops the API at start-up.
thresholds();
const { db, pool } = createDb(env.DATABASE_URL);
const redis = new Redis(env.REDIS_URL, { maxRetriesPerRequest: null });
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
