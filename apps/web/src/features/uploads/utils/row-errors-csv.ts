import { toCsv, type RowError } from '@plumbline/contracts';

/** The rejected rows as a CSV text: line, column, code, message; lines end in CRLF as RFC 4180 asks. */
export function rowErrorsCsv(errors: readonly RowError[]): string {
  // Messages can quote the uploaded file's own text, so the shared writer's neutralisation matters here.
  return toCsv(
    ['line', 'column', 'code', 'message'],
    errors.map((error) => [error.row, error.column, error.code, error.message]),
  );
}

/** "march-summary.csv" → "march-summary-rejected-rows.csv". */
export function rowErrorsFilename(uploadFilename: string): string {
  const base = uploadFilename.replace(/\.[^./\\]+$/, '') || 'upload';
  return `${base}-rejected-rows.csv`;
}
