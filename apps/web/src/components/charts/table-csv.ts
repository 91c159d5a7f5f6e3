// A small table as CSV text (RFC 4180), for the text-alternative tables of the charts and other tables
// small enough to export in the browser.

/**
 * One cell: quoted when it holds a comma, quote or line break. Text a spreadsheet would run as a
 * formula (=, +, @ first, or - before a letter) gets a leading apostrophe; signed figures stay figures.
 */
export function csvCell(value: string | number | null | undefined): string {
  if (value === null || value === undefined) return '';
  let text = String(value).replaceAll('\u2212', '-');
  if (typeof value === 'string' && (/^[=@\t\r]/.test(text) || /^[+-](?![\d.])/.test(text))) text = `'${text}`;
  return /[",\r\n]/.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

/** Header line and rows, lines ending in CRLF. */
export function tableCsv(
  headers: readonly string[],
  rows: readonly (readonly (string | number | null | undefined)[])[],
): string {
  return `${[headers, ...rows].map((row) => row.map(csvCell).join(',')).join('\r\n')}\r\n`;
}
