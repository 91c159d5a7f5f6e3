import { z } from 'zod';
import { periodKeySchema, uuidSchema } from './common.ts';

/** Kinds of change a lab records for a procedure. */
export const procedureEventKinds = [
  'reagent-lot',
  'calibrator-lot',
  'control-lot',
  'maintenance',
  'recalibration',
  'software-update',
  'other',
] as const;
export const procedureEventKindSchema = z.enum(procedureEventKinds);
export type ProcedureEventKind = z.infer<typeof procedureEventKindSchema>;

const isoDay = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'must be a date written YYYY-MM-DD')
  .refine((value) => {
    const day = new Date(`${value}T00:00:00Z`);
    return !Number.isNaN(day.getTime()) && day.toISOString().slice(0, 10) === value;
  }, 'is not a calendar date');

// POST /api/labs/:labId/procedures/:procedureId/events
export const procedureEventCreateSchema = z.object({
  occurredOn: isoDay,
  kind: procedureEventKindSchema,
  note: z.string().trim().max(1000).default(''),
});
export type ProcedureEventCreate = z.infer<typeof procedureEventCreateSchema>;

export const procedureEventSchema = z.object({
  id: uuidSchema,
  procedureId: uuidSchema,
  procedureCode: z.string(),
  occurredOn: z.string(),
  kind: procedureEventKindSchema,
  note: z.string(),
  /** Name of the person, or "API token" for middleware. */
  recordedBy: z.string(),
  createdAt: z.string(),
});
export type ProcedureEvent = z.infer<typeof procedureEventSchema>;

/** Result of POST /api/labs/:labId/procedure-events (CSV from middleware): all rows stored, or none. */
export const procedureEventImportSchema = z.object({ created: z.number().int() });

// GET /api/labs/:labId/procedures/:procedureId/shifts?level=
export const detectedShiftSchema = z.object({
  controlLotId: uuidSchema,
  controlLot: z.string(),
  level: z.number().int(),
  /** First period after the shift (the estimated change point) and the period of the signal. */
  period: periodKeySchema,
  signalPeriod: periodKeySchema,
  /** Estimated shift in SDI, and in % of the peer mean (mean bias % after − before). */
  sizeSdi: z.number(),
  sizePct: z.number().nullable(),
  direction: z.enum(['up', 'down']),
  confidence: z.number(),
  /** Recorded events of the procedure nearest before the change point, within the window, newest first. */
  events: z.array(procedureEventSchema),
});
export type DetectedShiftItem = z.infer<typeof detectedShiftSchema>;

export const procedureShiftsSchema = z.object({
  procedureId: uuidSchema,
  method: z.string(),
  /** Days before the change point in which events are looked for. */
  eventWindowDays: z.number().int(),
  series: z.array(
    z.object({
      controlLotId: uuidSchema,
      controlLot: z.string(),
      level: z.number().int(),
      points: z.array(z.object({ period: periodKeySchema, sdi: z.number(), biasPct: z.number().nullable() })),
    }),
  ),
  shifts: z.array(detectedShiftSchema),
});
export type ProcedureShifts = z.infer<typeof procedureShiftsSchema>;
