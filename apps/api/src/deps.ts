import type { Redis } from 'ioredis';
import type { Database } from '@plumbline/db';
import type { Env } from './config/env.ts';

/** Everything the HTTP app needs from the outside world; tests pass their own. */
export type AppDeps = {
  env: Env;
  db: Database;
  redis: Redis;
};
