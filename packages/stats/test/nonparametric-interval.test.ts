import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { nonparametricInterval, percentile } from '../src/index.ts';
import { readNistDataset, referenceFolder } from './helpers/reference-data.ts';

const nist = referenceFolder('nist-strd');

/** numpy.percentile(method='weibull') as documented: virtual index h = p(n + 1), 1-based, linear between neighbours. */
function weibullReference(values: number[], p: number): number {
  const sorted = [...values].sort((a, b) => a - b);
  const h = p * (sorted.length + 1);
  const below = Math.floor(h);
  if (below >= sorted.length) return sorted[sorted.length - 1];
  return sorted[below - 1] + (h - below) * (sorted[below] - sorted[below - 1]);
}

describe.skipIf(!nist.present)(`nonparametricInterval on NIST StRD data ${nist.skipReason}`, () => {
  // Expected: computed once with numpy 2.4.6, numpy.percentile(data, [2.5, 97.5], method='weibull') (general-purpose
  // reference library; NIST certifies only the datasets' mean and SD, not these percentiles).
  const expected = [
    { name: 'Lew', lower: -577.0, upper: 202.975 },
    { name: 'Lottery', lower: 24.0, upper: 975.05 },
    { name: 'Michelso', lower: 299.68675, upper: 300.0 },
    { name: 'PiDigits', lower: 0, upper: 9 },
  ];
  for (const row of expected) {
    it(`when given ${row.name}.dat, then the limits equal numpy's weibull percentiles`, () => {
      const result = nonparametricInterval(readNistDataset(row.name));
      expect(result.lower.value).toBeCloseTo(row.lower, 9);
      expect(result.upper.value).toBeCloseTo(row.upper, 9);
    });
  }
});

describe('nonparametricInterval', () => {
  it('when n = 120, then the limits use ranks 3.025 and 117.975 and the CIs ranks 1–7 and 114–120 (EP28-A3c)', () => {
    const values = Array.from({ length: 120 }, (_, i) => 10 * (120 - i)); // 1200, 1190, … 10 (unsorted input)
    const result = nonparametricInterval(values);
    expect(result.n).toBe(120);
    expect(result.lower.value).toBeCloseTo(30.25, 10); // x(3) + 0.025·(x(4) − x(3)) = 30 + 0.25
    expect(result.upper.value).toBeCloseTo(1179.75, 10);
    expect(result.lower.ci).toEqual([10, 70]);
    expect(result.upper.ci).toEqual([1140, 1200]);
  });

  it('when n < 119, then the limits are given without confidence intervals (EP28-A3c)', () => {
    const result = nonparametricInterval(Array.from({ length: 60 }, (_, i) => i));
    expect(result.lower.ci).toBeNull();
    expect(result.upper.ci).toBeNull();
  });

  it('when given any values, then the limits equal the weibull percentile definition r = p(n + 1), interpolated (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e4, max: 1e4, noNaN: true }), { minLength: 39, maxLength: 400 }),
        fc.double({ min: 0.01, max: 0.2, noNaN: true }),
        (values, lower) => {
          const upper = 1 - lower;
          const n = values.length;
          if (lower * (n + 1) < 1) return; // too few values for this percentile (the function throws; tested below)
          const result = nonparametricInterval(values, { lower, upper });
          expect(result.lower.value).toBeCloseTo(weibullReference(values, lower), 6);
          expect(result.upper.value).toBeCloseTo(weibullReference(values, upper), 6);
        },
      ),
    );
  });

  it('when fewer than 39 values are given for the 2.5th/97.5th percentiles, then it throws (rank p(n + 1) below 1)', () => {
    expect(() => nonparametricInterval(Array.from({ length: 38 }, (_, i) => i))).toThrow(
      'nonparametricInterval: needs at least 39 values to estimate the 0.025 quantile by rank p(n + 1), got 38',
    );
  });

  it('when the input is invalid, then it throws naming the function and the problem', () => {
    expect(() => nonparametricInterval([])).toThrow('nonparametricInterval: needs at least 2 values, got 0');
    expect(() => nonparametricInterval([1, 2, Number.NaN])).toThrow(
      'nonparametricInterval: value at index 2 is not a finite number',
    );
    expect(() => nonparametricInterval([1, 2, 3], { lower: 0.9, upper: 0.1 })).toThrow(
      'nonparametricInterval: lower (0.9) must be below upper (0.1)',
    );
  });
});

describe('percentile', () => {
  it('when given 1 … 19, then the quartiles are ranks 5 and 15 (r = p(n + 1))', () => {
    const values = Array.from({ length: 19 }, (_, i) => i + 1);
    expect(percentile(values, 0.25)).toBe(5);
    expect(percentile(values, 0.75)).toBe(15);
  });

  it('when p is outside (0, 1), then it throws', () => {
    expect(() => percentile([1, 2, 3], 0)).toThrow(
      'percentile: p must be between 0 and 1 (exclusive), got 0',
    );
  });
});
