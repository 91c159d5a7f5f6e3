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
