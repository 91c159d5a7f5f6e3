import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import jStat from 'jstat';
import { rankConfidenceInterval } from '../src/index.ts';

describe('rankConfidenceInterval', () => {
  // CLSI EP28-A3c table of ranks for the 90 % CI of the 2.5th percentile (published rows, each also
  // confirmed by a binomial computation).
  const tableRows = [
    { from: 119, to: 132, ranks: [1, 7] },
    { from: 133, to: 160, ranks: [1, 8] },
    { from: 161, to: 187, ranks: [1, 9] },
    { from: 190, to: 218, ranks: [2, 10] },
    { from: 219, to: 248, ranks: [2, 11] },
    { from: 250, to: 279, ranks: [3, 12] },
  ];
  for (const row of tableRows) {
    it(`when n = ${row.from}–${row.to}, then the 2.5th percentile's 90 % CI spans ranks ${row.ranks.join('–')} (EP28-A3c table)`, () => {
      for (let n = row.from; n <= row.to; n++)
        expect(rankConfidenceInterval(n, 0.025, 0.9)).toEqual(row.ranks);
    });
  }

  // Ranks 114–120 mirror the lower limit's 1–7 for n = 120 (n + 1 − r); listed with the EP28-A3c values and
  // confirmed by the binomial computation in the property test below.
  it('when n = 120, then the 97.5th percentile CI spans ranks 114–120 (EP28-A3c, by symmetry of ranks 1–7)', () => {
    expect(rankConfidenceInterval(120, 0.975)).toEqual([114, 120]);
  });

  it('when n < 119, then no nonparametric 90 % CI of the 2.5th percentile exists (EP28-A3c)', () => {
    expect(rankConfidenceInterval(118, 0.025)).toBeNull();
    expect(rankConfidenceInterval(20, 0.025)).toBeNull();
    expect(rankConfidenceInterval(118, 0.975)).toBeNull();
  });

  it('when a CI exists, then its binomial coverage is at least the confidence with at most α/2 per tail, and it is the narrowest such pair (property; binomial by jstat, a reference library)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1500 }),
        fc.constantFrom(0.025, 0.05, 0.1, 0.5, 0.9, 0.95, 0.975),
        fc.constantFrom(0.9, 0.95),
        (n, p, confidence) => {
          const ranks = rankConfidenceInterval(n, p, confidence);
          const cdf = (k: number) => (k < 0 ? 0 : k >= n ? 1 : jStat.binomial.cdf(k, n, p));
          const tail = (1 - confidence) / 2;
          if (ranks === null) {
            // No ranks: even the most extreme order statistic leaves more than α/2 in a tail.
            expect(cdf(0) > tail - 1e-9 || 1 - cdf(n - 1) > tail - 1e-9).toBe(true);
            return;
          }
          const [r1, r2] = ranks;
          expect(r1).toBeGreaterThanOrEqual(1);
          expect(r2).toBeLessThanOrEqual(n);
          // P(x(r1) ≤ quantile ≤ x(r2)) = P(r1 ≤ B ≤ r2 − 1), B ~ Binomial(n, p).
          expect(cdf(r2 - 1) - cdf(r1 - 1)).toBeGreaterThanOrEqual(confidence - 1e-9);
          expect(cdf(r1 - 1)).toBeLessThanOrEqual(tail + 1e-9);
          expect(1 - cdf(r2 - 1)).toBeLessThanOrEqual(tail + 1e-9);
          // Narrowest: one rank further in would leave more than α/2 in that tail.
          expect(cdf(r1)).toBeGreaterThan(tail - 1e-9);
          expect(1 - cdf(r2 - 2)).toBeGreaterThan(tail - 1e-9);
        },
      ),
      { numRuns: 300 },
    );
  });

  it('when the ranks are used on simulated samples, then the interval covers the true 2.5th percentile at least 90 % of the time (simulation)', () => {
    // Uniform(0, 1) samples: the true 2.5th percentile is 0.025. Seeded linear congruential draws.
    let state = 12345;
    const uniform = () => (state = (state * 1103515245 + 12345) % 2147483648) / 2147483648;
    const n = 200;
    const [r1, r2] = rankConfidenceInterval(n, 0.025)!;
    let covered = 0;
    const trials = 4000;
    for (let t = 0; t < trials; t++) {
      const sample = Float64Array.from({ length: n }, uniform).sort();
      if (sample[r1 - 1] <= 0.025 && 0.025 <= sample[r2 - 1]) covered++;
    }
    // Exact coverage for n = 200, ranks 2–10 is ≥ 0.90; allow 3 binomial SEs of simulation noise.
    expect(covered / trials).toBeGreaterThan(0.9 - 3 * Math.sqrt((0.9 * 0.1) / trials));
  });

  it('when n is 1,000,000, then the ranks are found quickly and the two tails mirror each other', () => {
    const lower = rankConfidenceInterval(1_000_000, 0.025)!;
    const upper = rankConfidenceInterval(1_000_000, 0.975)!;
    expect(upper).toEqual([1_000_001 - lower[1], 1_000_001 - lower[0]]);
    // Normal approximation: 25 000 ± 1.645 · √(1e6 · 0.025 · 0.975) ≈ 24 743 … 25 257.
    expect(lower[0]).toBeGreaterThan(24_730);
    expect(lower[1]).toBeLessThan(25_270);
  });

  it('when the input is invalid, then it throws naming the function and the input', () => {
    expect(() => rankConfidenceInterval(0, 0.025)).toThrow(
      'rankConfidenceInterval: n must be an integer of at least 1, got 0',
    );
    expect(() => rankConfidenceInterval(10.5, 0.025)).toThrow(
      'rankConfidenceInterval: n must be an integer of at least 1, got 10.5',
    );
    expect(() => rankConfidenceInterval(120, 1)).toThrow(
      'rankConfidenceInterval: p must be between 0 and 1 (exclusive), got 1',
    );
    expect(() => rankConfidenceInterval(120, 0.025, 0)).toThrow(
      'rankConfidenceInterval: confidence must be between 0 and 1',
    );
  });
});
