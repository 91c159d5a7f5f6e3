import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mean as referenceMean, sampleStandardDeviation } from 'simple-statistics';
import { summarize } from '../src/index.ts';
import { readNistDataset, referenceFolder, relativeError } from './helpers/reference-data.ts';

const nist = referenceFolder('nist-strd');

// Certified values: NIST Statistical Reference Datasets, Univariate Summary Statistics
// (https://www.itl.nist.gov/div898/strd/univ/homepage.html).
const certified = [
  { name: 'Lew', n: 200, mean: -177.435, sd: 277.332168044316, tolerance: 1e-12 },
  { name: 'Lottery', n: 218, mean: 518.95871559633, sd: 291.699727470969, tolerance: 1e-12 },
  { name: 'Mavro', n: 50, mean: 2.001856, sd: 0.000429123454003053, tolerance: 1e-12 },
  { name: 'Michelso', n: 100, mean: 299.8524, sd: 0.0790105478190518, tolerance: 1e-12 },
  { name: 'PiDigits', n: 5000, mean: 4.5348, sd: 2.86733906028871, tolerance: 1e-12 },
  { name: 'NumAcc1', n: 3, mean: 10000002, sd: 1, tolerance: 1e-12 },
  // NumAcc2–4: the decimal inputs are not exact in binary, so 1e-8 is the attainable accuracy.
  { name: 'NumAcc2', n: 1001, mean: 1.2, sd: 0.1, tolerance: 1e-8 },
  { name: 'NumAcc3', n: 1001, mean: 1000000.2, sd: 0.1, tolerance: 1e-8 },
  { name: 'NumAcc4', n: 1001, mean: 10000000.2, sd: 0.1, tolerance: 1e-8 },
];

describe.skipIf(!nist.present)(`summarize against NIST StRD certified values ${nist.skipReason}`, () => {
  for (const dataset of certified) {
    it(`when given ${dataset.name}.dat, then n, mean and SD match the certified values (NIST StRD)`, () => {
      const result = summarize(readNistDataset(dataset.name));
      expect(result.n).toBe(dataset.n);
      expect(relativeError(result.mean, dataset.mean)).toBeLessThanOrEqual(1e-12);
      expect(relativeError(result.sd, dataset.sd)).toBeLessThanOrEqual(dataset.tolerance);
    });
  }

  it('when given Michelso.dat, then CV % = 100 · certified SD / certified mean (computed from the certified values by the definition; NIST certifies no CV)', () => {
    expect(summarize(readNistDataset('Michelso')).cv).toBeCloseTo((100 * 0.0790105478190518) / 299.8524, 12);
  });

  it('when given NumAcc4.dat, then the naive Σx² − (Σx)²/n formula fails where summarize does not', () => {
    const values = readNistDataset('NumAcc4');
    const n = values.length;
    const sum = values.reduce((a, b) => a + b, 0);
    const sumSquares = values.reduce((a, b) => a + b * b, 0);
    const naiveSd = Math.sqrt(Math.max(0, (sumSquares - (sum * sum) / n) / (n - 1)));
    expect(relativeError(naiveSd, 0.1)).toBeGreaterThan(1e-3);
    expect(relativeError(summarize(values).sd, 0.1)).toBeLessThanOrEqual(1e-8);
  });
});

describe('summarize', () => {
  it('when given the example values, then it matches simple-statistics (reference library)', () => {
    const values = [2, 4, 4, 4, 5, 5, 7, 9];
    const result = summarize(values);
    expect(result.mean).toBe(referenceMean(values));
    expect(result.sd).toBeCloseTo(sampleStandardDeviation(values), 14);
    expect(result.cv).toBeCloseTo((100 * sampleStandardDeviation(values)) / referenceMean(values), 12);
  });

  it('when given any finite values, then mean and SD agree with simple-statistics (property)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 2, maxLength: 200 }),
        (values) => {
          const result = summarize(values);
          const scale = Math.max(1, ...values.map(Math.abs));
          expect(Math.abs(result.mean - referenceMean(values))).toBeLessThanOrEqual(1e-9 * scale);
          expect(Math.abs(result.sd - sampleStandardDeviation(values))).toBeLessThanOrEqual(1e-7 * scale);
        },
      ),
    );
  });

  it('when the mean is 0, then the CV is NaN rather than infinite', () => {
    expect(summarize([-1, 1]).cv).toBeNaN();
  });

  it('when given fewer than 2 values, then it throws naming the function and the count', () => {
    expect(() => summarize([])).toThrow('summarize: needs at least 2 values, got 0');
    expect(() => summarize([1])).toThrow('summarize: needs at least 2 values, got 1');
  });

  it('when a value is not finite, then it throws naming its index', () => {
    expect(() => summarize([1, Number.NaN, 3])).toThrow(
      'summarize: value at index 1 is not a finite number (NaN)',
    );
    expect(() => summarize([1, 2, Infinity])).toThrow(
      'summarize: value at index 2 is not a finite number (Infinity)',
    );
  });
});
