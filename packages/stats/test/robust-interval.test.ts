import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { robustInterval, seededRandom, summarize } from '../src/index.ts';

// No published worked example of the Horn & Pesce method was available to us, so the checks are by
// construction and by simulation against normal theory.
describe('robustInterval (Horn & Pesce)', () => {
  it('when samples of 40 come from N(0, 1), then the intervals cover 95 % of the population on average (simulation; a 95 % prediction interval has expected coverage 0.95)', () => {
    const random = seededRandom(5);
    let coverage = 0;
    const trials = 600;
    for (let t = 0; t < trials; t++) {
      const result = robustInterval(Array.from({ length: 40 }, () => random.normal(0, 1)));
      coverage += jStat.normal.cdf(result.upper, 0, 1) - jStat.normal.cdf(result.lower, 0, 1);
    }
    expect(coverage / trials).toBeGreaterThan(0.94);
    expect(coverage / trials).toBeLessThan(0.96);
  });

  it('when the data are clean Gaussian, then the limits are close to the classical prediction interval x̄ ± t·s·√(1 + 1/n) (normal theory)', () => {
    const random = seededRandom(9);
    const values = Array.from({ length: 80 }, () => random.normal(140, 2));
    const { mean, sd, n } = summarize(values);
    const half = jStat.studentt.inv(0.975, n - 1) * sd * Math.sqrt(1 + 1 / n);
    const result = robustInterval(values);
    expect(Math.abs(result.lower - (mean - half))).toBeLessThan(0.05 * half);
    expect(Math.abs(result.upper - (mean + half))).toBeLessThan(0.05 * half);
  });

  it('when the data are symmetric, then the biweight location is their centre (by symmetry)', () => {
    const result = robustInterval(Array.from({ length: 20 }, (_, i) => 100 + i));
    expect(result.location).toBeCloseTo(109.5, 10);
    expect(result.location - result.lower).toBeCloseTo(result.upper - result.location, 10);
  });

  it('when one value is gross, then it gets zero weight and the limits hardly move (resistance, by construction)', () => {
    const random = seededRandom(21);
    const values = Array.from({ length: 30 }, () => random.normal(5, 0.5));
    const clean = robustInterval(values);
    const withGross = robustInterval([...values, 500]);
    expect(Math.abs(withGross.upper - clean.upper)).toBeLessThan(0.1);
    expect(Math.abs(withGross.lower - clean.lower)).toBeLessThan(0.1);
  });

  it('when the input is invalid, then it throws naming the function and the problem', () => {
    expect(() => robustInterval(Array.from({ length: 19 }, (_, i) => i))).toThrow(
      'robustInterval: needs at least 20 values, got 19',
    );
    expect(() => robustInterval([...Array(15).fill(3), 1, 2, 4, 5, 6])).toThrow(
      'robustInterval: more than half of the values are equal',
    );
    expect(() =>
      robustInterval(
        Array.from({ length: 20 }, (_, i) => i),
        { coverage: 1 },
      ),
    ).toThrow('robustInterval: coverage must be between 0 and 1 (exclusive), got 1');
  });
});
