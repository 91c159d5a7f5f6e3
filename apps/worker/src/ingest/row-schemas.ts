import { z } from 'zod';
import type { RowError, RowErrorCode } from '@plumbline/contracts';
import { parseDecimal, parseWholeNumber } from './numbers.ts';
import { parseMeasuredAt } from './timestamps.ts';
import { normalizeUnit, type UnitConverter } from './units.ts';

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
};
export type LotInfo = { id: string; lotNumber: string; levels: readonly number[] };
export type PeriodInfo = { period: string; state: 'open' | 'closed' | 'published' };

/** What the rows are checked against: the lab's procedures, the known lots and periods, the file's number style. */
export type RowContext = {
  decimalComma: boolean;
  procedures: ReadonlyMap<string, ProcedureInfo>;
  lots: ReadonlyMap<string, LotInfo>;
  periods: ReadonlyMap<string, PeriodInfo>;
  units: UnitConverter;
};

export const MAX_COMMENT_LENGTH = 500;
const PERIOD = /^(\d{4})-(0[1-9]|1[0-2])$/;

/** Adds an issue carrying our row error code; zod keeps the field path. */
function reject(ctx: z.RefinementCtx, code: RowErrorCode, message: string, path?: string[]): typeof z.NEVER {
  ctx.addIssue({ code: 'custom', message, params: { code }, ...(path ? { path } : {}) });
  return z.NEVER;
}

const cell = z.string().optional().default('');

const required = (name: string) =>
  cell.transform((text, ctx) => {
    const value = text.trim();
    if (value === '') return reject(ctx, 'required', `${name} is empty`);
    return value;
  });

const wholeNumber = (name: string, min: number, tooSmall: RowErrorCode) =>
  required(name).transform((text, ctx) => {
    const value = parseWholeNumber(text);
    if (value === null) return reject(ctx, 'invalid_integer', `${name} "${text}" is not a whole number`);
    if (value < min) return reject(ctx, tooSmall, `${name} must be at least ${min}, got ${value}`);
    return value;
  });

const decimal = (name: string, context: RowContext) =>
  required(name).transform((text, ctx) => {
    const value = parseDecimal(text, context.decimalComma);
    if (value === null) {
      const hint = !context.decimalComma && /^\s*[+-]?\d+,\d+\s*$/.test(text)
        ? ' (a decimal comma is read only in semicolon-separated files; use a decimal point)'
        : '';
      return reject(ctx, 'invalid_number', `${name} "${text}" is not a number${hint}`);
    }
    return value;
  });

const procedureField = (context: RowContext) =>
  required('procedure').transform((code, ctx) => {
    const procedure = context.procedures.get(code) ?? context.procedures.get(code.toUpperCase());
    if (!procedure) {
      return reject(ctx, 'unknown_procedure', `"${code}" is not a registered measurement procedure of this lab`);
    }
    return procedure;
  });

const lotField = (context: RowContext) =>
  required('control_lot').transform((lotNumber, ctx) => {
    const lot = context.lots.get(lotNumber);
    if (!lot) return reject(ctx, 'unknown_control_lot', `control lot "${lotNumber}" is not in the network's catalogue`);
    return lot;
  });

const periodField = (context: RowContext) =>
  required('period').transform((text, ctx) => {
    if (!PERIOD.test(text)) return reject(ctx, 'invalid_period', `period "${text}" is not a month written as YYYY-MM`);
    const period = context.periods.get(text);
    if (!period) return reject(ctx, 'unknown_period', `${text} is not a cycle of the network`);
    return period;
  });

const unitField = (context: RowContext) =>
  required('unit').transform((text, ctx) => {
    const unit = normalizeUnit(text);
    const problem = context.units.problemWithUnit(unit);
    if (problem) return reject(ctx, 'invalid_unit', problem);
    return unit;
  });

/** Level known for the lot, and a unit convertible to the analyte's: the conversion, or null after adding issues. */
function checkLevelAndUnit(
  row: { procedure: ProcedureInfo; control_lot: LotInfo; level: number; unit: string },
  context: RowContext,
  ctx: z.RefinementCtx,
) {
  const levelKnown = row.control_lot.levels.includes(row.level);
  if (!levelKnown) {
    reject(
      ctx,
      'unknown_level',
      `control lot ${row.control_lot.lotNumber} has levels ${row.control_lot.levels.join(', ')}, not ${row.level}`,
      ['level'],
    );
  }
  const conversion = context.units.conversion(row.unit, row.procedure.analyteUnit, row.procedure.molarMass);
  if ('problem' in conversion) {
    reject(ctx, 'unit_not_convertible', `${conversion.problem} (${row.procedure.analyteName} is stored in ${row.procedure.analyteUnit})`, ['unit']);
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

/** A qc-summary row: period, procedure, control_lot, level, n, mean, sd, unit. */
export function summaryRowSchema(context: RowContext) {
  return z
    .object({
      period: periodField(context),
      procedure: procedureField(context),
      control_lot: lotField(context),
      level: wholeNumber('level', 1, 'invalid_integer'),
      n: wholeNumber('n', 2, 'n_too_small'),
      mean: decimal('mean', context),
      sd: decimal('sd', context),
      unit: unitField(context),
    })
    .transform((row, ctx): SummaryRow => {
      const sdPositive = row.sd > 0;
      if (!sdPositive) reject(ctx, 'sd_not_positive', `sd must be greater than 0, got ${row.sd}`, ['sd']);
      const conversion = checkLevelAndUnit(row, context, ctx);
      if (!conversion || !sdPositive) return z.NEVER;
      return {
        procedure: row.procedure,
        lot: row.control_lot,
        level: row.level,
        period: row.period,
        n: row.n,
        mean: conversion.factor * row.mean + conversion.offset,
        sd: Math.abs(conversion.factor) * row.sd,
      };
    });
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

/** A qc-values row: measured_at, procedure, control_lot, level, value, unit, run, comment. */
export function valueRowSchema(context: RowContext) {
  return z
    .object({
      measured_at: required('measured_at').transform((text, ctx) => {
        const parsed = parseMeasuredAt(text);
        if ('problem' in parsed) return reject(ctx, 'invalid_timestamp', parsed.problem);
        const period = context.periods.get(parsed.period);
        if (!period) return reject(ctx, 'unknown_period', `${parsed.period} (the month of ${text}) is not a cycle of the network`);
        return { ms: parsed.ms, period };
      }),
      procedure: procedureField(context),
      control_lot: lotField(context),
      level: wholeNumber('level', 1, 'invalid_integer'),
      value: decimal('value', context),
      unit: unitField(context),
      run: cell.transform((t) => t.trim() || null),
      comment: cell.transform((text, ctx) => {
        const t = text.trim();
        if (t.length > MAX_COMMENT_LENGTH) return reject(ctx, 'too_long', `comment is longer than ${MAX_COMMENT_LENGTH} characters`);
        return t || null;
      }),
    })
    .transform((row, ctx): ValueRow => {
      const conversion = checkLevelAndUnit(row, context, ctx);
      if (!conversion) return z.NEVER;
      return {
        procedure: row.procedure,
        lot: row.control_lot,
        level: row.level,
        period: row.measured_at.period,
        measuredAtMs: row.measured_at.ms,
        value: conversion.factor * row.value + conversion.offset,
        run: row.run,
        comment: row.comment,
      };
    });
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
