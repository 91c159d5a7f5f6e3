import { z } from 'zod';
import { resolveJwtSecret } from './jwt-secret.ts';

/** Configuration read once at start-up; a bad value stops the process with a clear message. */
const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  PORT: z.coerce.number().int().min(1).max(65535).default(5180),
  HOST: z.string().default('127.0.0.1'),
  DATABASE_URL: z.string().default('postgres://postgres@127.0.0.1:54329/plumbline'),
  REDIS_URL: z.string().default('redis://127.0.0.1:63790'),
  JWT_SECRET: z.string().min(32, 'JWT_SECRET must be at least 32 characters').optional(),
  JWT_TTL_SECONDS: z.coerce
    .number()
    .int()
    .positive()
    .default(8 * 3600),
  /** Local state of a development install (the generated JWT secret when JWT_SECRET is unset). */
  DATA_DIR: z.string().default('.data'),
  STORAGE_DIR: z.string().default('.data/uploads'),
  S3_BUCKET: z.string().optional(),
  S3_ENDPOINT: z.string().optional(),
  S3_REGION: z.string().default('us-east-1'),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  MAX_UPLOAD_BYTES: z.coerce
    .number()
    .int()
    .positive()
    .default(100 * 1024 * 1024),
  /** Redis key prefix of the BullMQ queues; the API and the worker must agree on it. */
  QUEUE_PREFIX: z.string().min(1).default('plumbline'),
  WEB_DIST_DIR: z.string().optional(),
  PUBLIC_URL: z.string().default('http://127.0.0.1:5180'),
  /** Partial files of uploads that never finished (the API died mid-write) are deleted after this long, in ms. */
  STALE_PARTIAL_MS: z.coerce.number().int().min(1000).default(3_600_000),
  /** Connections of this process's PostgreSQL pool. */
  DB_POOL_MAX: z.coerce.number().int().min(1).max(100).default(10),
  /** Sign-in throttling: failures allowed per account and per client address within the window. */
  SIGNIN_FAILURES_PER_ACCOUNT: z.coerce.number().int().positive().default(5),
  SIGNIN_FAILURES_PER_ADDRESS: z.coerce.number().int().positive().default(50),
  SIGNIN_WINDOW_SECONDS: z.coerce
    .number()
    .int()
    .positive()
    .default(15 * 60),
  /** First lockout; it doubles with each further lockout within a day, up to the maximum. */
  SIGNIN_LOCKOUT_SECONDS: z.coerce.number().int().positive().default(60),
  SIGNIN_LOCKOUT_MAX_SECONDS: z.coerce.number().int().positive().default(3600),
});

export type Env = z.infer<typeof envSchema> & { JWT_SECRET: string };

export function loadEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const parsed = envSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n');
    throw new Error(`Invalid configuration:\n${lines}`);
  }
  const env = parsed.data;
  const jwtSecret = resolveJwtSecret({
    secret: env.JWT_SECRET,
    nodeEnv: env.NODE_ENV,
    dataDir: env.DATA_DIR,
  });
  return { ...env, JWT_SECRET: jwtSecret };
}
