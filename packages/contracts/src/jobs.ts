import { z } from 'zod';
import { uuidSchema } from './common.ts';

/** BullMQ queue that carries uploaded files to the ingest worker. */
export const INGEST_QUEUE_NAME = 'ingest';

/**
 * Payload of an ingest job: PostgreSQL holds everything else about the upload. `requestId` is the id
 * of the API request that enqueued it, so the worker's log lines can be matched with the API's.
 */
export const ingestJobSchema = z.object({ uploadId: uuidSchema, requestId: z.string().max(100).optional() });
export type IngestJob = z.infer<typeof ingestJobSchema>;

/**
 * One job id per upload and phase, so enqueueing the same upload twice (a retry, the worker's start-up
 * recovery, a second worker) collapses into one job. Confirming an upload starts its second phase.
 */
export function ingestJobId(uploadId: string, phase: 'initial' | 'confirmed'): string {
  return `upload-${uploadId}-${phase}`;
}

/**
 * Options of every ingest job, whoever enqueues it. Attempts are many because a database or Redis
 * restart fails a running job through no fault of the file: retried with exponential backoff (2 s, 4 s,
 * … about 17 minutes in all) the job outlasts any ordinary restart. A failure that is not about the
 * connection is given up after INGEST_MAX_FAULTY_ATTEMPTS (the worker decides).
 */
export const INGEST_JOB_OPTIONS = {
  attempts: 10,
  backoff: { type: 'exponential' as const, delay: 2000 },
  removeOnComplete: true,
  removeOnFail: true,
};
export const INGEST_MAX_FAULTY_ATTEMPTS = 3;

/** BullMQ queue that runs reference-interval studies. */
export const STUDY_QUEUE_NAME = 'ri-study';
export const studyJobSchema = z.object({ studyId: uuidSchema });
export type StudyJob = z.infer<typeof studyJobSchema>;
