import { z } from 'zod';
import { periodKeySchema, uuidSchema } from './common.ts';

// GET /api/lot-comparisons?analyteId=&period=
export const lotComparisonsQuerySchema = z.object({
  analyteId: uuidSchema,
  /** The month after the lot change: compared with the month before it. */
  period: periodKeySchema,
});
export type LotComparisonsQuery = z.infer<typeof lotComparisonsQuerySchema>;

/** Mean and between-lab SD of the lab means of one lot in its month. */
export const lotPeerSchema = z.object({
  controlLotId: uuidSchema,
  lotNumber: z.string(),
  period: periodKeySchema,
  labs: z.number().int(),
  mean: z.number(),
  sd: z.number().nullable(),
});

/** A difference (new lot − old lot) in the analyte's unit and in % of the old lot's peer mean, with its 95 % CI. */
export const lotDifferenceSchema = z.object({
  difference: z.number(),
  low: z.number(),
  high: z.number(),
  differencePct: z.number().nullable(),
  lowPct: z.number().nullable(),
  highPct: z.number().nullable(),
  dof: z.number(),
});
export type LotDifference = z.infer<typeof lotDifferenceSchema>;

export const lotVerdictSchema = z.enum(['lot-effect', 'no-common-shift', 'too-few-labs']);
export type LotVerdict = z.infer<typeof lotVerdictSchema>;

export const lotComparisonSchema = z.object({
  level: z.number().int(),
  fromLot: lotPeerSchema,
  toLot: lotPeerSchema,
  /** Labs (procedures) that reported the old lot in the month before and the new lot in the month. */
  pairedLabs: z.number().int(),
  /** Per-lab differences new − old, for the chart; no lab is named. */
  labDifferences: z.array(z.number()),
  labsHigher: z.number().int(),
  labsLower: z.number().int(),
  /** Paired labs that recorded a reagent-lot change (procedure event) in either month. */
  reagentLotChanges: z.number().int(),
  /** Paired t interval of the mean per-lab difference; null with fewer than 2 paired labs. */
  paired: lotDifferenceSchema.nullable(),
  /** Welch interval of the difference of the two lots' peer means; null with fewer than 2 labs per lot. */
  welch: lotDifferenceSchema.nullable(),
  verdict: lotVerdictSchema,
  /** The verdict in plain words. */
  explanation: z.string(),
});
export type LotComparison = z.infer<typeof lotComparisonSchema>;

export const lotComparisonsSchema = z.object({
  analyteId: uuidSchema,
  analyteCode: z.string(),
  analyteName: z.string(),
  unit: z.string(),
  period: periodKeySchema,
  previousPeriod: periodKeySchema,
  comparisons: z.array(lotComparisonSchema),
  caution: z.string(),
});
export type LotComparisons = z.infer<typeof lotComparisonsSchema>;
