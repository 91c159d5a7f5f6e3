import { describe, expect, it } from 'vitest';
import { HISTORY_PER_LEVEL, lastPerLevel, previousPeriod } from './multirule-history.ts';

describe('previousPeriod', () => {
  it('when given a month, then the calendar month before it, across a year end too', () => {
    expect(previousPeriod('2026-03')).toBe('2026-02');
    expect(previousPeriod('2026-10')).toBe('2026-09');
    expect(previousPeriod('2026-01')).toBe('2025-12');
  });
});

describe('lastPerLevel', () => {
  it('when a level has more values than 10-x looks back, then only its latest ones are kept, in order', () => {
    // 10-x is the longest multirule window (Westgard et al. 1981): ten consecutive values.
    expect(HISTORY_PER_LEVEL).toBe(10);
    const points = Array.from({ length: 25 }, (_, i) => ({ level: i % 5 === 0 ? 2 : 1, z: i }));
    const kept = lastPerLevel(points);
    expect(kept.filter((p) => p.level === 1).map((p) => p.z)).toEqual(
      [11, 12, 13, 14, 16, 17, 18, 19, 21, 22, 23, 24].slice(-10),
    );
    expect(kept.filter((p) => p.level === 2).map((p) => p.z)).toEqual([0, 5, 10, 15, 20]);
    expect(kept.map((p) => p.z)).toEqual([...kept.map((p) => p.z)].sort((a, b) => a - b));
  });
});
