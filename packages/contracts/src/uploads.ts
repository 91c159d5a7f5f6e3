import { z } from 'zod';
import { uuidSchema } from './common.ts';

/** The QC file formats a lab can upload. */
export const qcUploadKinds = ['qc-summary', 'qc-values'] as const;
/** De-identified patient results for reference-interval studies: canonical CSV, or a FHIR R4 Bundle (JSON). */
export const patientUploadKinds = ['patient-results', 'fhir-bundle'] as const;
export const uploadKinds = [...qcUploadKinds, ...patientUploadKinds] as const;
export const uploadKindSchema = z.enum(uploadKinds);
export type UploadKind = z.infer<typeof uploadKindSchema>;
export type PatientUploadKind = (typeof patientUploadKinds)[number];
export const isPatientUploadKind = (kind: UploadKind): kind is PatientUploadKind =>
  (patientUploadKinds as readonly string[]).includes(kind);

/**
 * Life of an upload: queued → processing → stored; a file with rejected rows stops at needs-review until
 * the user confirms (store the valid rows) or cancels; a file that cannot be read at all ends failed.
 */
export const uploadStatuses = [
  'queued',
  'processing',
  'needs-review',
  'stored',
  'failed',
  'cancelled',
] as const;
export const uploadStatusSchema = z.enum(uploadStatuses);
export type UploadStatus = z.infer<typeof uploadStatusSchema>;

export type CanonicalColumn = { name: string; required: boolean; description: string };

/** Our own file formats: the canonical column names of each kind, in their documented order. */
export const canonicalColumns: Record<UploadKind, readonly CanonicalColumn[]> = {
  'qc-summary': [
    { name: 'period', required: true, description: 'month of the data, YYYY-MM' },
    {
      name: 'procedure',
      required: true,
      description: "the lab's code of a registered measurement procedure",
    },
    { name: 'control_lot', required: true, description: 'control lot number' },
    { name: 'level', required: true, description: 'control level, a whole number' },
    { name: 'n', required: true, description: 'number of values, at least 2' },
    { name: 'mean', required: true, description: 'mean of the values' },
    { name: 'sd', required: true, description: 'standard deviation (n − 1), greater than 0' },
    { name: 'unit', required: true, description: 'UCUM unit of mean and sd' },
  ],
  'qc-values': [
    {
      name: 'measured_at',
      required: true,
      description: 'date and time, ISO 8601 (YYYY-MM-DD or YYYY-MM-DDThh:mm[:ss][zone])',
    },
    {
      name: 'procedure',
      required: true,
      description: "the lab's code of a registered measurement procedure",
    },
    { name: 'control_lot', required: true, description: 'control lot number' },
    { name: 'level', required: true, description: 'control level, a whole number' },
    { name: 'value', required: true, description: 'the measured value' },
    { name: 'unit', required: true, description: 'UCUM unit of the value' },
    { name: 'run', required: false, description: 'run identifier; values with the same run form one run' },
    { name: 'comment', required: false, description: 'free text, at most 500 characters' },
  ],
  'patient-results': [
    { name: 'analyte', required: true, description: 'analyte code of the catalogue, or its LOINC code' },
    { name: 'value', required: true, description: 'the result' },
    { name: 'unit', required: true, description: 'UCUM unit of the value' },
    { name: 'sex', required: true, description: 'female or male (F or M)' },
    { name: 'age_years', required: true, description: 'age at collection in whole years' },
    {
      name: 'collected_month',
      required: true,
      description: 'month of collection, YYYY-MM (a full date is cut to its month)',
    },
    {
      name: 'setting',
      required: true,
      description: 'outpatient, inpatient, screening or emergency',
    },
    {
      name: 'sample_id',
      required: false,
      description: 'the lab’s own pseudonymous key of the person; stored only as a salted hash',
    },
  ],
  // A Bundle is read by its structure, not by columns.
  'fhir-bundle': [],
};

export const canonicalColumnNames = (kind: UploadKind): string[] => canonicalColumns[kind].map((c) => c.name);

/** Why a row (or the file) was rejected. */
export const rowErrorCodes = [
  'missing_column',
  'malformed_csv',
  'wrong_column_count',
  'required',
  'invalid_period',
  'unknown_period',
  'period_signed_off',
  'unknown_procedure',
  'unknown_control_lot',
  'unknown_level',
  'invalid_number',
  'invalid_integer',
  'n_too_small',
  'sd_not_positive',
  'invalid_timestamp',
  'invalid_unit',
  'direct_identifier',
  'unknown_analyte',
  'implausible_value',
  'invalid_sex',
  'invalid_age',
  'invalid_setting',
  'invalid_fhir',
  'unit_not_convertible',
  'too_long',
  'duplicate_row',
  'not_text',
  'duplicate_column',
  'not_finite',
  'out_of_range',
  'implausible_value',
  'mean_not_positive',
  'cv_too_high',
  'n_too_large',
  'formula_like',
] as const;
export const rowErrorCodeSchema = z.enum(rowErrorCodes);
export type RowErrorCode = z.infer<typeof rowErrorCodeSchema>;

/** `row` is the line number in the file, counting the header as line 1; `column` is the file's own header. */
export const rowErrorSchema = z.object({
  row: z.number().int().min(1),
  column: z.string().nullable(),
  code: rowErrorCodeSchema,
  message: z.string(),
});
export type RowError = z.infer<typeof rowErrorSchema>;

/** Every stored error message (and so every cell it quotes) is cut to this many characters. */
export const MAX_ERROR_TEXT_LENGTH = 200;

/** `text` cut to at most `max` characters, with an ellipsis when something was cut. */
export function boundText(text: string, max = MAX_ERROR_TEXT_LENGTH): string {
  return text.length <= max ? text : `${text.slice(0, max - 1)}…`;
}

/** Canonical column name → the file's own header. */
export const columnMappingSchema = z.record(z.string(), z.string().trim().min(1).max(200));
export type ColumnMapping = z.infer<typeof columnMappingSchema>;

/** Problems of a mapping for a kind: unknown canonical names, and one file column used twice. */
export function columnMappingProblems(kind: UploadKind, mapping: ColumnMapping): string[] {
  const known = new Set(canonicalColumnNames(kind));
  const problems: string[] = [];
  const used = new Map<string, string>();
  for (const [canonical, header] of Object.entries(mapping)) {
    if (!known.has(canonical)) {
      problems.push(
        `'${canonical}' is not a column of a ${kind} file (expected one of ${[...known].join(', ')})`,
      );
    }
    const earlier = used.get(header);
    if (earlier)
      problems.push(`the file column '${header}' is mapped to both '${earlier}' and '${canonical}'`);
    used.set(header, canonical);
  }
  return problems;
}

/** Multipart fields of POST /api/uploads besides `file`. `mapping` is JSON text of a ColumnMapping. */
export const uploadFieldsSchema = z.object({
  kind: uploadKindSchema,
  labId: uuidSchema.optional(),
  mapping: columnMappingSchema.optional(),
});
export type UploadFields = z.infer<typeof uploadFieldsSchema>;

export const uploadCreatedSchema = z.object({
  id: uuidSchema,
  status: uploadStatusSchema,
  /** An earlier upload of the same lab with byte-identical content. */
  duplicateOf: uuidSchema.optional(),
  message: z.string().optional(),
});
export type UploadCreated = z.infer<typeof uploadCreatedSchema>;

export const uploadSummarySchema = z.object({
  id: uuidSchema,
  labId: uuidSchema,
  kind: uploadKindSchema,
  filename: z.string(),
  size: z.number().int(),
  sha256: z.string(),
  status: uploadStatusSchema,
  progress: z.number().min(0).max(1),
  rowsTotal: z.number().int(),
  rowsAccepted: z.number().int(),
  rowsRejected: z.number().int(),
  failureMessage: z.string().nullable(),
  duplicateOf: uuidSchema.nullable(),
  /** 'user' for a signed-in person, 'api-token' for a lab's machine token. */
  via: z.enum(['user', 'api-token']),
  uploadedBy: z.object({ id: uuidSchema, name: z.string() }).nullable(),
  createdAt: z.string(),
  storedAt: z.string().nullable(),
  confirmedAt: z.string().nullable(),
});
export type UploadSummary = z.infer<typeof uploadSummarySchema>;

export const uploadDetailSchema = uploadSummarySchema.extend({
  errors: z.array(rowErrorSchema),
  /** Row errors found in the file; more than `errors` holds when the stored list was capped. */
  errorsTotal: z.number().int().min(0),
  /** True when only the first of the row errors were kept (errorsTotal > errors.length). */
  errorsTruncated: z.boolean(),
  columnMapping: columnMappingSchema.nullable(),
});
export type UploadDetail = z.infer<typeof uploadDetailSchema>;

export const uploadListSchema = z.array(uploadSummarySchema);
export const uploadListQuerySchema = z.object({ labId: uuidSchema.optional() });

export const delimiters = [',', ';', '\t'] as const;
export const delimiterSchema = z.enum(delimiters);
export type Delimiter = z.infer<typeof delimiterSchema>;

/** What POST /api/uploads/preview found in the first lines of a file. */
export const uploadPreviewSchema = z.object({
  kind: uploadKindSchema,
  delimiter: delimiterSchema,
  decimalComma: z.boolean(),
  bom: z.boolean(),
  headers: z.array(z.string()),
  /** The first data rows as text cells. */
  rows: z.array(z.array(z.string())),
  /** Canonical column → the file header it will read from (null when none matches). */
  suggestedMapping: z.record(z.string(), z.string().nullable()),
  mappingSource: z.enum(['saved', 'detected']),
  /** Required canonical columns that no file header matches yet. */
  missingColumns: z.array(z.string()),
  columns: z.array(z.object({ name: z.string(), required: z.boolean(), description: z.string() })),
});
export type UploadPreview = z.infer<typeof uploadPreviewSchema>;

export const columnMappingResponseSchema = z.object({
  kind: uploadKindSchema,
  mapping: columnMappingSchema.nullable(),
  updatedAt: z.string().nullable(),
});
export type ColumnMappingResponse = z.infer<typeof columnMappingResponseSchema>;

export const columnMappingUpdateSchema = z.object({ mapping: columnMappingSchema });
