import { describe, expect, it } from 'vitest';
import { parseMeasuredAt } from './timestamps.ts';

describe('parseMeasuredAt', () => {
  it('when a date and time have no zone, then they are read as UTC and the month is the written one', () => {
    expect(parseMeasuredAt('2026-03-04T07:30')).toEqual({
      ms: Date.UTC(2026, 2, 4, 7, 30),
      period: '2026-03',
    });
    expect(parseMeasuredAt('2026-03-04 07:30:15')).toEqual({
      ms: Date.UTC(2026, 2, 4, 7, 30, 15),
      period: '2026-03',
    });
    expect(parseMeasuredAt('2026-03-04')).toEqual({ ms: Date.UTC(2026, 2, 4), period: '2026-03' });
  });

  it('when a zone is given, then the instant honours it but the period stays the written month', () => {
    // 2026-03-31T23:30 at +02:00 is 21:30 UTC the same day; at -05:00 it is April 1 in UTC.
    expect(parseMeasuredAt('2026-03-31T23:30:00-05:00')).toEqual({
      ms: Date.UTC(2026, 3, 1, 4, 30),
      period: '2026-03',
    });
    expect(parseMeasuredAt('2026-03-31T23:30:00.250+0200')).toEqual({
      ms: Date.UTC(2026, 2, 31, 21, 30, 0, 250),
      period: '2026-03',
    });
    expect(parseMeasuredAt('2026-03-31T23:30Z')).toEqual({
      ms: Date.UTC(2026, 2, 31, 23, 30),
      period: '2026-03',
    });
  });

  it('when the date does not exist or is not ISO 8601, then the problem is named', () => {
    expect(parseMeasuredAt('2026-02-30')).toEqual({ problem: expect.stringMatching(/2026-02 has 28 days/) });
    expect(parseMeasuredAt('2026-13-01')).toEqual({ problem: expect.stringMatching(/month 13/) });
    expect(parseMeasuredAt('04/03/2026')).toEqual({ problem: expect.stringMatching(/ISO 8601/) });
    expect(parseMeasuredAt('2026-03-04T25:00')).toEqual({ problem: expect.stringMatching(/time of day/) });
  });
});
