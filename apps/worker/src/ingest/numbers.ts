/**
 * Numbers as labs write them in CSV cells. A decimal point is always read; a decimal comma only when the
 * file allows it (semicolon-delimited files). Thousands separators are not read: "1,234" or "1 234" is
 * refused rather than guessed.
 */
const DECIMAL_POINT = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;
const DECIMAL_COMMA = /^[+-]?(\d+(,\d*)?|,\d+)([eE][+-]?\d+)?$/;
const WHOLE = /^[+-]?\d+$/;

/** The number in a cell, or null when the text is not a plain decimal number. */
export function parseDecimal(text: string, decimalComma: boolean): number | null {
  const t = text.trim();
  let value: number;
  if (DECIMAL_POINT.test(t)) value = Number(t);
  else if (decimalComma && DECIMAL_COMMA.test(t)) value = Number(t.replace(',', '.'));
  else return null;
  return Number.isFinite(value) ? value : null;
}

/** A whole number written without decimals ("2", not "2.0"), or null. */
export function parseWholeNumber(text: string): number | null {
  const t = text.trim();
  if (!WHOLE.test(t)) return null;
  const value = Number(t);
  return Number.isSafeInteger(value) ? value : null;
}
