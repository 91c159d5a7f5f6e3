import { z } from 'zod';

const DEVELOPMENT_SALT = 'plumbline-development-sample-key-salt';

/** Worker configuration, read once at start-up; a bad value stops the process with a clear message. */
const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  DATABASE_URL: z.string().default('postgres://postgres@127.0.0.1:54329/plumbline'),
  REDIS_URL: z.string().default('redis://127.0.0.1:63790'),
  /** Redis key prefix of the BullMQ queues; the API and the worker must agree on it. */
  QUEUE_PREFIX: z.string().min(1).default('plumbline'),
  STORAGE_DIR: z.string().default('.data/uploads'),
  S3_BUCKET: z.string().optional(),
  S3_ENDPOINT: z.string().optional(),
  S3_REGION: z.string().default('us-east-1'),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  /** Uploads processed at the same time by this process. */
  INGEST_CONCURRENCY: z.coerce.number().int().min(1).max(32).default(2),
  /** Peer statistics are recomputed this long (ms) after an upload is stored, so uploads arriving together share one pass… */
  PEER_RECOMPUTE_DELAY_MS: z.coerce.number().int().min(0).default(500),
  /** …and while the worker keeps ingesting, after at most this long (ms). */
  PEER_RECOMPUTE_MAX_WAIT_MS: z.coerce.number().int().min(0).default(30_000),
  /** How often uploads stuck in queued/processing are handed to the queue again, in ms. */
  RECOVERY_INTERVAL_MS: z.coerce.number().int().min(1000).default(60_000),
  /** A job whose worker died is taken up again once its lock (this long, in ms) has expired. */
  INGEST_LOCK_MS: z.coerce.number().int().min(1000).default(60_000),
  /** How often, in ms, the worker looks for jobs whose worker died. */
  INGEST_STALLED_CHECK_MS: z.coerce.number().int().min(500).default(30_000),
  /** Connections of this process's PostgreSQL pool. */
  DB_POOL_MAX: z.coerce.number().int().min(1).max(100).default(10),
  /**
   * Crash-recovery testing only: keep the storing transaction open this long before COMMIT, so a test
   * can kill the process mid-transaction. 0 (the default) in every real deployment.
   */
  INGEST_HOLD_BEFORE_COMMIT_MS: z.coerce.number().int().min(0).default(0),
  /**
   * Secret salt of the hash that replaces the sample keys of patient files (equal keys of a lab give
   * equal hashes, so repeats of a person can be dropped, and the key itself is never stored). Set your
   * own in production; changing it makes earlier and later hashes incomparable.
   */
  SAMPLE_KEY_SALT: z.string().min(16).default(DEVELOPMENT_SALT),
});
const checkedEnvSchema = envSchema.refine(
  (env) => env.NODE_ENV !== 'production' || env.SAMPLE_KEY_SALT !== DEVELOPMENT_SALT,
  {
    message: 'set your own SAMPLE_KEY_SALT in production',
    path: ['SAMPLE_KEY_SALT'],
  },
);

export type WorkerEnv = z.infer<typeof envSchema>;

export function loadWorkerEnv(source: NodeJS.ProcessEnv = process.env): WorkerEnv {
  const parsed = checkedEnvSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n');
    throw new Error(`Invalid worker configuration:\n${lines}`);
  }
  return parsed.data;
}
