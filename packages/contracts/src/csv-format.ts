import { canonicalColumns, type ColumnMapping, type Delimiter, type UploadKind } from './uploads.ts';

/**
 * Pure helpers that read the shape of an uploaded CSV file: BOM, delimiter, decimal comma and which
 * file header holds which canonical column. Shared by the API (preview), the worker and the web app.
 */

const BOM = '\uFEFF';

export function stripBom(text: string): { text: string; bom: boolean } {
  return text.startsWith(BOM) ? { text: text.slice(1), bom: true } : { text, bom: false };
}

/** The first line of the text (without its line break), skipping nothing else. */
export function firstLine(text: string): string {
  const end = text.search(/\r\n|\n|\r/);
  return end === -1 ? text : text.slice(0, end);
}

/**
 * The delimiter of a header line: the candidate (comma, semicolon, tab) that occurs most often outside
 * double quotes. Ties and a line without any candidate give a comma.
 */
export function detectDelimiter(headerLine: string): Delimiter {
  const counts: Record<Delimiter, number> = { ',': 0, ';': 0, '\t': 0 };
  let quoted = false;
  for (const ch of headerLine) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && (ch === ',' || ch === ';' || ch === '\t')) counts[ch] += 1;
  }
  let best: Delimiter = ',';
  for (const candidate of [';', '\t'] as const) {
    if (counts[candidate] > counts[best]) best = candidate;
  }
  return best;
}

/** Decimal commas are read only in semicolon files (in a comma file "5,4" would be two cells). */
export const allowsDecimalComma = (delimiter: Delimiter): boolean => delimiter === ';';

const DECIMAL_COMMA_NUMBER = /^[+-]?\d+,\d+$/;

/** True when some cell of the sample rows is a number written with a decimal comma (semicolon files only). */
export function detectDecimalComma(delimiter: Delimiter, rows: readonly (readonly string[])[]): boolean {
  if (!allowsDecimalComma(delimiter)) return false;
  return rows.some((row) => row.some((cell) => DECIMAL_COMMA_NUMBER.test(cell.trim())));
}

/** Header text reduced to lower-case letters and digits, so "Control Lot", "control_lot" and "CONTROL-LOT" match. */
export const normalizeHeader = (header: string): string => header.toLowerCase().replace(/[^a-z0-9]/g, '');

/** Other header names a lab's system commonly writes for each canonical column (normalized). */
const headerSynonyms: Record<string, readonly string[]> = {
  period: ['period', 'month', 'yearmonth', 'qcperiod'],
  procedure: ['procedure', 'procedurecode', 'test', 'testcode', 'assay', 'method'],
  control_lot: ['controllot', 'lot', 'lotnumber', 'lotno', 'qclot', 'controllotnumber'],
  level: ['level', 'controllevel', 'qclevel', 'lvl'],
  n: ['n', 'count', 'nvalues', 'numberofvalues', 'numvalues'],
  mean: ['mean', 'average', 'avg', 'xbar'],
  sd: ['sd', 'stdev', 'stddev', 'standarddeviation', 's'],
  unit: ['unit', 'units', 'ucum', 'ucumunit'],
  measured_at: ['measuredat', 'measured', 'timestamp', 'datetime', 'date', 'time', 'resulttime'],
  value: ['value', 'result', 'qcvalue', 'measurement'],
  run: ['run', 'runid', 'batch', 'batchid'],
  comment: ['comment', 'comments', 'note', 'notes', 'remark', 'remarks'],
};

export type MappingSuggestion = {
  mapping: Record<string, string | null>;
  source: 'saved' | 'detected';
  missing: string[];
};

/**
 * Which header to read each canonical column from: the lab's saved mapping when every header it names
 * is in this file, otherwise matching header names (exact canonical name first, then common synonyms).
 */
export function suggestMapping(
  kind: UploadKind,
  headers: readonly string[],
  saved?: ColumnMapping | null,
): MappingSuggestion {
  const columns = canonicalColumns[kind];
  const present = new Set(headers);
  if (saved && Object.keys(saved).length > 0 && Object.values(saved).every((h) => present.has(h))) {
    const mapping: Record<string, string | null> = {};
    for (const column of columns) mapping[column.name] = saved[column.name] ?? null;
    const filled = fillFromHeaders(kind, headers, mapping);
    return { mapping: filled, source: 'saved', missing: missingRequired(kind, filled) };
  }
  const mapping = fillFromHeaders(kind, headers, Object.fromEntries(columns.map((c) => [c.name, null])));
  return { mapping, source: 'detected', missing: missingRequired(kind, mapping) };
}

function fillFromHeaders(
  kind: UploadKind,
  headers: readonly string[],
  start: Record<string, string | null>,
): Record<string, string | null> {
  const mapping = { ...start };
  const taken = new Set(Object.values(mapping).filter((h): h is string => h !== null));
  const byNormalized = new Map<string, string>();
  for (const header of headers) {
    const key = normalizeHeader(header);
    if (!byNormalized.has(key)) byNormalized.set(key, header);
  }
  // Exact canonical names win over synonyms, so a file with both "method" and "procedure" maps "procedure".
  for (const pass of ['exact', 'synonym'] as const) {
    for (const column of canonicalColumns[kind]) {
      if (mapping[column.name]) continue;
      const candidates =
        pass === 'exact' ? [normalizeHeader(column.name)] : (headerSynonyms[column.name] ?? []);
      for (const candidate of candidates) {
        const header = byNormalized.get(candidate);
        if (header && !taken.has(header)) {
          mapping[column.name] = header;
          taken.add(header);
          break;
        }
      }
    }
  }
  return mapping;
}

function missingRequired(kind: UploadKind, mapping: Record<string, string | null>): string[] {
  return canonicalColumns[kind].filter((c) => c.required && !mapping[c.name]).map((c) => c.name);
}

/**
 * Splits the start of a CSV text into rows of cells (RFC 4180 quoting: fields in double quotes may hold
 * delimiters and line breaks, "" is a quote). Reads at most `maxRows` rows; a last row cut off by the end
 * of a partial text (`complete: false`) is dropped. Blank lines are skipped. Meant for previews of the
 * first lines, not for whole files.
 */
export function parseCsvStart(
  text: string,
  delimiter: Delimiter,
  options: { maxRows: number; complete: boolean },
): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  let i = 0;
  const endRow = () => {
    row.push(cell);
    if (!(row.length === 1 && row[0].trim() === '')) rows.push(row);
    row = [];
    cell = '';
  };
  while (i < text.length && rows.length < options.maxRows) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        cell += '"';
        i += 2;
        continue;
      }
      if (ch === '"') quoted = false;
      else cell += ch;
      i += 1;
      continue;
    }
    if (ch === '"' && cell.trim() === '') {
      quoted = true;
      cell = '';
    } else if (ch === delimiter) {
      row.push(cell);
      cell = '';
    } else if (ch === '\r' || ch === '\n') {
      if (ch === '\r' && text[i + 1] === '\n') i += 1;
      endRow();
    } else {
      cell += ch;
    }
    i += 1;
  }
  // The text ended inside a row: keep it only when the text is the whole file.
  if (rows.length < options.maxRows && (cell !== '' || row.length > 0) && options.complete && !quoted)
    endRow();
  return rows;
}

// ---------- writing ----------

/** A value of a CSV cell: text, a number, a yes/no, or nothing (an empty cell). */
export type CsvValue = string | number | boolean | null | undefined;

/** A whole cell that is a plain decimal number ("-1.5", "+2", "3.2e-5"): a spreadsheet reads it as a number. */
const PLAIN_NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * Characters that make a spreadsheet read the start of a cell as a formula (OWASP, "CSV Injection":
 * equals, plus, minus, at sign, tab, carriage return).
 */
const FORMULA_START = /^[=+\-@\t\r]/;

/**
 * One CSV cell, for every CSV the API and the web app write.
 *
 * - Formula injection: text that begins with `=`, `+`, `-`, `@`, a tab or a carriage return gets a
 *   leading apostrophe, so a spreadsheet shows it as text instead of running it (OWASP CSV Injection
 *   guidance: prepend a single quote). A cell that is a plain decimal number as a whole (a `number`, or
 *   text such as "-1.5") is written as it is: a spreadsheet reads it as a number, and a number cannot
 *   call a function or refer to another cell, so negative figures stay figures.
 * - A true minus sign (U+2212) in front of a number becomes "-", so formatted figures stay numbers.
 * - Quoting as RFC 4180 §2 asks: a cell holding a comma, a double quote, CR or LF is put in double
 *   quotes, and a double quote inside it is doubled.
 */
export function csvCell(value: CsvValue): string {
  if (value === null || value === undefined) return '';
  let text = typeof value === 'boolean' ? (value ? 'yes' : 'no') : String(value);
  if (text.startsWith('\u2212') && PLAIN_NUMBER.test(`-${text.slice(1)}`)) text = `-${text.slice(1)}`;
  if (typeof value === 'string' && FORMULA_START.test(text) && !PLAIN_NUMBER.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

/** A CSV text: the header line and the rows, comma-separated, every line ending in CRLF (RFC 4180 §2). */
export function toCsv(header: readonly string[], rows: readonly (readonly CsvValue[])[]): string {
  return `${[header, ...rows].map((row) => row.map(csvCell).join(',')).join('\r\n')}\r\n`;
}
