/**
 * measured_at cells: ISO 8601 dates with an optional time and zone, "T" or a space between date and
 * time — 2026-03-04, 2026-03-04T07:30, 2026-03-04 07:30:15, 2026-03-04T07:30:15.250+01:00, …Z.
 * A time without a zone is taken as UTC. The period is the month of the date as written (the lab's own
 * calendar day), so a value measured late on the last day of a month stays in that month.
 */
const ISO =
  /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.(\d{1,9}))?)?)?\s*(Z|[+-]\d{2}:?\d{2})?$/i;

export type MeasuredAt = { ms: number; period: string };

export function parseMeasuredAt(text: string): MeasuredAt | { problem: string } {
  return parseCommonForm(text.trim()) ?? parseAnyForm(text);
}

/** The general parser: every form the ISO pattern above allows, with a worded problem otherwise. */
export function parseAnyForm(text: string): MeasuredAt | { problem: string } {
  const match = ISO.exec(text.trim());
  if (!match) {
    return {
      problem: `"${text}" is not a date and time in ISO 8601 form (e.g. 2026-03-04T07:30 or 2026-03-04)`,
    };
  }
  const [, y, mo, d, h = '0', mi = '0', s = '0', fraction = '', zone] = match;
  const year = Number(y);
  const month = Number(mo);
  const day = Number(d);
  const hour = Number(h);
  const minute = Number(mi);
  const second = Number(s);
  if (month < 1 || month > 12) return { problem: `"${text}" has month ${mo}, which does not exist` };
  const daysInMonth = new Date(Date.UTC(year, month, 0)).getUTCDate();
  if (day < 1 || day > daysInMonth)
    return { problem: `"${text}" has day ${d}, but ${y}-${mo} has ${daysInMonth} days` };
  if (hour > 23 || minute > 59 || second > 59)
    return { problem: `"${text}" has a time of day that does not exist` };
  let offsetMinutes = 0;
  if (zone && zone.toUpperCase() !== 'Z') {
    const sign = zone.startsWith('-') ? -1 : 1;
    const digits = zone.slice(1).replace(':', '');
    offsetMinutes = sign * (Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2, 4)));
  }
  const millis = fraction ? Math.round(Number(`0.${fraction}`) * 1000) : 0;
  const ms = Date.UTC(year, month - 1, day, hour, minute, second, millis) - offsetMinutes * 60_000;
  return { ms, period: `${y}-${mo}` };
}

const ZERO = 48;
const digit = (t: string, at: number) => t.charCodeAt(at) - ZERO;
const isDigit = (t: string, at: number) => {
  const d = t.charCodeAt(at) - ZERO;
  return d >= 0 && d <= 9;
};
const DATE_DIGITS = [0, 1, 2, 3, 5, 6, 8, 9];
const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/**
 * The forms nearly every file uses — YYYY-MM-DD, optionally with "T" (or "t", or a space) and HH:MM or
 * HH:MM:SS, optionally "Z" — read without the regular expression, for years 1000–9999. Anything else,
 * and any value out of range, gives null and goes through the general parser, which words the problem;
 * for the forms read here both give the same result.
 */
function parseCommonForm(t: string): MeasuredAt | null {
  const length = t.length;
  if (length !== 10 && length !== 16 && length !== 17 && length !== 19 && length !== 20) return null;
  for (const at of DATE_DIGITS) if (!isDigit(t, at)) return null;
  if (t.charCodeAt(4) !== 45 || t.charCodeAt(7) !== 45) return null; // "-"
  let hour = 0;
  let minute = 0;
  let second = 0;
  if (length > 10) {
    const separator = t.charCodeAt(10);
    if (separator !== 84 && separator !== 116 && separator !== 32) return null; // "T", "t", " "
    if (!isDigit(t, 11) || !isDigit(t, 12) || t.charCodeAt(13) !== 58 || !isDigit(t, 14) || !isDigit(t, 15))
      return null;
    hour = digit(t, 11) * 10 + digit(t, 12);
    minute = digit(t, 14) * 10 + digit(t, 15);
    let end = 16;
    if (length >= 19) {
      if (t.charCodeAt(16) !== 58 || !isDigit(t, 17) || !isDigit(t, 18)) return null;
      second = digit(t, 17) * 10 + digit(t, 18);
      end = 19;
    }
    if (end < length) {
      const zone = t.charCodeAt(end);
      if ((zone !== 90 && zone !== 122) || end + 1 !== length) return null; // "Z", "z"
    }
  }
  const year = digit(t, 0) * 1000 + digit(t, 1) * 100 + digit(t, 2) * 10 + digit(t, 3);
  const month = digit(t, 5) * 10 + digit(t, 6);
  const day = digit(t, 8) * 10 + digit(t, 9);
  if (year < 1000 || month < 1 || month > 12 || hour > 23 || minute > 59 || second > 59) return null;
  const leap = (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
  const daysInMonth = month === 2 && leap ? 29 : DAYS_IN_MONTH[month - 1];
  if (day < 1 || day > daysInMonth) return null;
  return { ms: Date.UTC(year, month - 1, day, hour, minute, second, 0), period: t.slice(0, 7) };
}
