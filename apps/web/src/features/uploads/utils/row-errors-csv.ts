import type { RowError } from '@plumbline/contracts';

/**
 * A cell of a CSV file (RFC 4180): quoted when it holds a comma, quote or line break. Text a
 * spreadsheet would run as a formula (=, +, -, @ first) gets a leading apostrophe, since messages can
 * quote the uploaded file's own text.
 */
export function csvCell(value: string | number | null): string {
  if (value === null) return '';
  let text = String(value);
  if (typeof value === 'string' && /^[=+\-@\t\r]/.test(text)) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

/** The rejected rows as a CSV text: line, column, code, message; lines end in CRLF as RFC 4180 asks. */
export function rowErrorsCsv(errors: readonly RowError[]): string {
  const lines = [['line', 'column', 'code', 'message'].join(',')];
  for (const error of errors) {
    lines.push([error.row, error.column, error.code, error.message].map(csvCell).join(','));
  }
  return `${lines.join('\r\n')}\r\n`;
}

/** "march-summary.csv" → "march-summary-rejected-rows.csv". */
export function rowErrorsFilename(uploadFilename: string): string {
  const base = uploadFilename.replace(/\.[^./\\]+$/, '') || 'upload';
  return `${base}-rejected-rows.csv`;
}
