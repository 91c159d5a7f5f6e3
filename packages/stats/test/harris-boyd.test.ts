import { describe, expect, it } from 'vitest';
import { harrisBoyd, harrisBoydFromSummaries, summarize } from '../src/index.ts';

describe('harrisBoyd (Clin Chem 1990;36:265–270)', () => {
  it('when n₁ = n₂ = 120, means 140 and 141, SDs 2 and 2, then z = 3.872983 > z* = 3 and the groups are partitioned (computed example)', () => {
    const result = harrisBoydFromSummaries({ n: 120, mean: 140, sd: 2 }, { n: 120, mean: 141, sd: 2 });
    expect(result.z).toBeCloseTo(3.872983, 6);
    expect(result.zCritical).toBeCloseTo(3, 12);
    expect(result.sdRatio).toBe(1);
    expect(result.partition).toBe(true);
  });

  it('when the means are close and the SDs similar, then no partition (z below z*, ratio ≤ 1.5)', () => {
    const result = harrisBoydFromSummaries({ n: 120, mean: 140, sd: 2 }, { n: 120, mean: 140.5, sd: 2.2 });
    expect(result.z).toBeLessThan(result.zCritical);
    expect(result.partition).toBe(false);
  });

  it('when the larger SD is more than 1.5 times the smaller, then partition even with equal means (SD-ratio criterion, memory)', () => {
    expect(
      harrisBoydFromSummaries({ n: 120, mean: 140, sd: 2 }, { n: 120, mean: 140, sd: 3.01 }).partition,
    ).toBe(true);
    expect(
      harrisBoydFromSummaries({ n: 120, mean: 140, sd: 2 }, { n: 120, mean: 140, sd: 3 }).partition,
    ).toBe(false);
  });

  it('when n grows, then z* = 3·√((n₁ + n₂)/240) grows with it (published formula)', () => {
    const big = harrisBoydFromSummaries({ n: 480, mean: 0, sd: 1 }, { n: 480, mean: 0, sd: 1 });
    expect(big.zCritical).toBeCloseTo(6, 12);
  });

  it('when given raw values, then the result equals the one from their summaries', () => {
    const a = Array.from({ length: 120 }, (_, i) => 140 + (i % 2 === 0 ? 2 : -2));
    const b = a.map((v) => v + 1);
    expect(harrisBoyd(a, b)).toEqual(harrisBoydFromSummaries(summarize(a), summarize(b)));
  });

  it('when the input is invalid, then it throws naming the function and the group', () => {
    expect(() => harrisBoyd([1], [1, 2])).toThrow(
      'harrisBoyd: needs at least 2 values in the first group, got 1',
    );
    expect(() => harrisBoyd([1, 2], [1, Number.NaN])).toThrow(
      'harrisBoyd: value at index 1 in the second group is not a finite number',
    );
    expect(() => harrisBoyd([1, 1], [2, 2])).toThrow('harrisBoyd: both groups have SD 0');
    expect(() => harrisBoydFromSummaries({ n: 1, mean: 1, sd: 1 }, { n: 5, mean: 1, sd: 1 })).toThrow(
      'harrisBoydFromSummaries: first group needs n ≥ 2, got 1',
    );
  });
});
