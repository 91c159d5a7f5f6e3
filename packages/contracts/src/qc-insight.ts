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

/** Rule names a QC plan may use (as `qcPlanPower` in @plumbline/stats). */
export const qcPlanRuleNames = ['1-2s', '1-2.5s', '1-3s', '1-3.5s', '2-2s', 'R-4s', '4-1s', '10-x'] as const;

// PUT /api/labs/:labId/qc-plan/:procedureId/:level — the plan the lab uses.
export const qcPlanInputSchema = z.object({
  rules: z.array(z.enum(qcPlanRuleNames)).min(1).max(8),
  n: z.number().int().min(1).max(10),
  runs: z.number().int().min(1).max(10).default(1),
});
export type QcPlanInput = z.infer<typeof qcPlanInputSchema>;

export const evaluatedPlanSchema = z.object({
  rules: z.array(z.string()),
  n: z.number().int(),
  runs: z.number().int(),
  ped: z.number(),
  pfr: z.number(),
  method: z.enum(['closed form', 'simulation']),
});

// GET /api/labs/:labId/qc-plan
export const qcPlanRowSchema = z.object({
  procedure: z.object({ id: uuidSchema, code: z.string() }),
  analyte: z.string(),
  controlLot: z.string(),
  level: z.number().int(),
  teaPct: z.number().nullable(),
  teaSource: z.string().nullable(),
  biasPct: z.number().nullable(),
  cvPct: z.number().nullable(),
  sigma: z.number().nullable(),
  deltaSeCrit: z.number().nullable(),
  /** The plan the lab entered, with its power at ΔSEcrit (null power without a sigma). */
  current: z
    .object({
      rules: z.array(z.string()),
      n: z.number().int(),
      runs: z.number().int(),
      ped: z.number().nullable(),
      pfr: z.number(),
    })
    .nullable(),
  recommended: evaluatedPlanSchema.nullable(),
  reached: z.boolean().nullable(),
  explanation: z.string(),
});
export type QcPlanRow = z.infer<typeof qcPlanRowSchema>;

export const qcPlanPageSchema = z.object({
  period: periodKeySchema.nullable(),
  settings: z.object({ minPed: z.number(), maxPfr: z.number() }),
  rows: z.array(qcPlanRowSchema),
});
export type QcPlanPage = z.infer<typeof qcPlanPageSchema>;
