import { z } from 'zod';
import { periodKeySchema, uuidSchema } from './common.ts';
import { preferredUnitsSchema } from './network-labs.ts';

/** Peer tiers, narrowest first: instrument model + method + reagent; method; every procedure for the analyte. */
export const peerTiers = ['instrument', 'method', 'analyte'] as const;
export const peerTierSchema = z.enum(peerTiers);
export type PeerTier = z.infer<typeof peerTierSchema>;

export const flagSeverities = ['fine', 'acceptable', 'warning', 'action'] as const;
export const flagSchema = z.object({
  kind: z.enum(['sdi', 'cvr', 'exclusion']),
  severity: z.enum(flagSeverities),
  message: z.string(),
});
export type ReportFlag = z.infer<typeof flagSchema>;

export const labFiguresSchema = z.object({
  n: z.number().int(),
  /** Null only in a row that cannot be computed, when the figure is not a finite number. */
  mean: z.number().nullable(),
  /** Null only in a row that cannot be computed, when the figure is not a finite number. */
  sd: z.number().nullable(),
  cv: z.number().nullable(),
});
export type LabFigures = z.infer<typeof labFiguresSchema>;

export const peerFiguresSchema = z.object({
  tier: peerTierSchema,
  labs: z.number().int(),
  n: z.number().int(),
  mean: z.number(),
  sd: z.number(),
  cv: z.number().nullable(),
  withinCv: z.number().nullable(),
});
export type PeerFigures = z.infer<typeof peerFiguresSchema>;

/**
 * A total allowable error rule in words, e.g. "± 6 mg/dL or ± 8 %, whichever is greater"; null when
 * no part is set. The absolute part is in `unit` (the analyte's canonical unit).
 */
export function teaRuleText(
  tea: { teaPct: number | null; teaAbsolute: number | null },
  unit: string,
): string | null {
  const absolute = tea.teaAbsolute === null ? null : `± ${tea.teaAbsolute} ${unit}`;
  const percent = tea.teaPct === null ? null : `± ${tea.teaPct} %`;
  if (absolute && percent) return `${absolute} or ${percent}, whichever is greater`;
  return absolute ?? percent;
}

/**
 * Why a row's comparison cannot be computed (e.g. a peer SD of 0, a figure that is not a finite number,
 * peer figures the recompute could not compute). The figures it could not compute are null; the other
 * rows of the report are unaffected.
 */
export const notComputableSchema = z.object({ reason: z.string() });
export type NotComputable = z.infer<typeof notComputableSchema>;

export const peerReportRowSchema = z.object({
  procedure: z.object({ id: uuidSchema, code: z.string() }),
  analyte: z.object({
    code: z.string(),
    name: z.string(),
    unit: z.string(),
    decimals: z.number().int(),
    /** Total allowable error rule: ± teaAbsolute (in canonicalUnit) or ± teaPct %, whichever is greater. */
    teaPct: z.number().nullable(),
    teaAbsolute: z.number().nullable(),
    teaSource: z.string().nullable(),
  }),
  controlLot: z.object({ id: uuidSchema, lotNumber: z.string() }),
  level: z.number().int(),
  /**
   * The unit in which the row's means and SDs are given: the analyte's canonical unit, or its conventional
   * unit when the report is read in conventional units (CV, SDI, CVR, bias % and sigma are unit-free).
   */
  unit: z.string(),
  /** The analyte's canonical (SI) unit, in which the data is stored. */
  canonicalUnit: z.string(),
  /** Decimals to show means and SDs with in `unit` (the analyte's decimals, adjusted by the conversion factor). */
  decimals: z.number().int(),
  /** 'summary' (uploaded as a monthly summary) or 'values' (derived from daily values). */
  source: z.enum(['summary', 'values']),
  /** The data arrived after the period was closed. */
  late: z.boolean(),
  lab: labFiguresSchema,
  /** Null when no tier had enough labs. */
  peer: peerFiguresSchema.nullable(),
  /** Which peer group the row is compared with and, when a narrower one was passed over, why. */
  peerNote: z.string(),
  sdi: z.number().nullable(),
  cvr: z.number().nullable(),
  biasPct: z.number().nullable(),
  sigma: z.number().nullable(),
  /**
   * The TEa rule evaluated at this level's concentration (the peer mean), as used for `sigma`: its % and
   * which part of the rule governs there. Null without a rule or peer figures.
   */
  tea: z.object({ pct: z.number(), governing: z.enum(['absolute', 'percent', 'both']) }).nullable(),
  cumulative: z.object({
    lab: labFiguresSchema.nullable(),
    peer: peerFiguresSchema.nullable(),
    sdi: z.number().nullable(),
    cvr: z.number().nullable(),
    /** Set when the lot-to-date comparison cannot be computed. */
    notComputable: notComputableSchema.nullable(),
  }),
  /** Set when the month's comparison cannot be computed; SDI, CVR, bias, sigma and flags are then absent. */
  notComputable: notComputableSchema.nullable(),
  /** Set when this lab's data was left out of the peer figures. */
  excluded: z.object({ reason: z.enum(['outlier', 'manual']), note: z.string().nullable() }).nullable(),
  flags: z.array(flagSchema),
});
export type PeerReportRow = z.infer<typeof peerReportRowSchema>;

export const peerReportSchema = z.object({
  period: periodKeySchema,
  lab: z.object({ id: uuidSchema, code: z.string(), name: z.string() }),
  /** The unit system the means and SDs are shown in (the query's `units`, else the lab's preference). */
  units: preferredUnitsSchema,
  /** The published snapshot the peer figures come from; null while they are provisional. */
  published: z.object({ version: z.number().int(), publishedAt: z.string() }).nullable(),
  /**
   * True while newly stored data of this period (or an earlier one) is still being folded into the peer
   * figures; they are recomputed within seconds, so refetch shortly.
   */
  statisticsPending: z.boolean(),
  rows: z.array(peerReportRowSchema),
});
export type PeerReport = z.infer<typeof peerReportSchema>;

export const peerReportQuerySchema = z.object({
  period: periodKeySchema,
  /** 'si' or 'conventional'; default: the lab's preferred units. */
  units: preferredUnitsSchema.optional(),
});
