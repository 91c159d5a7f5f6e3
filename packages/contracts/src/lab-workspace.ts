import { z } from 'zod';
import { periodKeySchema, uuidSchema } from './common.ts';
import { preferredUnitsSchema } from './network-labs.ts';
import { peerTierSchema } from './peer-report.ts';
import { uploadSummarySchema } from './uploads.ts';

/**
 * The lab workspace: overview, drill-down of one report row, comments and sign-off, the
 * lab's test menu, exports. Routes are listed in docs/api.md ("Lab workspace").
 */

/** 'si' (the analyte's canonical unit) or 'conventional' (the catalogue's conventional unit). */
export const unitSystemSchema = preferredUnitsSchema;
export type UnitSystem = z.infer<typeof unitSystemSchema>;

// ---------------------------------------------------------------------------------------------------
// Overview: GET /api/labs/:labId/overview

export const severityCountsSchema = z.object({
  fine: z.number().int(),
  acceptable: z.number().int(),
  warning: z.number().int(),
  action: z.number().int(),
});
export type SeverityCounts = z.infer<typeof severityCountsSchema>;

export const signoffSchema = z.object({
  labId: uuidSchema,
  period: periodKeySchema,
  statement: z.string(),
  signedBy: z.object({ id: uuidSchema, name: z.string() }),
  signedAt: z.string(),
});
export type Signoff = z.infer<typeof signoffSchema>;

export const attentionKinds = [
  /** The current period's deadline is near or past and no data has arrived. */
  'data-due',
  /** Active procedures without data in the current period. */
  'missing-data',
  /** The lab has no active measurement procedure. */
  'no-procedures',
  /** An upload waits for confirm / cancel. */
  'upload-needs-review',
  /** An upload failed. */
  'upload-failed',
  /** A past period with data that the supervisor has not signed. */
  'unsigned-period',
  /** Report rows with an action flag. */
  'action-flags',
  /** Report rows with a warning flag. */
  'warning-flags',
  /** Report rows whose comparison cannot be computed. */
  'rows-not-computable',
  /** A procedure's monthly SDI shifted (signalled in the latest period), with the nearest earlier event. */
  'shift-detected',
] as const;
export const attentionItemSchema = z.object({
  kind: z.enum(attentionKinds),
  severity: z.enum(['info', 'warning', 'action']),
  message: z.string(),
  period: periodKeySchema.nullable(),
  uploadId: uuidSchema.nullable(),
  /** How many rows / procedures / uploads the item is about. */
  count: z.number().int().nullable(),
});
export type AttentionItem = z.infer<typeof attentionItemSchema>;

export const labOverviewSchema = z.object({
  lab: z.object({ id: uuidSchema, code: z.string(), name: z.string(), preferredUnits: unitSystemSchema }),
  /**
   * The period labs are submitting for: the earliest open period, or the latest period when none is open;
   * null when no period exists.
   */
  currentPeriod: z
    .object({
      period: periodKeySchema,
      state: z.enum(['open', 'closed', 'published']),
      deadline: z.string(),
      /** The lab has stored data (any report row) for the period. */
      submitted: z.boolean(),
      /** Past the deadline with nothing submitted, or some data arrived after the period closed. */
      late: z.boolean(),
      /** Whole days until the deadline (negative when past). */
      daysToDeadline: z.number().int(),
      signoff: signoffSchema.nullable(),
    })
    .nullable(),
  /** Flags of the report for the latest period in which the lab has data (each SDI, CVR and exclusion flag counts once). */
  flags: z
    .object({
      period: periodKeySchema,
      published: z.boolean(),
      rows: z.number().int(),
      /** Rows by their worst flag (a row without flags counts as fine, unless it cannot be computed). */
      rowsBySeverity: severityCountsSchema,
      /** Rows whose comparison cannot be computed (not counted in rowsBySeverity). */
      rowsNotComputable: z.number().int(),
      bySeverity: severityCountsSchema,
    })
    .nullable(),
  /** The lab's five latest uploads, newest first. */
  recentUploads: z.array(uploadSummarySchema),
  /** What needs doing next, most urgent first. */
  attention: z.array(attentionItemSchema),
});
export type LabOverview = z.infer<typeof labOverviewSchema>;

// The peer report's unit preference lives in peer-report.ts (`peerReportQuerySchema.units`, `PeerReport.units`,
// per row `unit` = the unit shown, `canonicalUnit`, `decimals`).

// ---------------------------------------------------------------------------------------------------
// Drill-down of one report row: GET /api/labs/:labId/report-rows/:procedureId/:controlLotId/:level

export const drilldownQuerySchema = z.object({
  period: periodKeySchema,
  /** Target of the Levey-Jennings chart: the lab's established figures or the peers'. */
  target: z.enum(['lab', 'peer']).default('lab'),
  units: unitSystemSchema.optional(),
});
export type DrilldownQuery = z.infer<typeof drilldownQuerySchema>;

export const trendPointSchema = z.object({
  period: periodKeySchema,
  /** Null when the period has no sufficient peer comparison. */
  sdi: z.number().nullable(),
  cvr: z.number().nullable(),
  biasPct: z.number().nullable(),
  labMean: z.number(),
  labSd: z.number(),
  peerMean: z.number().nullable(),
  peerSd: z.number().nullable(),
  tier: peerTierSchema.nullable(),
  /** From a published snapshot (true) or provisional figures (false). */
  published: z.boolean(),
  /** Why SDI, CVR and bias cannot be computed for the period, when a peer comparison exists but fails. */
  notComputable: z.string().nullable().optional(),
});
export type TrendPoint = z.infer<typeof trendPointSchema>;

export const leveyJenningsPointSchema = z.object({
  measuredAt: z.string(),
  run: z.string(),
  value: z.number(),
  z: z.number(),
  /** Multirule violations of the point against the chosen target (docs/methods.md §4). */
  rules: z.array(z.string()),
});
export type LeveyJenningsPoint = z.infer<typeof leveyJenningsPointSchema>;

export const drilldownSchema = z.object({
  period: periodKeySchema,
  procedure: z.object({ id: uuidSchema, code: z.string() }),
  analyte: z.object({ code: z.string(), name: z.string() }),
  controlLot: z.object({ id: uuidSchema, lotNumber: z.string() }),
  level: z.number().int(),
  units: unitSystemSchema,
  /** Unit of every mean, SD and value below (SDI, CVR, bias %, z and uncertainty are unit-free). */
  unit: z.string(),
  decimals: z.number().int(),
  /** The peer group the row is compared with in this period (narrowest tier with enough labs). */
  peer: z.object({ tier: peerTierSchema, labs: z.number().int() }).nullable(),
  /** Up to the last 12 periods with lab data, oldest first, ending with `period`. */
  trend: z.array(trendPointSchema),
  /** Every member lab's mean in this period; others anonymous (no ids or codes). Null without a peer comparison. */
  distribution: z
    .object({
      labMeans: z.array(z.object({ mean: z.number(), own: z.boolean(), excluded: z.boolean() })),
      peerMean: z.number(),
      peerSd: z.number(),
    })
    .nullable(),
  /**
   * SDI at two levels of the lot for every lab of the peer group with data at both (x = `levels[0]`,
   * y = `levels[1]`); points near the diagonal suggest a systematic error. Null when the lot has one level
   * or a level has no peer comparison.
   */
  twoLevel: z
    .object({
      levels: z.tuple([z.number().int(), z.number().int()]),
      points: z.array(z.object({ sdi1: z.number(), sdi2: z.number(), own: z.boolean() })),
    })
    .nullable(),
  leveyJennings: z.object({
    /**
     * 'lab': the lab's figures for the lot and level from the periods before this one pooled
     * (basis 'established'), or this period's own figures when there are none (basis 'this-period');
     * 'peer': the peer group's lot-to-date figures (basis 'peer-to-date'), else this period's (basis 'peer-period').
     * Null when no target exists (then the points carry no z or rules: the list is empty).
     */
    target: z
      .object({
        kind: z.enum(['lab', 'peer']),
        basis: z.enum(['established', 'this-period', 'peer-to-date', 'peer-period']),
        mean: z.number(),
        sd: z.number(),
      })
      .nullable(),
    /** Daily values of the period (empty when the lab sent only a summary), in chronological run order. */
    points: z.array(leveyJenningsPointSchema),
    runs: z.array(
      z.object({
        run: z.string(),
        verdict: z.enum(['accept', 'warn', 'reject']),
        rules: z.array(z.string()),
      }),
    ),
  }),
  /**
   * Measurement uncertainty (docs/methods.md §3, Nordtest TR 537), all in %: u(Rw) = the lab's CV over the trend
   * periods pooled; u(bias) = √(RMS(bias)² + u(Cref)²) over the periods with a peer comparison; U = k·uc.
   * Null (with `uncertaintyNote`) when there is no peer comparison or no spread.
   */
  uncertainty: z
    .object({
      uRw: z.number(),
      rmsBias: z.number(),
      uRef: z.number(),
      uBias: z.number(),
      uc: z.number(),
      U: z.number(),
      k: z.number(),
      /** The pooled figures behind u(Rw). */
      longTerm: z.object({
        periods: z.number().int(),
        n: z.number().int(),
        mean: z.number(),
        sd: z.number(),
        cv: z.number(),
      }),
      comparisons: z.array(z.object({ period: periodKeySchema, biasPct: z.number(), uRefPct: z.number() })),
    })
    .nullable(),
  uncertaintyNote: z.string().nullable(),
  /**
   * Parts of the drill-down that cannot be computed, each with the reason (e.g. "2026-02: The peer SD
   * is 0, …"); the parts that can be computed are shown as usual.
   */
  notComputable: z.array(z.string()),
});
export type Drilldown = z.infer<typeof drilldownSchema>;

// ---------------------------------------------------------------------------------------------------
// Comments: POST/GET /api/labs/:labId/comments, PATCH/DELETE /api/labs/:labId/comments/:commentId

export const COMMENT_MAX_LENGTH = 4000;

export const commentCreateSchema = z.object({
  period: periodKeySchema,
  procedureId: uuidSchema,
  controlLotId: uuidSchema,
  level: z.number().int().min(1).max(9),
  body: z.string().trim().min(1, 'write the comment').max(COMMENT_MAX_LENGTH),
});
export type CommentCreate = z.infer<typeof commentCreateSchema>;

export const commentUpdateSchema = z.object({
  body: z.string().trim().min(1, 'write the comment').max(COMMENT_MAX_LENGTH),
});
export type CommentUpdate = z.infer<typeof commentUpdateSchema>;

export const commentListQuerySchema = z.object({ period: periodKeySchema.optional() });

export const commentSchema = z.object({
  id: uuidSchema,
  labId: uuidSchema,
  period: periodKeySchema,
  procedure: z.object({ id: uuidSchema, code: z.string() }),
  analyte: z.object({ code: z.string(), name: z.string() }),
  controlLot: z.object({ id: uuidSchema, lotNumber: z.string() }),
  level: z.number().int(),
  body: z.string(),
  author: z.object({ id: uuidSchema, name: z.string() }),
  createdAt: z.string(),
});
export type Comment = z.infer<typeof commentSchema>;
export const commentListSchema = z.array(commentSchema);

// ---------------------------------------------------------------------------------------------------
// Sign-off: POST /api/labs/:labId/signoffs, GET /api/labs/:labId/signoffs[/:period]

export const SIGNOFF_STATEMENT_MAX_LENGTH = 2000;

export const signoffCreateSchema = z.object({
  period: periodKeySchema,
  statement: z.string().trim().min(1, 'write the sign-off statement').max(SIGNOFF_STATEMENT_MAX_LENGTH),
});
export type SignoffCreate = z.infer<typeof signoffCreateSchema>;

/** GET /api/labs/:labId/signoffs/:period: `signoff` is null while the period is not signed. */
export const periodSignoffSchema = z.object({ period: periodKeySchema, signoff: signoffSchema.nullable() });
export type PeriodSignoff = z.infer<typeof periodSignoffSchema>;
export const signoffListSchema = z.array(signoffSchema);

// ---------------------------------------------------------------------------------------------------
// Test menu (the lab's measurement procedures): GET /api/labs/:labId/test-menu,
// POST /api/labs/:labId/procedures, PATCH /api/labs/:labId/procedures/:procedureId,
// POST /api/labs/:labId/procedures/:procedureId/retire | restore

/** A lab's short code for a procedure, as its files name it. */
export const procedureCodeSchema = z
  .string()
  .trim()
  .min(1, 'give a code')
  .max(32)
  .regex(
    /^[A-Za-z0-9][A-Za-z0-9._-]*$/,
    'use letters, digits, ".", "_" or "-" (starting with a letter or digit)',
  );

export const procedureCreateSchema = z.object({
  code: procedureCodeSchema,
  analyteId: uuidSchema,
  instrumentModelId: uuidSchema,
  methodId: uuidSchema,
  reagentId: uuidSchema,
  /** UCUM unit the lab reports in; must convert to the analyte's unit. */
  unit: z.string().trim().min(1).max(40),
  reason: z.string().trim().max(500).optional(),
});
export type ProcedureCreate = z.infer<typeof procedureCreateSchema>;

export const procedureUpdateSchema = z
  .object({
    code: procedureCodeSchema.optional(),
    unit: z.string().trim().min(1).max(40).optional(),
    reason: z.string().trim().max(500).optional(),
  })
  .refine((v) => v.code !== undefined || v.unit !== undefined, { message: 'give a new code or unit' });
export type ProcedureUpdate = z.infer<typeof procedureUpdateSchema>;

export const procedureStateChangeSchema = z.object({ reason: z.string().trim().max(500).optional() });

const catalogueRefSchema = z.object({ id: uuidSchema, code: z.string(), name: z.string() });

export const testMenuItemSchema = z.object({
  id: uuidSchema,
  code: z.string(),
  analyte: catalogueRefSchema.extend({
    loinc: z.string().nullable(),
    unit: z.string(),
    conventionalUnit: z.string().nullable(),
  }),
  instrumentModel: catalogueRefSchema,
  method: catalogueRefSchema,
  reagent: catalogueRefSchema,
  unit: z.string(),
  createdAt: z.string(),
  retiredAt: z.string().nullable(),
});
export type TestMenuItem = z.infer<typeof testMenuItemSchema>;
export const testMenuSchema = z.array(testMenuItemSchema);
