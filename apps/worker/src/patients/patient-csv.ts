import type { Readable } from 'node:stream';
import { allowsDecimalComma, canonicalColumns, suggestMapping, type RowError } from '@plumbline/contracts';
import { thresholds } from '@plumbline/db';
import { FileFormatError, openCsv } from '../ingest/csv-reader.ts';
import { parseDecimal, parseWholeNumber } from '../ingest/numbers.ts';
import { identifierInCell, identifierInHeader, identifierMessage } from './identifiers.ts';
import {
  canonicalValue,
  hashSampleKey,
  isSetting,
  parseMonth,
  parseSex,
  type PatientContext,
  type PatientRow,
} from './patient-rows.ts';

export type PatientRead = {
  rowsTotal: number;
  rows: PatientRow[];
  /** The first row errors (at most the INGEST_MAX_ROW_ERRORS threshold); `errorsTotal` counts them all. */
  errors: RowError[];
  errorsTotal: number;
  rowsRejected: number;
};

/** Keeps the first row errors up to the threshold and counts every one. */
export function addRowErrors(read: PatientRead, errors: readonly RowError[]): void {
  read.errorsTotal += errors.length;
  for (const e of errors) if (read.errors.length < thresholds().maxRowErrors) read.errors.push(e);
}

/** Thrown when a file carries a direct identifier: the whole file is refused. */
export class IdentifierRefusal extends FileFormatError {}

const refuse = (row: number, column: string, message: string) =>
  new IdentifierRefusal({ row, column, code: 'direct_identifier', message });

/**
 * Reads a canonical patient-results CSV. Every header and every cell is checked for direct identifiers
 * first; one found refuses the file (IdentifierRefusal). Other problems are row errors. Row error
 * messages never quote a cell, so nothing typed into the file reaches the database through them.
 */
export async function readPatientCsv(
  ctx: PatientContext,
  source: Readable,
  reopen: () => Promise<Readable>,
  mappingSent: Record<string, string> | null,
  savedMapping: Record<string, string> | null,
  onBytes: (bytes: number) => void,
): Promise<PatientRead> {
  const csv = await openCsv(source, onBytes, reopen);
  const result: PatientRead = { rowsTotal: 0, rows: [], errors: [], errorsTotal: 0, rowsRejected: 0 };
  let headers: string[] | null = null;
  let index: Record<string, number> = {};
  let headerOf: (name: string) => string = (name) => name;
  let canonicalAt: string[] = [];
  const decimalComma = allowsDecimalComma(csv.delimiter);

  for await (const batch of csv.batches) {
    for (const { line, cells } of batch) {
      if (!headers) {
        headers = cells.map((h) => h.trim());
        for (const header of headers) {
          const kind = identifierInHeader(header);
          if (kind) throw refuse(1, header, identifierMessage(`the column "${header}"`, kind));
        }
        ({ index, headerOf } = resolvePatientColumns(headers, mappingSent ?? savedMapping));
        canonicalAt = headers.map((h, i) => Object.keys(index).find((k) => index[k] === i) ?? h);
        continue;
      }
      // Content checks run over every cell, mapped or not: an identifier in any column refuses the file.
      for (let i = 0; i < cells.length; i++) {
        const header = headers[i] ?? `column ${i + 1}`;
        const kind = identifierInCell(canonicalAt[i] ?? header, cells[i]);
        if (kind)
          throw refuse(line, header, identifierMessage(`the column "${header}" (line ${line})`, kind, true));
      }
      result.rowsTotal += 1;
      const rowErrors = checkRow(ctx, line, cells, index, headerOf, decimalComma, result.rows);
      if (rowErrors.length) {
        result.rowsRejected += 1;
        addRowErrors(result, rowErrors);
      }
    }
  }
  if (!headers)
    throw new FileFormatError({
      row: 1,
      column: null,
      code: 'missing_column',
      message: 'The file is empty.',
    });
  if (result.rowsTotal === 0)
    throw new FileFormatError({
      row: 2,
      column: null,
      code: 'required',
      message: 'The file has a header line but no data rows.',
    });
  return result;
}

function resolvePatientColumns(headers: string[], mapping: Record<string, string> | null) {
  const suggestion = suggestMapping('patient-results', headers, mapping);
  if (suggestion.missing.length) {
    throw new FileFormatError({
      row: 1,
      column: suggestion.missing[0],
      code: 'missing_column',
      message:
        `No column of the file holds ${suggestion.missing.map((m) => `"${m}"`).join(', ')}. ` +
        `The header has ${headers.map((h) => `"${h}"`).join(', ')}; map the columns and upload again.`,
    });
  }
  const index: Record<string, number> = {};
  for (const column of canonicalColumns['patient-results']) {
    const header = suggestion.mapping[column.name];
    if (header) index[column.name] = headers.indexOf(header);
  }
  return { index, headerOf: (name: string) => suggestion.mapping[name] ?? name };
}

function checkRow(
  ctx: PatientContext,
  line: number,
  cells: string[],
  index: Record<string, number>,
  headerOf: (name: string) => string,
  decimalComma: boolean,
  out: PatientRow[],
): RowError[] {
  const cell = (name: string) => (index[name] === undefined ? '' : (cells[index[name]] ?? '').trim());
  const errors: RowError[] = [];
  const error = (name: string, code: RowError['code'], message: string) =>
    errors.push({ row: line, column: headerOf(name), code, message });

  const analyte = ctx.analytes.get(cell('analyte').toUpperCase()) ?? ctx.analytes.get(cell('analyte'));
  if (!cell('analyte')) error('analyte', 'required', 'the analyte is missing');
  else if (!analyte)
    error('analyte', 'unknown_analyte', 'no analyte of the catalogue has this code or LOINC code');
  const raw = parseDecimal(cell('value'), decimalComma);
  if (raw === null) error('value', 'invalid_number', 'the value is not a number');
  if (!cell('unit')) error('unit', 'required', 'the unit is missing');
  const sex = parseSex(cell('sex'));
  if (!sex) error('sex', 'invalid_sex', 'sex must be female or male (F or M)');
  const age = parseWholeNumber(cell('age_years'));
  if (age === null || age < 0 || age > 120)
    error('age_years', 'invalid_age', 'the age must be whole years from 0 to 120');
  const month = parseMonth(cell('collected_month'));
  if (!month) error('collected_month', 'invalid_period', 'the month of collection must be YYYY-MM');
  const setting = cell('setting').toLowerCase();
  if (!isSetting(setting))
    error('setting', 'invalid_setting', 'the setting must be outpatient, inpatient, screening or emergency');
  if (errors.length || !analyte || raw === null || !sex || age === null || !month) return errors;

  const converted = canonicalValue(ctx, analyte, raw, cell('unit'), {
    row: line,
    valueColumn: headerOf('value'),
    unitColumn: headerOf('unit'),
  });
  if (!('value' in converted)) return [converted];
  const key = cell('sample_id');
  out.push({
    analyteId: analyte.id,
    value: converted.value,
    sex,
    ageYears: age,
    collectedMonth: month,
    setting,
    sampleHash: key ? hashSampleKey(ctx.salt, ctx.labId, key) : null,
  });
  return [];
}
