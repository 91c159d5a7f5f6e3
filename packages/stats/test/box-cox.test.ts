import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { boxCox, boxCoxInverse, boxCoxLambda, boxCoxLogLikelihood } from '../src/index.ts';
import { readNhanesAdults, referenceFolder } from './helpers/reference-data.ts';

const nhanes = referenceFolder('nhanes-2017-2018-biopro');
const skewed = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 12, 15, 20, 30, 50];

describe('boxCox and boxCoxInverse', () => {
  it('when λ = 0.5 or 0, then the transform is (x^λ − 1)/λ or ln x (Box & Cox 1964)', () => {
    expect(boxCox(4, 0.5)).toBe(2);
    expect(boxCox(Math.E, 0)).toBe(1);
    expect(boxCox(8, 1 / 3)).toBeCloseTo(3, 14);
  });

  it('when a value is transformed and back, then it returns (property)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e-3, max: 1e4, noNaN: true }),
        fc.double({ min: -2, max: 2, noNaN: true }),
        (x, lambda) => {
          // Relative check: a strong transform (λ = −2, large x) keeps only ~8 digits of x.
          expect(Math.abs(boxCoxInverse(boxCox(x, lambda), lambda) - x)).toBeLessThanOrEqual(1e-6 * x);
        },
      ),
    );
  });

  it('when x is not positive, then it throws', () => {
    expect(() => boxCox(0, 1)).toThrow('boxCox: x must be a finite number greater than 0, got 0');
    expect(() => boxCoxInverse(Number.NaN, 1)).toThrow('boxCoxInverse: y must be a finite number, got NaN');
  });
});

describe('boxCoxLogLikelihood and boxCoxLambda', () => {
  it('when evaluated, then the log-likelihood equals scipy.stats.boxcox_llf (computed once with scipy 1.17.1, a reference library; not a publication)', () => {
    expect(boxCoxLogLikelihood([1, 2, 3, 4, 5], 1)).toBeCloseTo(-1.732867951399863, 10);
    expect(boxCoxLogLikelihood(skewed, 0.5)).toBeCloseTo(-32.22942053314949, 10);
    expect(boxCoxLogLikelihood(skewed, 0)).toBeCloseTo(-30.38057005354994, 10);
  });

  it('when maximised, then λ equals scipy.stats.boxcox_normmax(method="mle") = 0.0479916 (computed once with scipy 1.17.1)', () => {
    expect(boxCoxLambda(skewed)).toBeCloseTo(0.047991566419150165, 6);
  });

  it.skipIf(!nhanes.present)(
    `when given NHANES 2017–2018 adult ALT (n = 5106), then λ equals -0.3807502 computed once with scipy 1.17.1 (CDC/NCHS data; a computation, not a published value) ${nhanes.skipReason}`,
    () => {
      const alt = readNhanesAdults('LBXSATSI');
      expect(alt.length).toBe(5106);
      expect(boxCoxLambda(alt)).toBeCloseTo(-0.38075023707389893, 6);
    },
  );

  it('when the data are exactly log-normal shaped quantiles, then λ is near 0 (by construction)', () => {
    // Values exp(z) at normal scores: ln x is symmetric, so the maximum-likelihood λ is 0 up to the grid of scores.
    const scores = Array.from({ length: 199 }, (_, i) => Math.sqrt(2) * inverseErf((2 * (i + 1)) / 200 - 1));
    expect(Math.abs(boxCoxLambda(scores.map(Math.exp)))).toBeLessThan(0.02);
  });

  it('when values are invalid, then it throws naming the function and the value', () => {
    expect(() => boxCoxLambda([1, 2])).toThrow('boxCoxLambda: needs at least 3 values, got 2');
    expect(() => boxCoxLambda([1, 2, -3])).toThrow(
      'boxCoxLambda: value at index 2 must be greater than 0 for a Box-Cox transform, got -3',
    );
    expect(() => boxCoxLambda([2, 2, 2])).toThrow('boxCoxLambda: all values are equal, so λ is undefined');
    expect(() => boxCoxLambda(skewed, { range: [1, 0] })).toThrow(
      'boxCoxLambda: range must be increasing, got [1, 0]',
    );
  });
});

/** Inverse error function by Newton steps on Math's exp (test helper only). */
function inverseErf(y: number): number {
  let x = 0;
  for (let i = 0; i < 100; i++) {
    const err = erf(x) - y;
    x -= err / ((2 / Math.sqrt(Math.PI)) * Math.exp(-x * x));
  }
  return x;
}
function erf(x: number): number {
  // Maclaurin series, adequate for |x| < 3 with 80 terms.
  let sum = 0;
  let term = x;
  for (let n = 0; n < 80; n++) {
    sum += term / (2 * n + 1);
    term *= (-x * x) / (n + 1);
  }
  return (2 / Math.sqrt(Math.PI)) * sum;
}
