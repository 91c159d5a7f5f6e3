import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseAnyForm, parseMeasuredAt } from './timestamps.ts';

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

describe('parseMeasuredAt, quick reading of the common forms', () => {
  it('when a value is close to a common form, then the result equals the general parser’s (property test)', () => {
    // Characters and lengths around YYYY-MM-DD[T| ]HH:MM[:SS][Z], with out-of-range days, months and times,
    // leap years, lower-case letters, spaces and years below 1000.
    const pick = (...options: string[]) => fc.constantFrom(...options);
    const two = (max: number) => fc.integer({ min: 0, max }).map((n) => String(n).padStart(2, '0'));
    const value = fc
      .tuple(
        pick('2026', '2024', '2000', '1900', '2100', '0999', '0004', '0000', '1000', '9999', '20x6'),
        pick('-', '/'),
        two(13),
        pick('-'),
        two(32),
        pick('', 'T', 't', ' ', 'X', '  '),
        two(25),
        pick(':', ''),
        two(61),
        pick('', ':'),
        two(61),
        pick('', 'Z', 'z', '+01:00', '.5', ' Z', 'Q'),
      )
      .chain((parts) =>
        fc.integer({ min: 7, max: 30 }).map((cut) => {
          const [y, s1, mo, s2, d, sep, h, c1, mi, c2, sec, zone] = parts;
          const full =
            sep === ''
              ? `${y}${s1}${mo}${s2}${d}${zone}`
              : `${y}${s1}${mo}${s2}${d}${sep}${h}${c1}${mi}${c2}${sec}${zone}`;
          return cut >= 28 ? full : full.slice(0, cut);
        }),
      );
    fc.assert(
      fc.property(value, (text) => {
        expect(parseMeasuredAt(text)).toEqual(parseAnyForm(text));
      }),
      { numRuns: 20000 },
    );
    // February 29 around the leap-year rules, and years 0–99 (read by Date.UTC as 1900–1999).
    for (const year of ['0000', '0004', '0100', '1900', '2000', '2024', '2100']) {
      for (const text of [`${year}-02-29`, `${year}-02-29T12:00:00Z`, `${year}-12-31 23:59`]) {
        expect(parseMeasuredAt(text)).toEqual(parseAnyForm(text));
      }
    }
  });
});
