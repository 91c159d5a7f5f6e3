// Periods are 'YYYY-MM'; deadlines are instants, entered in the coordinator's local time with a
// datetime-local input ('YYYY-MM-DDTHH:mm') and sent as ISO 8601 in UTC.

const pad = (n: number) => String(n).padStart(2, '0');

/** The period after `period`, e.g. '2026-12' → '2027-01'. */
export function nextPeriod(period: string): string {
  const [year, month] = period.split('-').map(Number);
  return month === 12 ? `${year + 1}-01` : `${year}-${pad(month + 1)}`;
}

/** The period of a date in local time, e.g. 2026-12-03 → '2026-12'. */
export function periodOf(date: Date): string {
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}`;
}

/** The network's usual deadline, as a datetime-local value: the 10th of the following month, 23:59. */
export function usualDeadline(period: string): string {
  return `${nextPeriod(period)}-10T23:59`;
}

/** A datetime-local value ('2027-01-10T23:59') as an ISO instant; other input is passed on for the schema to reject. */
export function localDateTimeToIso(value: unknown): unknown {
  if (typeof value !== 'string' || !/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/.test(value)) return value;
  const date = new Date(value); // a date-time without offset is read as local time
  return Number.isNaN(date.getTime()) ? value : date.toISOString();
}

/** An ISO instant as a datetime-local value in local time. */
export function isoToLocalDateTime(iso: string): string {
  const date = new Date(iso);
  if (Number.isNaN(date.getTime())) return '';
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}T${pad(date.getHours())}:${pad(date.getMinutes())}`;
}
