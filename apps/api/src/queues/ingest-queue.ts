import { Queue } from 'bullmq';
import type { Redis } from 'ioredis';
import { INGEST_JOB_OPTIONS, INGEST_QUEUE_NAME, ingestJobId, type IngestJob } from '@plumbline/contracts';
import { createLogger, logContext } from '@plumbline/db/logging';

const log = createLogger('api');

/** Hands uploads to the ingest worker. PostgreSQL stays the source of truth: a lost job is re-enqueued by the worker. */
export interface IngestQueue {
  enqueue(uploadId: string, phase: 'initial' | 'confirmed'): Promise<void>;
  close(): Promise<void>;
}

export function createIngestQueue(connection: Redis, prefix: string): IngestQueue {
  const queue = new Queue<IngestJob>(INGEST_QUEUE_NAME, { connection, prefix });
  // Connection trouble is reported here; an 'error' event without a listener would end the process.
  queue.on('error', () => {});
  return {
    async enqueue(uploadId, phase) {
      const adding: Promise<unknown> = queue
        .add(
          'ingest',
          { uploadId, requestId: logContext.getStore()?.requestId },
          { ...INGEST_JOB_OPTIONS, jobId: ingestJobId(uploadId, phase) },
        )
        .then(
          () => 'added',
          (error: unknown) => error,
        );
      // With Redis away the add would wait for it; the upload row stays 'queued' and the worker's
      // recovery sweep enqueues it later, so the request need not wait.
      const timeout = new Promise<'timeout'>((resolve) => setTimeout(() => resolve('timeout'), 3000).unref());
      const outcome = await Promise.race([adding, timeout]);
      if (outcome !== 'added') {
        log.warn(
          { uploadId, err: outcome === 'timeout' ? undefined : outcome },
          'could not enqueue the upload now; the worker will pick it up',
        );
      }
    },
    async close() {
      await queue.close();
    },
  };
}
