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
