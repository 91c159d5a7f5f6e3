import type { Redis } from 'ioredis';
import type { Database } from '@plumbline/db';
import type { Logger } from '@plumbline/db/logging';
import type { Env } from './config/env.ts';
import type { FileStorage } from './storage/storage.ts';
import type { IngestQueue } from './queues/ingest-queue.ts';

/** Everything the HTTP app needs from the outside world; tests pass their own. */
export type AppDeps = {
  env: Env;
  db: Database;
  redis: Redis;
  /** Where uploaded files are written (local directory or S3). */
  storage: FileStorage;
  /** Hands uploads to the ingest worker. */
  ingestQueue: IngestQueue;
  /** Structured JSON log; a default one writing to stdout when left out. */
  logger?: Logger;
};
