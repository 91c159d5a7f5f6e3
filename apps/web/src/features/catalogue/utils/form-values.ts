// Form inputs hold text; the contract schemas want numbers. These preprocessors convert the text and
// leave the contract's own checks (and messages) in charge.
import { z } from 'zod';

/** "" → null (clears an optional number); "6,9" and "6.9" → 6.9; anything else → NaN, which the schema rejects. */
export function textToNumberOrNull(value: unknown): unknown {
  if (typeof value !== 'string') return value;
  const text = value.trim();
  return text === '' ? null : Number(text.replace(',', '.'));
}

/** Like textToNumberOrNull, but "" means "not given" (a field with a default, e.g. display decimals). */
export function textToNumberOrUndefined(value: unknown): unknown {
  const converted = textToNumberOrNull(value);
  return converted === null ? undefined : converted;
}

/** Wraps a contract field so that it accepts the text of a form input. */
export function numberInput<S extends z.ZodType>(schema: S, blank: 'null' | 'undefined' = 'null') {
  return z.preprocess(blank === 'null' ? textToNumberOrNull : textToNumberOrUndefined, schema);
}

/** A stored value as the text of a form input ("" for nothing). */
export function asInputText(value: string | number | null | undefined): string {
  return value === null || value === undefined ? '' : String(value);
}
