import { z } from 'zod';
import { periodKeySchema, uuidSchema } from './common.ts';
import { periodStateSchema } from './cycles.ts';
import { peerTierSchema } from './peer-report.ts';

// Peer groups for the coordinator: the groups of one control lot and analyte at each tier, with their
// members and figures, and the adjustments (merge, split, move, exclude) with preview and undo.

/** Every adjustment says why; the reason is kept in the audit log. */
const adjustmentReasonSchema = z
  .string({ message: 'say why; the reason is kept in the audit log' })
  .trim()
  .min(1, 'say why; the reason is kept in the audit log')
  .max(500);
const optionalReasonSchema = z
  .preprocess(
    (v) => (typeof v === 'string' && v.trim() === '' ? null : v),
    z.string().trim().max(500).nullable(),
  )
  .optional();
const levelSchema = z.number({ message: 'expected a control level (1–9)' }).int().min(1).max(9);

// ---------- the view ----------

export const peerGroupsQuerySchema = z.object({
  controlLotId: uuidSchema,
  analyteId: uuidSchema,
  level: z.coerce.number({ message: 'expected a control level (1–9)' }).int().min(1).max(9),
  period: periodKeySchema,
});
export type PeerGroupsQuery = z.infer<typeof peerGroupsQuerySchema>;

export const peerGroupAnalytesQuerySchema = z.object({ controlLotId: uuidSchema });

/** GET /api/peer-groups/analytes: the analytes with QC data on a control lot. */
export const peerGroupAnalyteSchema = z.object({
  id: uuidSchema,
  code: z.string(),
  name: z.string(),
  unit: z.string(),
});
export const peerGroupAnalyteListSchema = z.array(peerGroupAnalyteSchema);
export type PeerGroupAnalyte = z.infer<typeof peerGroupAnalyteSchema>;

export const excludedReasonSchema = z.enum(['outlier', 'manual']);

/** Figures of one group for one level and period (docs/methods.md §2); null where they cannot be computed. */
export const peerGroupFiguresSchema = z.object({
  labs: z.number().int(),
  n: z.number().int(),
  mean: z.number().nullable(),
  sd: z.number().nullable(),
  cv: z.number().nullable(),
  withinSd: z.number().nullable(),
  withinCv: z.number().nullable(),
  robustMean: z.number().nullable(),
  robustSd: z.number().nullable(),
  /** At least the minimum number of labs remain. */
  sufficient: z.boolean(),
  excluded: z.array(
    z.object({ procedureId: uuidSchema, reason: excludedReasonSchema, note: z.string().nullable() }),
  ),
});
export type PeerGroupFigures = z.infer<typeof peerGroupFiguresSchema>;

const namedSchema = z.object({ id: uuidSchema, name: z.string() });
/** The coordinator sees both: the code keeps labs anonymous to each other, the name is for the network. */
export const peerGroupLabSchema = z.object({ id: uuidSchema, code: z.string(), name: z.string() });

export const peerGroupMemberSchema = z.object({
  procedureId: uuidSchema,
  procedureCode: z.string(),
  lab: peerGroupLabSchema,
  instrumentModel: namedSchema,
  method: namedSchema,
  reagent: namedSchema,
  /** Placed in this group by a coordinator's move or split rather than by the grouping rule. */
  assigned: z.boolean(),
  /** The member's figures for the level and period; null when it sent none. */
  data: z
    .object({
      n: z.number().int(),
      mean: z.number(),
      sd: z.number(),
      cv: z.number().nullable(),
      late: z.boolean(),
    })
    .nullable(),
  /** Left out of the group's provisional figures, and why. */
  excluded: z.object({ reason: excludedReasonSchema, note: z.string().nullable() }).nullable(),
});
export type PeerGroupMember = z.infer<typeof peerGroupMemberSchema>;

export const peerGroupSchema = z.object({
  id: uuidSchema,
  tier: peerTierSchema,
  key: z.string(),
  label: z.string(),
  /** Groups merged into this one. */
  mergedFrom: z.array(z.object({ id: uuidSchema, label: z.string() })),
  members: z.array(peerGroupMemberSchema),
  /** Labs with data for the level and period, before any exclusion. */
  labsWithData: z.number().int(),
  /** The current (version 0) figures of the period. */
  provisional: peerGroupFiguresSchema.nullable(),
  /** Set when the last recompute could not compute the provisional figures (they are then null). */
  notComputable: z.object({ reason: z.string(), failedAt: z.string() }).nullable().optional(),
  /** The figures of the period's latest publication. */
  published: peerGroupFiguresSchema.extend({ version: z.number().int() }).nullable(),
});
export type PeerGroup = z.infer<typeof peerGroupSchema>;

export const peerExclusionSchema = z.object({
  id: uuidSchema,
  procedureId: uuidSchema,
  procedureCode: z.string(),
  lab: peerGroupLabSchema,
  /** Null: every level. */
  level: z.number().int().nullable(),
  period: periodKeySchema,
  reason: z.string(),
  createdAt: z.string(),
});
export type PeerExclusion = z.infer<typeof peerExclusionSchema>;

export const peerGroupsViewSchema = z.object({
  controlLot: z.object({ id: uuidSchema, lotNumber: z.string(), levels: z.array(z.number().int()) }),
  analyte: z.object({
    id: uuidSchema,
    code: z.string(),
    name: z.string(),
    unit: z.string(),
    decimals: z.number().int(),
  }),
  level: z.number().int(),
  period: periodKeySchema,
  /** Null when no such period exists. */
  periodState: periodStateSchema.nullable(),
  publication: z.object({ version: z.number().int(), publishedAt: z.string() }).nullable(),
  minLabs: z.number().int(),
  tiers: z.array(z.object({ tier: peerTierSchema, groups: z.array(peerGroupSchema) })),
  /** The coordinator's exclusions in force for this lot and period. */
  exclusions: z.array(peerExclusionSchema),
});
export type PeerGroupsView = z.infer<typeof peerGroupsViewSchema>;

// ---------- adjustments ----------

export const adjustmentKinds = ['merge', 'split', 'move', 'exclude'] as const;
export const adjustmentKindSchema = z.enum(adjustmentKinds);
export type AdjustmentKind = z.infer<typeof adjustmentKindSchema>;

export const splitCriteria = ['reagent', 'instrumentModel'] as const;
export const splitCriterionSchema = z.enum(splitCriteria);
export type SplitCriterion = z.infer<typeof splitCriterionSchema>;

/** Which figures a preview shows: the period, and one level (every level of the lot when left out). */
const previewContext = { period: periodKeySchema, level: levelSchema.optional() };

export const mergeRequestSchema = z.object({
  /** The group that is merged away. */
  sourceGroupId: uuidSchema,
  /** The group that stays and takes the source's members. */
  targetGroupId: uuidSchema,
  reason: adjustmentReasonSchema,
});
export const mergePreviewRequestSchema = mergeRequestSchema.omit({ reason: true }).extend(previewContext);
export type MergeRequest = z.infer<typeof mergeRequestSchema>;
export type MergePreviewRequest = z.infer<typeof mergePreviewRequestSchema>;

export const splitRequestSchema = z.object({
  groupId: uuidSchema,
  by: splitCriterionSchema,
  reason: adjustmentReasonSchema,
});
export const splitPreviewRequestSchema = splitRequestSchema.omit({ reason: true }).extend(previewContext);
export type SplitRequest = z.infer<typeof splitRequestSchema>;
export type SplitPreviewRequest = z.infer<typeof splitPreviewRequestSchema>;

export const moveRequestSchema = z.object({
  procedureId: uuidSchema,
  /** A group of the same lot, analyte and tier; the procedure leaves its group at that tier. */
  targetGroupId: uuidSchema,
  reason: adjustmentReasonSchema,
});
export const movePreviewRequestSchema = moveRequestSchema.omit({ reason: true }).extend(previewContext);
export type MoveRequest = z.infer<typeof moveRequestSchema>;
export type MovePreviewRequest = z.infer<typeof movePreviewRequestSchema>;

export const exclusionRequestSchema = z.object({
  procedureId: uuidSchema,
  controlLotId: uuidSchema,
  period: periodKeySchema,
  /** Leave out (or null) to exclude every level. */
  level: levelSchema.nullable().optional(),
  reason: adjustmentReasonSchema,
});
/** The reason is optional here; when given, the preview shows it as the exclusion's note. */
export const exclusionPreviewRequestSchema = exclusionRequestSchema.extend({
  reason: z.string().trim().max(500).optional(),
});
export type ExclusionRequest = z.infer<typeof exclusionRequestSchema>;
export type ExclusionPreviewRequest = z.infer<typeof exclusionPreviewRequestSchema>;

export const previewGroupSchema = z.object({
  /** Null for a group the change would create. */
  id: uuidSchema.nullable(),
  tier: peerTierSchema,
  label: z.string(),
  members: z.array(z.object({ procedureId: uuidSchema, procedureCode: z.string(), lab: peerGroupLabSchema })),
  /** Null when no member has data for the level and period, or when they cannot be computed. */
  figures: peerGroupFiguresSchema.nullable(),
  /** Why the figures cannot be computed, when they cannot. */
  notComputable: z.object({ reason: z.string() }).nullable().optional(),
});
export type PreviewGroup = z.infer<typeof previewGroupSchema>;

/** The figures of the groups a change touches, before and after it; nothing is written. */
export const adjustmentPreviewSchema = z.object({
  kind: adjustmentKindSchema,
  description: z.string(),
  period: periodKeySchema,
  levels: z.array(
    z.object({
      level: z.number().int(),
      before: z.array(previewGroupSchema),
      after: z.array(previewGroupSchema),
    }),
  ),
});
export type AdjustmentPreview = z.infer<typeof adjustmentPreviewSchema>;

export const peerGroupAdjustmentSchema = z.object({
  /** The audit event that recorded the adjustment. */
  id: z.number().int(),
  kind: adjustmentKindSchema,
  description: z.string(),
  reason: z.string(),
  at: z.string(),
  actor: z.object({ id: uuidSchema, name: z.string() }).nullable(),
  controlLotId: uuidSchema,
  analyteId: uuidSchema,
  /** Exclusions only. */
  period: periodKeySchema.nullable(),
  undone: z
    .object({
      at: z.string(),
      actor: z.object({ id: uuidSchema, name: z.string() }).nullable(),
      reason: z.string().nullable(),
    })
    .nullable(),
});
export type PeerGroupAdjustment = z.infer<typeof peerGroupAdjustmentSchema>;
export const peerGroupAdjustmentListSchema = z.array(peerGroupAdjustmentSchema);

export const adjustmentListQuerySchema = z.object({
  controlLotId: uuidSchema.optional(),
  analyteId: uuidSchema.optional(),
});
export const adjustmentUndoSchema = z.object({ reason: optionalReasonSchema });
export type AdjustmentUndo = z.infer<typeof adjustmentUndoSchema>;

/** A peer group whose provisional figures the last recompute could not compute (the others were computed). */
export const peerStatisticsFailureSchema = z.object({
  peerGroupId: uuidSchema,
  tier: peerTierSchema,
  groupLabel: z.string(),
  controlLot: z.object({ id: uuidSchema, lotNumber: z.string() }),
  analyte: z.object({ id: uuidSchema, code: z.string(), name: z.string() }),
  level: z.number().int(),
  period: periodKeySchema,
  /** 'period' (the month's figures) or 'cumulative' (lot to date). */
  scope: z.enum(['period', 'cumulative']),
  reason: z.string(),
  failedAt: z.string(),
});
export type PeerStatisticsFailure = z.infer<typeof peerStatisticsFailureSchema>;
export const peerStatisticsFailureListSchema = z.array(peerStatisticsFailureSchema);
export const peerStatisticsFailuresQuerySchema = z.object({ period: periodKeySchema.optional() });
