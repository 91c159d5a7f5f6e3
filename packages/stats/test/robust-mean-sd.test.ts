import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { robustMeanSd } from '../src/index.ts';

// ISO 13528:2015 Annex E.3 / ISO 5725-5:1998 §6.2 worked example (12 results):
// the start values and iterations 1 and 2 are printed there (to the digits checked); the converged
// values are computed from the algorithm, not printed.
const isoExample = [1.69, 0.74, 2.05, 1.14, 2.19, 1.39, 1.52, 1.5, 1.58, 0.8, 1.21, 1.63];

describe('robustMeanSd (ISO 13528 Algorithm A)', () => {
  it('when no iteration is run, then the start values are the published x* = 1.510, s* = 0.3559 (ISO 13528 Annex E.3)', () => {
    const start = robustMeanSd(isoExample, { maxIterations: 0 });
    expect(start.mean).toBeCloseTo(1.51, 3);
    expect(start.sd).toBeCloseTo(0.3559, 4);
    expect(start.iterations).toBe(0);
  });

  it('when one iteration is run, then x* = 1.475, s* = 0.4072 as published (ISO 13528 Annex E.3)', () => {
    const first = robustMeanSd(isoExample, { maxIterations: 1 });
    expect(first.mean).toBeCloseTo(1.475, 3);
    expect(first.sd).toBeCloseTo(0.4072, 4);
  });

  it('when two iterations are run, then x* = 1.460, s* = 0.4486 as published (ISO 13528 Annex E.3)', () => {
    const second = robustMeanSd(isoExample, { maxIterations: 2 });
    expect(second.mean).toBeCloseTo(1.46, 3);
    expect(second.sd).toBeCloseTo(0.4486, 4);
  });

  it('when iterated to convergence, then x* = 1.453333, s* = 0.496148 (computed from the published algorithm)', () => {
    const converged = robustMeanSd(isoExample);
    expect(converged.mean).toBeCloseTo(1.453333, 6);
    expect(converged.sd).toBeCloseTo(0.496148, 6);
    expect(converged.iterations).toBeGreaterThan(2);
    expect(converged.converged).toBe(true);
  });

  it('when every value is shifted and scaled, then x* follows and s* scales (equivariance of the definition; property)', () => {
    fc.assert(
      fc.property(
        // Results with two decimals, as instruments report them (values a few units of 1e-131 apart
        // would collapse when shifted, which is floating point, not the algorithm).
        fc.array(
          fc.integer({ min: -10000, max: 10000 }).map((v) => v / 100),
          { minLength: 5, maxLength: 40 },
        ),
        fc.double({ min: -1000, max: 1000, noNaN: true }),
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        (values, shift, scale) => {
          const base = robustMeanSd(values);
          const moved = robustMeanSd(values.map((v) => shift + scale * v));
          const tolerance = 1e-6 * (Math.abs(shift) + scale * (100 + base.sd));
          expect(Math.abs(moved.mean - (shift + scale * base.mean))).toBeLessThanOrEqual(tolerance);
          expect(Math.abs(moved.sd - scale * base.sd)).toBeLessThanOrEqual(tolerance);
        },
      ),
    );
  });

  it('when one value is gross, then x* barely moves while the plain mean is dragged (resistance, by construction)', () => {
    const withGross = [...isoExample.slice(0, 11), 50];
    const robust = robustMeanSd(withGross);
    const plainMean = withGross.reduce((a, b) => a + b, 0) / withGross.length;
    expect(Math.abs(robust.mean - 1.45)).toBeLessThan(0.1);
    expect(plainMean).toBeGreaterThan(5);
  });

  it('when more than half the values are equal (MAD = 0), then x* = median and s* falls back to √(π/2) · mean|x − median| (documented choice, not 0)', () => {
    // Deviations from the median 5 are 0, 0, 0, 0, 1, 4: mean 5/6. √(π/2) makes the mean absolute
    // deviation estimate σ of a normal distribution (E|X − μ| = σ√(2/π), a textbook identity).
    const result = robustMeanSd([5, 5, 5, 5, 6, 9]);
    expect(result).toMatchObject({
      mean: 5,
      iterations: 0,
      converged: true,
      scale: 'mean-absolute-deviation',
    });
    expect(result.sd).toBeCloseTo(Math.sqrt(Math.PI / 2) * (5 / 6), 14);
  });

  it('when every value is equal, then s* = 0 (no spread at all)', () => {
    expect(robustMeanSd([5, 5, 5])).toMatchObject({ mean: 5, sd: 0, scale: 'mean-absolute-deviation' });
  });

  it('when more than half the values are equal and one is absurd (1e300), then s* stays finite', () => {
    const result = robustMeanSd([5, 5, 5, 5, 5.1, 1e300]);
    expect(result.mean).toBe(5);
    expect(Number.isFinite(result.sd)).toBe(true);
  });

  it('when given invalid input, then it throws naming the function and the problem', () => {
    expect(() => robustMeanSd([1])).toThrow('robustMeanSd: needs at least 2 values, got 1');
    expect(() => robustMeanSd([1, Number.NaN])).toThrow(
      'robustMeanSd: value at index 1 is not a finite number (NaN)',
    );
    expect(() => robustMeanSd([1, 2], { tolerance: 0 })).toThrow(
      'robustMeanSd: tolerance must be greater than 0, got 0',
    );
    expect(() => robustMeanSd([1, 2], { maxIterations: -1 })).toThrow(
      'robustMeanSd: maxIterations must be an integer of at least 0, got -1',
    );
  });
});
