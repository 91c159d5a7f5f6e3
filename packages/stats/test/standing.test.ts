import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  classifyCvr,
  classifySdi,
  DEFAULT_CVR_THRESHOLDS,
  DEFAULT_SDI_THRESHOLDS,
  peerStatistics,
  seededRandom,
  standing,
  summarize,
} from '../src/index.ts';

describe('standing', () => {
  it('when given lab and peer figures, then SDI, CVR and bias % follow their definitions (docs/methods.md §3)', () => {
    // Hand computation: SDI = (102 − 100)/4 = 0.5; lab CV = 300/102 %; CVR = (300/102)/2.5; bias = 2 %.
    const result = standing({ n: 20, mean: 102, sd: 3 }, { mean: 100, sd: 4, withinCv: 2.5 });
    expect(result.sdi).toBe(0.5);
    expect(result.cvr).toBeCloseTo(300 / 102 / 2.5, 14);
    expect(result.biasPct).toBeCloseTo(2, 14);
  });

  // Raw data of one lab and its peers, built from a seeded generator; the figures are recomputed
  // after transforming every raw value (check by construction from the definitions).
  function figuresAfter(transform: (v: number) => number, seed: number) {
    const random = seededRandom(seed);
    const labs = Array.from({ length: 8 }, (_, i) => {
      const centre = random.normal(50, 2);
      return { id: `lab-${i}`, raw: Array.from({ length: 20 }, () => transform(random.normal(centre, 1))) };
    });
    const peer = peerStatistics(
      labs.map(({ id, raw }) => ({ id, ...summarize(raw) })),
      { minLabsForScreening: 100 },
    );
    return standing(summarize(labs[0].raw), peer);
  }

  it('when every raw value is shifted and scaled, then the SDI does not change (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1000 }),
        fc.double({ min: -30, max: 1000, noNaN: true }), // shift in units of the data, so the values stay positive
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        (seed, shift, scale) => {
          const base = figuresAfter((v) => v, seed);
          const moved = figuresAfter((v) => scale * (v + shift), seed);
          expect(moved.sdi).toBeCloseTo(base.sdi, 8);
        },
      ),
      { numRuns: 50 },
    );
  });

  it('when every raw value is scaled, then the CVR and bias % do not change (property; a shift changes every CV, so only scaling applies)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1000 }),
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        (seed, scale) => {
          const base = figuresAfter((v) => v, seed);
          const scaled = figuresAfter((v) => scale * v, seed);
          expect(scaled.cvr).toBeCloseTo(base.cvr, 8);
          expect(scaled.biasPct).toBeCloseTo(base.biasPct, 8);
        },
      ),
      { numRuns: 50 },
    );
  });

  it('when a figure is invalid, then it throws naming the function and the figure', () => {
    const peer = { mean: 100, sd: 4, withinCv: 2.5 };
    expect(() => standing({ n: 20, mean: 100, sd: 3 }, { ...peer, sd: 0 })).toThrow(
      'standing: peer sd must be greater than 0, got 0',
    );
    expect(() => standing({ n: 20, mean: 100, sd: 3 }, { ...peer, withinCv: -1 })).toThrow(
      'standing: peer withinCv must be greater than 0, got -1',
    );
    expect(() => standing({ n: 20, mean: 100, sd: 3 }, { ...peer, mean: 0 })).toThrow(
      'standing: peer mean is 0',
    );
    expect(() => standing({ n: 1, mean: 100, sd: 3 }, peer)).toThrow(
      'standing: lab n must be an integer of at least 2, got 1',
    );
    expect(() => standing({ n: 20, mean: Number.NaN, sd: 3 }, peer)).toThrow(
      'standing: lab mean must be a finite number, got NaN',
    );
    expect(() => standing({ n: 20, mean: 100, sd: -3 }, peer)).toThrow(
      'standing: lab sd must not be negative, got -3',
    );
  });

  it('when finite figures overflow a result, then it throws naming the SDI, CVR or bias %', () => {
    // Beyond the largest double (about 1.8e308) each figure would be ±Infinity.
    expect(() => standing({ n: 20, mean: 1e300, sd: 1 }, { mean: 1, sd: 1e-10, withinCv: 2 })).toThrow(
      'standing: SDI is not finite (Infinity)',
    );
    expect(() => standing({ n: 20, mean: 1e-300, sd: 1e10 }, { mean: 1, sd: 1, withinCv: 2 })).toThrow(
      'standing: CVR is not finite (Infinity)',
    );
    expect(() => standing({ n: 20, mean: 1.5e308, sd: 1 }, { mean: 1e-10, sd: 1e300, withinCv: 2 })).toThrow(
      'standing: bias % is not finite (Infinity)',
    );
  });
});

describe('classifySdi and classifyCvr (docs/methods.md §3 thresholds, common practice with no single source)', () => {
  it('when |SDI| is on or inside a bound, then it takes the better flag', () => {
    expect([0, 1, 1.0001, 2, 2.5, 3, 3.0001].map((v) => classifySdi(v))).toEqual([
      'fine',
      'fine',
      'acceptable',
      'acceptable',
      'warning',
      'warning',
      'action',
    ]);
    expect([-1, -2.4, -3.5].map((v) => classifySdi(v))).toEqual(['fine', 'warning', 'action']);
  });

  it('when the CVR is on or inside a bound, then it takes the better flag', () => {
    expect([0.5, 1, 1.2, 1.5, 1.7, 2, 2.01].map((v) => classifyCvr(v))).toEqual([
      'fine',
      'fine',
      'acceptable',
      'acceptable',
      'warning',
      'warning',
      'action',
    ]);
  });

  it('when thresholds are given, then they replace the defaults; the defaults are the docs/methods.md figures', () => {
    expect(DEFAULT_SDI_THRESHOLDS).toEqual({ fine: 1, acceptable: 2, warning: 3 });
    expect(DEFAULT_CVR_THRESHOLDS).toEqual({ fine: 1, acceptable: 1.5, warning: 2 });
    expect(classifySdi(1.8, { fine: 0.5, acceptable: 1.5, warning: 2.5 })).toBe('warning');
  });

  it('when a value or the thresholds are invalid, then it throws', () => {
    expect(() => classifySdi(Number.NaN)).toThrow('classifySdi: sdi must be a finite number, got NaN');
    expect(() => classifyCvr(-0.1)).toThrow('classifyCvr: cvr must not be negative, got -0.1');
    expect(() => classifySdi(1, { fine: 2, acceptable: 1, warning: 3 })).toThrow(
      'classifySdi: thresholds must satisfy',
    );
  });
});
