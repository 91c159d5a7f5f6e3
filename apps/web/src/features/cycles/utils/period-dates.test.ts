import { describe, expect, it } from 'vitest';
import { isoToLocalDateTime, localDateTimeToIso, nextPeriod, usualDeadline } from './period-dates.ts';

describe('period dates', () => {
  it('when the period is December, then the next one is January of the next year', () => {
    expect(nextPeriod('2026-12')).toBe('2027-01');
    expect(nextPeriod('2026-09')).toBe('2026-10');
  });

  it('when a period is created, then the usual deadline is the 10th of the following month at 23:59', () => {
    expect(usualDeadline('2026-12')).toBe('2027-01-10T23:59');
  });

  it('when a local date-time goes to the API and comes back, then it is the same local date-time', () => {
    const iso = localDateTimeToIso('2027-01-10T23:59');
    expect(typeof iso).toBe('string');
    // ECMAScript reads a date-time without offset as local time (ECMA-262, Date Time String Format).
    expect(new Date(iso as string).getTime()).toBe(new Date(2027, 0, 10, 23, 59).getTime());
    expect(isoToLocalDateTime(iso as string)).toBe('2027-01-10T23:59');
  });

  it('when the input is not a local date-time, then it is passed on unchanged for the schema to reject', () => {
    expect(localDateTimeToIso('')).toBe('');
    expect(localDateTimeToIso('10 January')).toBe('10 January');
  });
});
