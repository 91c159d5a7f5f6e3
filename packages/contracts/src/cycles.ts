import { z } from 'zod';
import { periodKeySchema, uuidSchema } from './common.ts';

const reasonSchema = z
  .preprocess(
    (v) => (typeof v === 'string' && v.trim() === '' ? null : v),
    z.string().trim().max(500).nullable(),
  )
  .optional();
const deadlineSchema = z.iso.datetime({
  offset: true,
  message: 'expected a date and time such as 2026-02-10T23:59:00Z',
});

export const periodStates = ['open', 'closed', 'published'] as const;
export const periodStateSchema = z.enum(periodStates);
export type PeriodState = z.infer<typeof periodStateSchema>;

export const periodCreateSchema = z.object({
  period: periodKeySchema,
  deadline: deadlineSchema,
  reason: reasonSchema,
});
export type PeriodCreate = z.infer<typeof periodCreateSchema>;

export const periodUpdateSchema = z.object({ deadline: deadlineSchema, reason: reasonSchema });
export type PeriodUpdate = z.infer<typeof periodUpdateSchema>;

export const periodCloseSchema = z.object({ reason: reasonSchema });
/** Reopening undoes a close, so it needs a reason. */
export const periodReopenSchema = z.object({
  reason: z.string().trim().min(1, 'say why the period is reopened').max(500),
});

export const periodDetailSchema = z.object({
  period: periodKeySchema,
  state: periodStateSchema,
  deadline: z.string(),
  closedAt: z.string().nullable(),
  publishedAt: z.string().nullable(),
});
export type PeriodDetail = z.infer<typeof periodDetailSchema>;

// ---------- participation board ----------

export const participationSortKeys = [
  'code',
  'name',
  'registered',
  'submitted',
  'missing',
  'late',
  'flags',
] as const;
export const participationQuerySchema = z.object({
  sort: z.enum(participationSortKeys).default('code'),
  order: z.enum(['asc', 'desc']).default('asc'),
});
export type ParticipationQuery = z.infer<typeof participationQuerySchema>;

/**
 * An action-level finding for one of a lab's procedures (filled in once peer statistics exist);
 * 'not-computable' marks a report row whose comparison cannot be computed.
 */
export const participationFlagSchema = z.object({
  kind: z.enum(['sdi', 'cvr', 'excluded-outlier', 'not-computable']),
  procedureId: uuidSchema,
  controlLotId: uuidSchema,
  level: z.number(),
  value: z.number().nullable(),
});
export type ParticipationFlag = z.infer<typeof participationFlagSchema>;

export const participationLabSchema = z.object({
  lab: z.object({ id: uuidSchema, code: z.string(), name: z.string(), active: z.boolean() }),
  /** Measurement procedures the lab has registered (not retired). */
  proceduresRegistered: z.number(),
  /** Procedures with at least one monthly summary for the period. */
  proceduresWithData: z.number(),
  /** Procedures with data that arrived after the period closed. */
  lateCount: z.number(),
  status: z.enum(['complete', 'partial', 'none']),
  missing: z.array(
    z.object({
      procedureId: uuidSchema,
      code: z.string(),
      analyte: z.object({ code: z.string(), name: z.string() }),
    }),
  ),
  flags: z.array(participationFlagSchema),
});
export type ParticipationLab = z.infer<typeof participationLabSchema>;

export const participationBoardSchema = z.object({
  period: periodDetailSchema,
  totals: z.object({
    labs: z.number(),
    complete: z.number(),
    partial: z.number(),
    none: z.number(),
    late: z.number(),
  }),
  labs: z.array(participationLabSchema),
});
export type ParticipationBoard = z.infer<typeof participationBoardSchema>;
