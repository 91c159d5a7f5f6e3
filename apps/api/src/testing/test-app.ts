import { Redis } from 'ioredis';
import { randomBytes } from 'node:crypto';
import { labs, users } from '@plumbline/db';
import { createScratchDatabase, type ScratchDatabase } from '@plumbline/db/testing';
import type { Role } from '@plumbline/contracts';
import { loadEnv } from '../config/env.ts';
import { createApp } from '../app.ts';
import { signSession } from '../auth/jwt.ts';
import { hashPassword } from '../auth/passwords.ts';
import type { AppDeps } from '../deps.ts';
import type { Logger } from '@plumbline/db/logging';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { LocalFileStorage } from '../storage/local-storage.ts';
import { createIngestQueue } from '../queues/ingest-queue.ts';

export const TEST_PASSWORD = 'correct horse battery staple';

/** An in-process app on its own scratch database and the real Redis, with helpers to make labs and users. */
export async function createTestApp(
  label: string,
  options: { env?: Record<string, string>; logger?: Logger } = {},
) {
  const scratch: ScratchDatabase = await createScratchDatabase(label);
  // Each test app has its own storage directory and queue prefix, so parallel test files never share jobs.
  const storageDir = mkdtempSync(join(tmpdir(), `plumbline-${label.replace(/[^a-z0-9]/gi, '')}-`));
  const queuePrefix = `plumbline-test-${label.replace(/[^a-z0-9]/gi, '')}-${randomBytes(4).toString('hex')}`;
  const env = loadEnv({
    ...process.env,
    NODE_ENV: 'test',
    DATABASE_URL: scratch.url,
    JWT_SECRET: randomBytes(32).toString('hex'),
    STORAGE_DIR: storageDir,
    QUEUE_PREFIX: queuePrefix,
    S3_BUCKET: '',
    ...options.env,
  });
  const redis = new Redis(env.REDIS_URL, { maxRetriesPerRequest: null, lazyConnect: false });
  const ingestQueue = createIngestQueue(redis, queuePrefix);
  const deps: AppDeps = {
    env,
    db: scratch.db,
    redis,
    storage: new LocalFileStorage(storageDir),
    ingestQueue,
    logger: options.logger,
  };
  const app = createApp(deps);
  let passwordHash: string | null = null;

  async function makeLab(code = `T-${randomBytes(3).toString('hex')}`) {
    const [lab] = await scratch.db
      .insert(labs)
      .values({ code, name: `Test lab ${code}` })
      .returning();
    return lab;
  }

  async function makeUser(
    role: Role,
    labId: string | null,
    overrides: { email?: string; active?: boolean } = {},
  ) {
    passwordHash ??= await hashPassword(TEST_PASSWORD);
    const [user] = await scratch.db
      .insert(users)
      .values({
        email: overrides.email ?? `${role}-${randomBytes(4).toString('hex')}@test.example`,
        name: `Test ${role}`,
        role,
        labId,
        passwordHash,
        active: overrides.active ?? true,
      })
      .returning();
    const { token } = signSession(user, env.JWT_SECRET, 3600);
    return { ...user, token, auth: `Bearer ${token}` };
  }

  async function close() {
    await ingestQueue.close().catch(() => {});
    await deleteKeys(redis, queuePrefix).catch(() => {});
    redis.disconnect();
    await scratch.drop();
    rmSync(storageDir, { recursive: true, force: true });
  }

  return {
    app,
    deps,
    env,
    db: scratch.db,
    databaseUrl: scratch.url,
    storageDir,
    queuePrefix,
    makeLab,
    makeUser,
    close,
  };
}
export type TestApp = Awaited<ReturnType<typeof createTestApp>>;

/** Removes a test's queue keys from Redis (every key under its prefix). */
async function deleteKeys(redis: Redis, prefix: string): Promise<void> {
  let cursor = '0';
  do {
    const [next, keys] = await redis.scan(cursor, 'MATCH', `${prefix}:*`, 'COUNT', 500);
    if (keys.length) await redis.del(...keys);
    cursor = next;
  } while (cursor !== '0');
}
