import { z } from 'zod';
import { periodKeySchema, uuidSchema } from './common.ts';

/** Caution shown beside every reference interval the service shows or exports. */
export const REFERENCE_INTERVAL_CAUTION =
  'Derived intervals must be reviewed and approved by the laboratory director before clinical use. ' +
  'These figures inform, and do not replace, the director’s decision under local regulation and accreditation.';

/** Care settings a patient result can come from (our own code list). */
export const patientSettings = ['outpatient', 'inpatient', 'screening', 'emergency'] as const;
export const patientSettingSchema = z.enum(patientSettings);
export type PatientSetting = z.infer<typeof patientSettingSchema>;

export const patientSexes = ['female', 'male'] as const;
export const patientSexSchema = z.enum(patientSexes);
export type PatientSex = z.infer<typeof patientSexSchema>;

/** Studies compute one partition per sex (or both together) and age band. */
export const partitionSexSchema = z.enum(['all', 'female', 'male']);
export type PartitionSex = z.infer<typeof partitionSexSchema>;

export const ageBandSchema = z
  .object({ low: z.number().int().min(0).max(120), high: z.number().int().min(0).max(120) })
  .refine((b) => b.low <= b.high, { message: 'an age band must run from its lower to its higher age' });
export type AgeBand = z.infer<typeof ageBandSchema>;

/** Which stored results a study reads. Months are inclusive; ages are whole years, inclusive. */
export const studySelectionSchema = z
  .object({
    fromMonth: periodKeySchema.optional(),
    toMonth: periodKeySchema.optional(),
    settings: z.array(patientSettingSchema).max(patientSettings.length).optional(),
    ageLow: z.number().int().min(0).max(120).default(18),
    ageHigh: z.number().int().min(0).max(120).default(120),
    sex: partitionSexSchema.default('all'),
  })
  .refine((s) => s.ageLow <= s.ageHigh, { message: 'ageLow must not be above ageHigh', path: ['ageLow'] })
  .refine((s) => !s.fromMonth || !s.toMonth || s.fromMonth <= s.toMonth, {
    message: 'fromMonth must not be after toMonth',
    path: ['fromMonth'],
  });
export type StudySelection = z.infer<typeof studySelectionSchema>;

export const studyPartitioningSchema = z.object({
  bySex: z.boolean().default(false),
  /** Age bands inside the selection's age range; empty means one band for the whole range. */
  ageBands: z.array(ageBandSchema).max(12).default([]),
});
export type StudyPartitioning = z.infer<typeof studyPartitioningSchema>;

/** Methods a study can use; the list is open so other methods can be added beside them. */
export const studyMethods = ['nonparametric', 'robust', 'indirect'] as const;
export const studyMethodSchema = z.enum(studyMethods);
export type StudyMethod = z.infer<typeof studyMethodSchema>;

export const outlierScreenings = ['tukey', 'dixon', 'none'] as const;
export const outlierScreeningSchema = z.enum(outlierScreenings);
export type OutlierScreening = z.infer<typeof outlierScreeningSchema>;

export const studyInputSchema = z.object({
  name: z.string().trim().min(1).max(200),
  analyteId: uuidSchema,
  labId: uuidSchema.optional(),
  selection: studySelectionSchema,
  partitioning: studyPartitioningSchema,
  method: studyMethodSchema,
  screening: outlierScreeningSchema,
});
export type StudyInput = z.infer<typeof studyInputSchema>;

export const studyStatuses = ['draft', 'queued', 'running', 'done', 'failed'] as const;
export const studyStatusSchema = z.enum(studyStatuses);
export type StudyStatus = z.infer<typeof studyStatusSchema>;

export const limitSchema = z.object({ value: z.number(), ci: z.tuple([z.number(), z.number()]).nullable() });

export const partitionKeySchema = z.object({
  sex: partitionSexSchema,
  ageLow: z.number().int(),
  ageHigh: z.number().int(),
});
export type PartitionKey = z.infer<typeof partitionKeySchema>;

export const histogramBinSchema = z.object({ from: z.number(), to: z.number(), count: z.number().int() });

export const partitionResultSchema = z.object({
  key: partitionKeySchema,
  label: z.string(),
  /** Values read before screening (after dropping repeats of the same sample key). */
  n: z.number().int(),
  /** Values removed by outlier screening (at most the first 5000 are listed). */
  excluded: z.array(z.number()),
  excludedCount: z.number().int(),
  method: studyMethodSchema,
  lower: limitSchema.nullable(),
  upper: limitSchema.nullable(),
  /** Why there are no limits, or no confidence intervals. */
  note: z.string().nullable(),
  histogram: z.array(histogramBinSchema),
  current: z.object({ lower: z.number(), upper: z.number(), source: z.string() }).nullable(),
});
export type PartitionResult = z.infer<typeof partitionResultSchema>;

export const partitionAdviceSchema = z.object({
  between: z.tuple([z.string(), z.string()]),
  z: z.number(),
  zCritical: z.number(),
  sdRatio: z.number(),
  partition: z.boolean(),
  advice: z.string(),
});
export type PartitionAdvice = z.infer<typeof partitionAdviceSchema>;

export const studyResultSchema = z.object({
  id: uuidSchema,
  version: z.number().int(),
  computedAt: z.string(),
  unit: z.string(),
  partitions: z.array(partitionResultSchema),
  advice: z.array(partitionAdviceSchema),
  approval: z.object({ approvedAt: z.string(), approvedBy: z.string(), statement: z.string() }).nullable(),
});
export type StudyResult = z.infer<typeof studyResultSchema>;

export const studySummarySchema = z.object({
  id: uuidSchema,
  labId: uuidSchema,
  name: z.string(),
  analyte: z.object({ id: uuidSchema, code: z.string(), name: z.string(), unit: z.string() }),
  selection: studySelectionSchema,
  partitioning: studyPartitioningSchema,
  method: studyMethodSchema,
  screening: outlierScreeningSchema,
  status: studyStatusSchema,
  progress: z.number(),
  failureMessage: z.string().nullable(),
  createdAt: z.string(),
  latestVersion: z.number().int().nullable(),
  approvedVersion: z.number().int().nullable(),
});
export type StudySummary = z.infer<typeof studySummarySchema>;

export const studyDetailSchema = studySummarySchema.extend({
  results: z.array(studyResultSchema),
  caution: z.string(),
});
export type StudyDetail = z.infer<typeof studyDetailSchema>;

export const studyCountQuerySchema = z.object({
  analyteId: uuidSchema,
  labId: uuidSchema.optional(),
  selection: studySelectionSchema,
});
export const studyCountSchema = z.object({ count: z.number().int() });

export const approvalInputSchema = z.object({ statement: z.string().trim().min(10).max(2000) });

export const currentIntervalInputSchema = z
  .object({
    labId: uuidSchema.optional(),
    analyteId: uuidSchema,
    sex: partitionSexSchema,
    ageLow: z.number().int().min(0).max(120),
    ageHigh: z.number().int().min(0).max(120),
    lower: z.number(),
    upper: z.number(),
    source: z.string().trim().min(1).max(500),
  })
  .refine((c) => c.lower < c.upper, { message: 'lower must be below upper', path: ['lower'] })
  .refine((c) => c.ageLow <= c.ageHigh, { message: 'ageLow must not be above ageHigh', path: ['ageLow'] });
export type CurrentIntervalInput = z.infer<typeof currentIntervalInputSchema>;

export const currentIntervalSchema = z.object({
  id: uuidSchema,
  labId: uuidSchema,
  analyte: z.object({ id: uuidSchema, code: z.string(), name: z.string(), unit: z.string() }),
  sex: partitionSexSchema,
  ageLow: z.number().int(),
  ageHigh: z.number().int(),
  lower: z.number(),
  upper: z.number(),
  source: z.string(),
  adoptedFrom: z.object({ studyId: uuidSchema, version: z.number().int() }).nullable(),
  updatedAt: z.string(),
});
export type CurrentInterval = z.infer<typeof currentIntervalSchema>;

export const adoptInputSchema = z.object({ resultId: uuidSchema, partition: z.string().min(1).max(100) });

export const verificationInputSchema = z.object({
  labId: uuidSchema.optional(),
  currentIntervalId: uuidSchema,
  values: z.array(z.number().finite()).length(20),
});
export type VerificationInput = z.infer<typeof verificationInputSchema>;

export const verificationRoundSchema = z.object({
  values: z.array(z.number()),
  outside: z.number().int(),
  accepted: z.boolean(),
});

export const verificationSchema = z.object({
  id: uuidSchema,
  labId: uuidSchema,
  analyte: z.object({ id: uuidSchema, code: z.string(), name: z.string(), unit: z.string() }),
  interval: z.object({
    sex: partitionSexSchema,
    ageLow: z.number().int(),
    ageHigh: z.number().int(),
    lower: z.number(),
    upper: z.number(),
    source: z.string(),
  }),
  rounds: z.array(verificationRoundSchema),
  status: z.enum(['accepted', 'collect-more', 'derive-locally']),
  nextStep: z.string(),
  approval: z.object({ approvedAt: z.string(), approvedBy: z.string(), statement: z.string() }).nullable(),
  createdAt: z.string(),
  caution: z.string(),
});
export type Verification = z.infer<typeof verificationSchema>;

export const verificationRoundInputSchema = z.object({ values: z.array(z.number().finite()).length(20) });
