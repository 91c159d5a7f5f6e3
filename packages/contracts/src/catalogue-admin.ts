import { z } from 'zod';
import { uuidSchema } from './common.ts';

/** The catalogue lists the coordinator manages, as they appear in URLs (/api/catalogue/<list>). */
export const catalogueLists = [
  'analytes',
  'methods',
  'instrument-models',
  'reagents',
  'control-materials',
  'control-lots',
] as const;
export const catalogueListSchema = z.enum(catalogueLists);
export type CatalogueList = z.infer<typeof catalogueListSchema>;

/**
 * LOINC check digit: the mod-10 scheme of the LOINC Users' Guide (the same as Luhn): from the right,
 * double every other digit starting with the rightmost, add all resulting digits, and take what is
 * needed to reach the next multiple of ten.
 */
export function loincCheckDigit(base: string): number {
  let sum = 0;
  for (let i = 0; i < base.length; i++) {
    let digit = Number(base[base.length - 1 - i]);
    if (i % 2 === 0) {
      digit *= 2;
      if (digit > 9) digit -= 9;
    }
    sum += digit;
  }
  return (10 - (sum % 10)) % 10;
}

const LOINC_FORMAT = /^(\d{1,7})-(\d)$/;

/** Explains what is wrong with a LOINC code, or returns null when it is well formed with a matching check digit. */
export function loincProblem(code: string): string | null {
  const match = LOINC_FORMAT.exec(code);
  if (!match) return 'expected a LOINC code as digits, a hyphen and a check digit, e.g. 2345-7';
  const expected = loincCheckDigit(match[1]);
  if (expected !== Number(match[2]))
    return `LOINC check digit does not match: ${match[1]}-${expected} expected`;
  return null;
}

/** Blank strings from forms and CSV cells mean "no value". */
const blankToNull = (value: unknown) => (typeof value === 'string' && value.trim() === '' ? null : value);

/** An optional, clearable text field: undefined leaves a stored value alone, null (or '') clears it. */
const optionalText = (max: number) =>
  z.preprocess(blankToNull, z.string().trim().max(max).nullable()).optional();

export const catalogueCodeSchema = z
  .string()
  .trim()
  .regex(/^[A-Za-z0-9][A-Za-z0-9._-]{0,39}$/, 'use 1 to 40 letters, digits, dots, hyphens or underscores');
const nameSchema = z.string().trim().min(1, 'enter a name').max(200);

export const loincCodeSchema = z
  .string()
  .trim()
  .superRefine((code, ctx) => {
    const problem = loincProblem(code);
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  });

/** A UCUM unit string; whether UCUM knows it is checked by the API (the UCUM library is not in contracts). */
export const ucumUnitSchema = z.string().trim().min(1, 'enter a UCUM unit').max(60);

// ---------- analytes ----------

const plausibleLimit = z.number().min(-1e12).max(1e12).nullable().optional();

/** true/false, yes/no, 1/0 as CSV cells write them; anything else is left for the schema to refuse. */
const textToBoolean = (value: unknown) => {
  if (typeof value !== 'string') return value;
  const text = value.trim().toLowerCase();
  if (['true', 'yes', '1'].includes(text)) return true;
  if (['false', 'no', '0'].includes(text)) return false;
  return value;
};

const analyteFields = {
  code: catalogueCodeSchema,
  name: nameSchema,
  loinc: z.preprocess(blankToNull, loincCodeSchema.nullable()).optional(),
  /** Canonical UCUM unit: values are stored in it. */
  unit: ucumUnitSchema,
  conventionalUnit: z.preprocess(blankToNull, ucumUnitSchema.nullable()).optional(),
  /** g/mol */
  molarMass: z.number().positive('must be greater than 0').max(10_000_000).nullable().optional(),
  decimals: z.number().int('must be a whole number').min(0).max(6).optional(),
  /** Total allowable error, percent. */
  teaPct: z
    .number()
    .positive('must be greater than 0')
    .max(100, 'must be at most 100 %')
    .nullable()
    .optional(),
  /**
   * Absolute part of the total allowable error, in the analyte's unit: published rules read "± teaAbsolute
   * or ± teaPct %, whichever is greater" at the control's concentration.
   */
  teaAbsolute: z.number().positive('must be greater than 0').max(1e9).nullable().optional(),
  teaSource: optionalText(300),
  teaDate: z.preprocess(blankToNull, z.iso.date('expected a date as YYYY-MM-DD').nullable()).optional(),
  /** Plausibility limits in the analyte's unit: a QC figure outside them is refused at upload. */
  plausibleLow: plausibleLimit,
  plausibleHigh: plausibleLimit,
  /** Where the limits come from, or "common practice". */
  plausibilitySource: optionalText(300),
  /** Whether results can be below zero (e.g. base excess); when not, a monthly mean must be > 0. */
  allowsNegative: z.preprocess(textToBoolean, z.boolean()).optional(),
};
export const analyteCreateSchema = z.object({ ...analyteFields, reason: optionalText(500) });
export const analyteUpdateSchema = z.object({ ...partialFields(analyteFields), reason: optionalText(500) });
export type AnalyteCreate = z.infer<typeof analyteCreateSchema>;
export type AnalyteUpdate = z.infer<typeof analyteUpdateSchema>;

// ---------- methods, instrument models, reagents, control materials ----------

const methodFields = { code: catalogueCodeSchema, name: nameSchema, principle: optionalText(200) };
export const methodCreateSchema = z.object({ ...methodFields, reason: optionalText(500) });
export const methodUpdateSchema = z.object({ ...partialFields(methodFields), reason: optionalText(500) });

const instrumentModelFields = {
  code: catalogueCodeSchema,
  name: nameSchema,
  manufacturer: optionalText(200),
};
export const instrumentModelCreateSchema = z.object({ ...instrumentModelFields, reason: optionalText(500) });
export const instrumentModelUpdateSchema = z.object({
  ...partialFields(instrumentModelFields),
  reason: optionalText(500),
});

const reagentFields = { code: catalogueCodeSchema, name: nameSchema, manufacturer: optionalText(200) };
export const reagentCreateSchema = z.object({ ...reagentFields, reason: optionalText(500) });
export const reagentUpdateSchema = z.object({ ...partialFields(reagentFields), reason: optionalText(500) });

const controlMaterialFields = {
  code: catalogueCodeSchema,
  name: nameSchema,
  manufacturer: optionalText(200),
  matrix: optionalText(200),
};
export const controlMaterialCreateSchema = z.object({ ...controlMaterialFields, reason: optionalText(500) });
export const controlMaterialUpdateSchema = z.object({
  ...partialFields(controlMaterialFields),
  reason: optionalText(500),
});

// ---------- control lots ----------

export const controlLotLevelSchema = z.object({
  level: z.number().int('must be a whole number').min(1).max(9),
  description: optionalText(200),
});
const controlLotLevelsSchema = z
  .array(controlLotLevelSchema)
  .min(1, 'give at least one level')
  .max(9)
  .superRefine((levels, ctx) => {
    const seen = new Set<number>();
    levels.forEach((l, i) => {
      if (seen.has(l.level))
        ctx.addIssue({ code: 'custom', path: [i, 'level'], message: `level ${l.level} is listed twice` });
      seen.add(l.level);
    });
  });
const controlLotFields = {
  materialId: uuidSchema,
  lotNumber: catalogueCodeSchema,
  expiresOn: z.iso.date('expected a date as YYYY-MM-DD'),
  levels: controlLotLevelsSchema,
};
export const controlLotCreateSchema = z.object({ ...controlLotFields, reason: optionalText(500) });
export const controlLotUpdateSchema = z.object({
  ...partialFields(controlLotFields),
  reason: optionalText(500),
});
export type ControlLotCreate = z.infer<typeof controlLotCreateSchema>;
export type ControlLotUpdate = z.infer<typeof controlLotUpdateSchema>;

/** Body of retire and restore: an optional reason, kept in the audit log. */
export const catalogueStateChangeSchema = z.object({ reason: optionalText(500) });

// ---------- items as returned ----------

const retirable = { retiredAt: z.string().nullable(), retired: z.boolean() };
export const analyteItemSchema = z.object({
  id: uuidSchema,
  code: z.string(),
  name: z.string(),
  loinc: z.string().nullable(),
  unit: z.string(),
  conventionalUnit: z.string().nullable(),
  molarMass: z.number().nullable(),
  decimals: z.number(),
  teaPct: z.number().nullable(),
  teaAbsolute: z.number().nullable(),
  teaSource: z.string().nullable(),
  teaDate: z.string().nullable(),
  plausibleLow: z.number().nullable(),
  plausibleHigh: z.number().nullable(),
  plausibilitySource: z.string().nullable(),
  allowsNegative: z.boolean(),
  ...retirable,
});
export const methodItemSchema = z.object({
  id: uuidSchema,
  code: z.string(),
  name: z.string(),
  principle: z.string().nullable(),
  ...retirable,
});
export const instrumentModelItemSchema = z.object({
  id: uuidSchema,
  code: z.string(),
  name: z.string(),
  manufacturer: z.string().nullable(),
  ...retirable,
});
export const reagentItemSchema = instrumentModelItemSchema;
export const controlMaterialItemSchema = instrumentModelItemSchema.extend({ matrix: z.string().nullable() });
export const controlLotItemSchema = z.object({
  id: uuidSchema,
  material: z.object({ id: uuidSchema, code: z.string(), name: z.string() }),
  lotNumber: z.string(),
  expiresOn: z.string(),
  expired: z.boolean(),
  state: z.enum(['active', 'retired']),
  levels: z.array(z.object({ level: z.number(), description: z.string().nullable() })),
  retired: z.boolean(),
});
export type AnalyteItem = z.infer<typeof analyteItemSchema>;
export type MethodItem = z.infer<typeof methodItemSchema>;
export type InstrumentModelItem = z.infer<typeof instrumentModelItemSchema>;
export type ReagentItem = z.infer<typeof reagentItemSchema>;
export type ControlMaterialItem = z.infer<typeof controlMaterialItemSchema>;
export type ControlLotItem = z.infer<typeof controlLotItemSchema>;

// ---------- list query ----------

/** Columns each list may be sorted by. */
export const catalogueSortColumns = {
  analytes: ['code', 'name', 'loinc', 'unit'],
  methods: ['code', 'name'],
  'instrument-models': ['code', 'name', 'manufacturer'],
  reagents: ['code', 'name', 'manufacturer'],
  'control-materials': ['code', 'name', 'manufacturer'],
  'control-lots': ['lotNumber', 'expiresOn', 'material', 'state'],
} as const satisfies Record<CatalogueList, readonly string[]>;

export const catalogueListQuerySchema = z.object({
  /** Case-insensitive search in codes and names (and LOINC code, lot number). */
  q: z.string().trim().max(100).optional(),
  sort: z.string().max(40).optional(),
  order: z.enum(['asc', 'desc']).default('asc'),
  state: z.enum(['active', 'retired', 'all']).default('all'),
  limit: z.coerce.number().int().min(1).max(500).default(50),
  offset: z.coerce.number().int().min(0).default(0),
});
export type CatalogueListQuery = z.infer<typeof catalogueListQuerySchema>;

export type CataloguePage<T> = { total: number; items: T[] };

// ---------- CSV import ----------

export const catalogueImportQuerySchema = z.object({ dryRun: z.stringbool().default(true) });

export const importRowSchema = z.object({
  /** Row of the file as a spreadsheet numbers it: the header is row 1. */
  row: z.number(),
  action: z.enum(['create', 'update', 'error']),
  data: z.record(z.string(), z.unknown()).optional(),
  /** For an update: the fields that change (empty when the row matches what is stored). */
  changes: z.array(z.string()).optional(),
  errors: z.array(z.object({ column: z.string(), message: z.string() })).optional(),
});
export type ImportRow = z.infer<typeof importRowSchema>;

export const importResultSchema = z.object({
  rows: z.array(importRowSchema),
  created: z.number(),
  updated: z.number(),
  rejected: z.number(),
  /** False for a preview (dryRun=true). */
  applied: z.boolean(),
});
export type ImportResult = z.infer<typeof importResultSchema>;

/** CSV columns per list; the first is the key that decides between create and update. */
export const catalogueCsvColumns = {
  analytes: {
    required: ['code', 'name', 'unit'],
    optional: [
      'loinc',
      'conventional_unit',
      'molar_mass',
      'decimals',
      'tea_pct',
      'tea_absolute',
      'tea_source',
      'tea_date',
      'plausible_low',
      'plausible_high',
      'plausibility_source',
      'allows_negative',
    ],
  },
  methods: { required: ['code', 'name'], optional: ['principle'] },
  'instrument-models': { required: ['code', 'name'], optional: ['manufacturer'] },
  reagents: { required: ['code', 'name'], optional: ['manufacturer'] },
  'control-materials': { required: ['code', 'name'], optional: ['manufacturer', 'matrix'] },
  'control-lots': {
    required: ['lot_number', 'material_code', 'expires_on', 'levels'],
    optional: ['level_descriptions'],
  },
} as const satisfies Record<CatalogueList, { required: readonly string[]; optional: readonly string[] }>;

/** Makes every field optional (for PATCH bodies) while keeping each field's own checks. */
function partialFields<T extends Record<string, z.ZodType>>(
  fields: T,
): { [K in keyof T]: z.ZodOptional<T[K]> } {
  return Object.fromEntries(Object.entries(fields).map(([k, v]) => [k, v.optional()])) as {
    [K in keyof T]: z.ZodOptional<T[K]>;
  };
}
