import { Queue, UnrecoverableError, Worker, type Job } from 'bullmq';
import type { Redis } from 'ioredis';
import {
  INGEST_JOB_OPTIONS,
  INGEST_MAX_FAULTY_ATTEMPTS,
  INGEST_QUEUE_NAME,
  ingestJobId,
  ingestJobSchema,
  type IngestJob,
} from '@plumbline/contracts';
import { isDatabaseUnavailable } from '@plumbline/db';
import { processUpload, type IngestDeps, type IngestOutcome } from '../jobs/ingest.job.ts';
import { createPeerStatisticsDrainer, type PeerStatisticsDrainer } from '../jobs/peer-statistics.job.ts';
import * as repo from '../ingest/ingest.repository.ts';
import { logContext } from '@plumbline/db/logging';

export type IngestWorkerOptions = {
  connection: Redis;
  prefix: string;
  concurrency: number;
  /** How often uploads left queued/processing are handed to the queue again (0: only at start). */
  recoveryIntervalMs: number;
  /** Peer statistics wait this long after an upload is stored, so uploads arriving together share a recompute. */
  recomputeDelayMs?: number;
  /** …and while this worker keeps ingesting, at most this long. */
  recomputeMaxWaitMs?: number;
  /** How long a job's lock lasts without renewal; a job whose worker died is retried after it (default 60 s). */
  lockDurationMs?: number;
  /** How often this worker looks for jobs whose worker died (default 30 s). */
  stalledIntervalMs?: number;
};

export type IngestWorker = {
  worker: Worker<IngestJob, IngestOutcome>;
  queue: Queue<IngestJob>;
  /** Recomputes requested peer statistics in the background. */
  drainer: PeerStatisticsDrainer;
  /** Re-enqueues every upload PostgreSQL says is queued or processing; returns how many. */
  recover(): Promise<number>;
  /** Stops taking jobs, lets running ones finish, and closes the queue handles. */
  close(): Promise<void>;
};

/** Runs a job with its upload id and the id of the API request that enqueued it on every log line. */
function withLogContext<T>(process: (job: Job<IngestJob>) => Promise<T>) {
  return (job: Job<IngestJob>) => {
    const data = (job.data ?? {}) as Partial<IngestJob>;
    const context = {
      uploadId: typeof data.uploadId === 'string' ? data.uploadId : undefined,
      requestId: typeof data.requestId === 'string' ? data.requestId : undefined,
    };
    return logContext.run(context, () => process(job));
  };
}

/** The ingest queue's consumer: one processor, payloads parsed at the door (a bad payload is not retried). */
export function startIngestWorker(deps: IngestDeps, options: IngestWorkerOptions): IngestWorker {
  const log = deps.log ?? (() => {});
  const queue = new Queue<IngestJob>(INGEST_QUEUE_NAME, {
    connection: options.connection,
    prefix: options.prefix,
  });
  let activeJobs = 0;
  const drainer = createPeerStatisticsDrainer(
    deps.db,
    {
      minLabs: deps.minLabs,
      delayMs: options.recomputeDelayMs ?? 500,
      maxWaitMs: options.recomputeMaxWaitMs ?? 30_000,
      busy: () => activeJobs > 0,
    },
    log,
  );

  const worker = new Worker<IngestJob, IngestOutcome>(
    INGEST_QUEUE_NAME,
    withLogContext(async (job: Job<IngestJob>) => {
      const payload = ingestJobSchema.safeParse(job.data);
      if (!payload.success) throw new UnrecoverableError(`ingest job ${job.id}: invalid payload`);
      activeJobs += 1;
      try {
        const outcome = await processUpload(deps, payload.data.uploadId, (progress) =>
          job.updateProgress(Math.round(progress * 1000) / 1000),
        );
        if (outcome === 'stored') drainer.kick();
        return outcome;
      } catch (error) {
        // A CHECK constraint refusing a figure is deterministic: retrying cannot help. The ingest checks
        // should have caught it, so it is reported as ours, but at once and naming the constraint.
        const constraint = checkViolation(error);
        if (constraint) {
          log(`upload ${payload.data.uploadId}: refused by the database constraint ${constraint}`);
          await repo
            .markFailed(
              deps.db,
              payload.data.uploadId,
              `The file holds a figure the database refuses (${constraint}), which our checks should have reported. Nothing was stored; contact the network coordinator.`,
            )
            .catch(() => {});
          throw new UnrecoverableError(`check constraint ${constraint}`);
        }
        // A lost connection is retried with backoff until the attempts run out; a fault of any other
        // kind only a few times. Either way PostgreSQL rolled back the attempt, so a retry stores once.
        const attempt = job.attemptsMade + 1;
        const unavailable = isDatabaseUnavailable(error) || isRedisUnavailable(error);
        const lastAttempt =
          attempt >= (job.opts.attempts ?? 1) || (!unavailable && attempt >= INGEST_MAX_FAULTY_ATTEMPTS);
        log(
          `upload ${payload.data.uploadId}: attempt ${attempt} failed${unavailable ? ' (connection lost, will retry)' : ''}: ${(error as Error).message}`,
        );
        if (lastAttempt) {
          await repo
            .markFailed(
              deps.db,
              payload.data.uploadId,
              'The file could not be processed because of a problem on our side. Upload it again, or contact the network coordinator if this repeats.',
            )
            .catch(() => {});
          throw new UnrecoverableError((error as Error).message);
        }
        throw error;
      } finally {
        activeJobs -= 1;
      }
    }),
    {
      connection: options.connection,
      prefix: options.prefix,
      concurrency: options.concurrency,
      lockDuration: options.lockDurationMs ?? 60_000,
      stalledInterval: options.stalledIntervalMs ?? 30_000,
    },
  );
  worker.on('error', (error) => log(`ingest worker: ${error.message}`));
  queue.on('error', (error) => log(`ingest queue: ${error.message}`));

  async function recover(): Promise<number> {
    const pending = await repo.uploadsToRecover(deps.db);
    for (const upload of pending) {
      // The same job id as the API uses, so an upload that is still in the queue is not added twice.
      await queue.add(
        'ingest',
        { uploadId: upload.id },
        { ...INGEST_JOB_OPTIONS, jobId: ingestJobId(upload.id, upload.confirmed ? 'confirmed' : 'initial') },
      );
    }
    // Recompute requests left by a crash between storing and recomputing.
    drainer.kick();
    return pending.length;
  }

  const timer =
    options.recoveryIntervalMs > 0
      ? setInterval(() => {
          recover().catch((error: Error) => log(`ingest recovery: ${error.message}`));
        }, options.recoveryIntervalMs)
      : null;
  timer?.unref();

  return {
    worker,
    queue,
    drainer,
    recover,
    async close() {
      if (timer) clearInterval(timer);
      await worker.close();
      await drainer.idle();
      await queue.close();
    },
  };
}

/** The name of the CHECK constraint (SQLSTATE 23514) behind an error, or null. */
function checkViolation(error: unknown): string | null {
  for (
    let e = error as { code?: string; constraint?: string; cause?: unknown } | undefined;
    e;
    e = e.cause as typeof e
  ) {
    if (e.code === '23514') return e.constraint ?? 'a check constraint';
  }
  return null;
}

/** Redis connection errors as ioredis and BullMQ word them. */
function isRedisUnavailable(error: unknown): boolean {
  const message = (error as Error)?.message ?? '';
  return /ECONNREFUSED|ECONNRESET|Connection is closed|connection lost|MaxRetriesPerRequest/i.test(message);
}
