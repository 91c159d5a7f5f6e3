import { z } from 'zod';
import {
  isFormulaLike,
  stripControlCharacters,
  type RowError,
  type RowErrorCode,
} from '@plumbline/contracts';
import { parseDecimal, parseWholeNumber } from './numbers.ts';
import { IssueFlag, reject, type Ctx } from './row-issues.ts';
import { plausibleFigure, plausibleSummary, shown } from './plausibility.ts';
import { parseMeasuredAt } from './timestamps.ts';
import { normalizeUnit, type Conversion, type UnitConverter } from './units.ts';

export { IssueFlag };

/** A lab's procedure as the rows refer to it by code. */
export type ProcedureInfo = {
  id: string;
  code: string;
  labId: string;
  analyteId: string;
  analyteName: string;
  /** The analyte's canonical UCUM unit: values are stored in it. */
  analyteUnit: string;
  molarMass: number | null;
  /** Plausibility limits of the analyte in `analyteUnit` (null: no limit on that side). */
  plausibleLow: number | null;
  plausibleHigh: number | null;
  plausibilitySource: string | null;
  /** Whether the quantity can be below zero; when not, a monthly mean must be > 0. */
  allowsNegative: boolean;
};
export type LotInfo = { id: string; lotNumber: string; levels: readonly number[] };
/** `signedOff`: the uploading lab's supervisor has signed this month off, so its data is read-only. */
export type PeriodInfo = { period: string; state: 'open' | 'closed' | 'published'; signedOff?: boolean };

/** What the rows are checked against: the lab's procedures, the known lots and periods, the file's number style. */
export type RowContext = {
  decimalComma: boolean;
  procedures: ReadonlyMap<string, ProcedureInfo>;
  lots: ReadonlyMap<string, LotInfo>;
  periods: ReadonlyMap<string, PeriodInfo>;
  units: UnitConverter;
  /** The network's settings: highest CV (%) and n of a monthly summary. */
  limits: { maxCvPct: number; maxN: number };
};

export const MAX_COMMENT_LENGTH = 500;
const PERIOD = /^(\d{4})-(0[1-9]|1[0-2])$/;

/**
 * The rows are checked with one zod schema per file kind: an object of text cells, then one transform
 * that checks every cell (in column order, all problems of a row reported) and resolves codes to the
 * catalogue. Field-by-field zod pipes cost several times more per row; a file can have a million rows.
 *
 * The transform's body is `checkValueCells` / `checkSummaryCells`, which only ever call `addIssue` on
 * their context. The ingest worker calls them directly with an `IssueFlag` for every row (no zod
 * object is built per row), and runs the zod schema only for a row that got an issue, to report it:
 * the same checks decide in both cases.
 */

/** The trimmed text of a required cell. */
function requiredText(ctx: Ctx, column: string, text: string): string | undefined {
  const value = text.trim();
  if (value === '') return reject(ctx, column, 'required', `${column} is empty`);
  return value;
}

function wholeNumberCell(
  ctx: Ctx,
  column: string,
  text: string,
  min: number,
  tooSmall: RowErrorCode,
): number | undefined {
  const t = requiredText(ctx, column, text);
  if (t === undefined) return undefined;
  const value = parseWholeNumber(t);
  if (value === null) return reject(ctx, column, 'invalid_integer', `${column} "${t}" is not a whole number`);
  if (value < min) return reject(ctx, column, tooSmall, `${column} must be at least ${min}, got ${value}`);
  return value;
}

function decimalCell(ctx: Ctx, column: string, text: string, context: RowContext): number | undefined {
  const t = requiredText(ctx, column, text);
  if (t === undefined) return undefined;
  const value = parseDecimal(t, context.decimalComma);
  if (value === null) {
    const hint =
      !context.decimalComma && /^[+-]?\d+,\d+$/.test(t)
        ? ' (a decimal comma is read only in semicolon-separated files; use a decimal point)'
        : '';
    return reject(ctx, column, 'invalid_number', `${column} "${t}" is not a number${hint}`);
  }
  return value;
}

/**
 * Codes never start with a character that makes a spreadsheet run the cell as a formula: such a cell
 * is refused, not stored (OWASP, "CSV Injection").
 */
function codeText(ctx: Ctx, column: string, text: string): string | undefined {
  const value = requiredText(ctx, column, text);
  if (value === undefined) return undefined;
  if (isFormulaLike(value)) {
    return reject(
      ctx,
      column,
      'formula_like',
      `${column} "${value}" starts with "${value[0]}", which a spreadsheet would run as a formula; codes cannot start with =, +, - or @`,
    );
  }
  return value;
}

function procedureCell(ctx: Ctx, text: string, context: RowContext): ProcedureInfo | undefined {
  const code = codeText(ctx, 'procedure', text);
  if (code === undefined) return undefined;
  const procedure = context.procedures.get(code) ?? context.procedures.get(code.toUpperCase());
  if (!procedure) {
    return reject(
      ctx,
      'procedure',
      'unknown_procedure',
      `"${code}" is not a registered measurement procedure of this lab`,
    );
  }
  return procedure;
}

function lotCell(ctx: Ctx, text: string, context: RowContext): LotInfo | undefined {
  const lotNumber = codeText(ctx, 'control_lot', text);
  if (lotNumber === undefined) return undefined;
  const lot = context.lots.get(lotNumber);
  if (!lot)
    return reject(
      ctx,
      'control_lot',
      'unknown_control_lot',
      `control lot "${lotNumber}" is not in the network's catalogue`,
    );
  return lot;
}

const signedOffMessage = (period: string) =>
  `${period} has been signed off by your lab's supervisor; its data can no longer change`;

function periodCell(ctx: Ctx, text: string, context: RowContext): PeriodInfo | undefined {
  const value = requiredText(ctx, 'period', text);
  if (value === undefined) return undefined;
  if (!PERIOD.test(value))
    return reject(ctx, 'period', 'invalid_period', `period "${value}" is not a month written as YYYY-MM`);
  const period = context.periods.get(value);
  if (!period) return reject(ctx, 'period', 'unknown_period', `${value} is not a cycle of the network`);
  if (period.signedOff) return reject(ctx, 'period', 'period_signed_off', signedOffMessage(value));
  return period;
}

function unitCell(ctx: Ctx, text: string, context: RowContext): string | undefined {
  const value = requiredText(ctx, 'unit', text);
  if (value === undefined) return undefined;
  const unit = normalizeUnit(value);
  const problem = context.units.problemWithUnit(unit);
  if (problem) return reject(ctx, 'unit', 'invalid_unit', problem);
  return unit;
}

/** Level known for the lot, and a unit convertible to the analyte's: the conversion, or null after adding issues. */
function levelAndUnit(
  ctx: Ctx,
  row: { procedure: ProcedureInfo; lot: LotInfo; level: number; unit: string },
  context: RowContext,
): Conversion | null {
  const levelKnown = row.lot.levels.includes(row.level);
  if (!levelKnown) {
    reject(
      ctx,
      'level',
      'unknown_level',
      `control lot ${row.lot.lotNumber} has levels ${row.lot.levels.join(', ')}, not ${row.level}`,
    );
  }
  const conversion = context.units.conversion(row.unit, row.procedure.analyteUnit, row.procedure.molarMass);
  if ('problem' in conversion) {
    reject(
      ctx,
      'unit',
      'unit_not_convertible',
      `${conversion.problem} (${row.procedure.analyteName} is stored in ${row.procedure.analyteUnit})`,
    );
    return null;
  }
  return levelKnown ? conversion : null;
}

export type SummaryRow = {
  procedure: ProcedureInfo;
  lot: LotInfo;
  level: number;
  period: PeriodInfo;
  n: number;
  /** In the analyte's canonical unit. */
  mean: number;
  sd: number;
};

const summaryCells = z.object({
  period: z.string(),
  procedure: z.string(),
  control_lot: z.string(),
  level: z.string(),
  n: z.string(),
  mean: z.string(),
  sd: z.string(),
  unit: z.string(),
});

export type SummaryCells = z.infer<typeof summaryCells>;

/** A qc-summary row: period, procedure, control_lot, level, n, mean, sd, unit. */
export function summaryRowSchema(context: RowContext) {
  return summaryCells.transform((cells, ctx): SummaryRow => checkSummaryCells(cells, ctx, context));
}

/** The checks of a qc-summary row; after an issue the result is not a row (z.NEVER). */
export function checkSummaryCells(cells: SummaryCells, ctx: Ctx, context: RowContext): SummaryRow {
  const period = periodCell(ctx, cells.period, context);
  const procedure = procedureCell(ctx, cells.procedure, context);
  const lot = lotCell(ctx, cells.control_lot, context);
  const level = wholeNumberCell(ctx, 'level', cells.level, 1, 'invalid_integer');
  const n = wholeNumberCell(ctx, 'n', cells.n, 2, 'n_too_small');
  const mean = decimalCell(ctx, 'mean', cells.mean, context);
  let sd = decimalCell(ctx, 'sd', cells.sd, context);
  const unit = unitCell(ctx, cells.unit, context);
  if (sd !== undefined && !(sd > 0))
    sd = reject(ctx, 'sd', 'sd_not_positive', `sd must be greater than 0, got ${sd}`);
  if (
    !period ||
    !procedure ||
    !lot ||
    level === undefined ||
    n === undefined ||
    mean === undefined ||
    unit === undefined
  ) {
    return z.NEVER;
  }
  const conversion = levelAndUnit(ctx, { procedure, lot, level, unit }, context);
  if (!conversion || sd === undefined) return z.NEVER;
  const converted = {
    mean: conversion.factor * mean + conversion.offset,
    sd: Math.abs(conversion.factor) * sd,
  };
  if (!plausibleSummary(ctx, { procedure, n, ...converted }, context)) return z.NEVER;
  return { procedure, lot, level, period, n, ...converted };
}

export type ValueRow = {
  procedure: ProcedureInfo;
  lot: LotInfo;
  level: number;
  period: PeriodInfo;
  measuredAtMs: number;
  /** In the analyte's canonical unit. */
  value: number;
  run: string | null;
  comment: string | null;
};

const valueCells = z.object({
  measured_at: z.string(),
  procedure: z.string(),
  control_lot: z.string(),
  level: z.string(),
  value: z.string(),
  unit: z.string(),
  run: z.string(),
  comment: z.string(),
});

function measuredAtCell(
  ctx: Ctx,
  text: string,
  context: RowContext,
): { ms: number; period: PeriodInfo } | undefined {
  const value = requiredText(ctx, 'measured_at', text);
  if (value === undefined) return undefined;
  const parsed = parseMeasuredAt(value);
  if ('problem' in parsed) return reject(ctx, 'measured_at', 'invalid_timestamp', parsed.problem);
  const period = context.periods.get(parsed.period);
  if (!period) {
    return reject(
      ctx,
      'measured_at',
      'unknown_period',
      `${parsed.period} (the month of ${value}) is not a cycle of the network`,
    );
  }
  if (period.signedOff)
    return reject(ctx, 'measured_at', 'period_signed_off', signedOffMessage(parsed.period));
  return { ms: parsed.ms, period };
}

export type ValueCells = z.infer<typeof valueCells>;

/** A qc-values row: measured_at, procedure, control_lot, level, value, unit, run, comment. */
export function valueRowSchema(context: RowContext) {
  return valueCells.transform((cells, ctx): ValueRow => checkValueCells(cells, ctx, context));
}

/** The checks of a qc-values row; after an issue the result is not a row (z.NEVER). */
export function checkValueCells(cells: ValueCells, ctx: Ctx, context: RowContext): ValueRow {
  const measuredAt = measuredAtCell(ctx, cells.measured_at, context);
  const procedure = procedureCell(ctx, cells.procedure, context);
  const lot = lotCell(ctx, cells.control_lot, context);
  const level = wholeNumberCell(ctx, 'level', cells.level, 1, 'invalid_integer');
  const value = decimalCell(ctx, 'value', cells.value, context);
  const unit = unitCell(ctx, cells.unit, context);
  const run = cells.run.trim() === '' ? null : codeText(ctx, 'run', cells.run);
  let comment: string | null | undefined = cells.comment.trim() || null;
  if (comment && comment.length > MAX_COMMENT_LENGTH) {
    comment = reject(ctx, 'comment', 'too_long', `comment is longer than ${MAX_COMMENT_LENGTH} characters`);
  }
  // Free text keeps its meaning: a comment a spreadsheet would run as a formula is stored behind an
  // apostrophe (OWASP's neutralisation), and its control characters are dropped.
  if (comment) comment = neutraliseText(comment);
  if (
    !measuredAt ||
    !procedure ||
    !lot ||
    level === undefined ||
    value === undefined ||
    unit === undefined ||
    run === undefined ||
    comment === undefined
  ) {
    return z.NEVER;
  }
  const conversion = levelAndUnit(ctx, { procedure, lot, level, unit }, context);
  if (!conversion) return z.NEVER;
  const converted = conversion.factor * value + conversion.offset;
  if (!plausibleFigure(ctx, 'value', converted, procedure)) return z.NEVER;
  if (!procedure.allowsNegative && converted < 0) {
    reject(
      ctx,
      'value',
      'implausible_value',
      `${procedure.analyteName} cannot be negative, got ${shown(converted)} ${procedure.analyteUnit}`,
    );
    return z.NEVER;
  }
  return {
    procedure,
    lot,
    level,
    period: measuredAt.period,
    measuredAtMs: measuredAt.ms,
    value: converted,
    run,
    comment,
  };
}

/** A free-text cell as stored: no control characters, and a formula-like start behind an apostrophe. */
export function neutraliseText(text: string): string {
  const clean = stripControlCharacters(text);
  return isFormulaLike(clean) ? `'${clean}` : clean;
}

/** zod issues of one row → row errors naming the file's own column header. */
export function rowErrorsOf(
  issues: readonly z.core.$ZodIssue[],
  line: number,
  headerOf: (canonical: string) => string | null,
): RowError[] {
  return issues.map((issue) => {
    const canonical = typeof issue.path[0] === 'string' ? issue.path[0] : null;
    const params = (issue as { params?: { code?: RowErrorCode } }).params;
    const column = canonical ? (headerOf(canonical) ?? canonical) : null;
    return {
      row: line,
      column,
      code: params?.code ?? 'required',
      message: params?.code ? issue.message : `${canonical ?? 'a value'} is missing or not text`,
    };
  });
}
