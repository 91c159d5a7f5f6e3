import type { Period } from '@plumbline/contracts';

/**
 * The period a lab is most likely working on: the open period whose deadline comes first and has not
 * passed; else the latest period. Null when there are no periods at all.
 */
export function defaultReportPeriod(periods: readonly Period[], now: Date = new Date()): string | null {
  const due = periods
    .filter((p) => p.state === 'open' && Date.parse(p.deadline) >= now.getTime())
    .sort((a, b) => Date.parse(a.deadline) - Date.parse(b.deadline));
  if (due.length > 0) return due[0].period;
  const latest = [...periods].sort((a, b) => b.period.localeCompare(a.period));
  return latest[0]?.period ?? null;
}
