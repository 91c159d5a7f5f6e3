import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { pool, summarize } from '../src/index.ts';
import { readNistDataset, referenceFolder, relativeError } from './helpers/reference-data.ts';

const nist = referenceFolder('nist-strd');

describe.skipIf(!nist.present)(`pool: Lew monthly split ${nist.skipReason}`, () => {
  it('when Lew.dat is split in file order into 10 months of 20 and pooled, then the certified mean and SD return (NIST StRD certified values, published; the monthly split is our consistency check)', () => {
    const lew = readNistDataset('Lew');
    const months = Array.from({ length: 10 }, (_, i) => summarize(lew.slice(20 * i, 20 * i + 20)));
    const pooled = pool(months);
    expect(pooled.n).toBe(200);
    expect(relativeError(pooled.mean, -177.435)).toBeLessThanOrEqual(1e-12);
    expect(relativeError(pooled.sd, 277.332168044316)).toBeLessThanOrEqual(1e-12);
  });

  it('when Lew.dat months are pooled, then the within SD equals the SD of the residuals from each month mean (one-way ANOVA, computed from raw values)', () => {
    const lew = readNistDataset('Lew');
    const chunks = Array.from({ length: 10 }, (_, i) => lew.slice(20 * i, 20 * i + 20));
    let residualSquares = 0;
    for (const chunk of chunks) {
      const m = chunk.reduce((a, b) => a + b, 0) / chunk.length;
      for (const v of chunk) residualSquares += (v - m) ** 2;
    }
    const expectedWithin = Math.sqrt(residualSquares / (200 - 10));
    expect(relativeError(pool(chunks.map(summarize)).withinSd, expectedWithin)).toBeLessThanOrEqual(1e-12);
  });
});

describe('pool', () => {
  it('when parts are summaries of pieces of one data set, then the pooled figures equal the summary of all values (property, docs/methods.md §1)', () => {
    const part = fc.array(fc.double({ min: -1000, max: 1000, noNaN: true }), { minLength: 2, maxLength: 30 });
    fc.assert(
      fc.property(fc.array(part, { minLength: 1, maxLength: 8 }), (pieces) => {
        const all = pieces.flat();
        const direct = summarize(all);
        const pooled = pool(pieces.map(summarize));
        expect(pooled.n).toBe(all.length);
        expect(Math.abs(pooled.mean - direct.mean)).toBeLessThanOrEqual(1e-9);
        expect(Math.abs(pooled.sd - direct.sd)).toBeLessThanOrEqual(1e-9 * Math.max(1, direct.sd));
      }),
    );
  });

  it('when parts of n = 1 are pooled, then their SD of 0 contributes only between-part spread (definition)', () => {
    const pooled = pool([
      { n: 1, mean: 1, sd: 0 },
      { n: 1, mean: 3, sd: 0 },
    ]);
    expect(pooled.sd).toBeCloseTo(summarize([1, 3]).sd, 14);
    expect(pooled.withinSd).toBeNaN();
  });

  it('when given no parts or fewer than 2 values, then it throws naming the function', () => {
    expect(() => pool([])).toThrow('pool: needs at least 1 part, got 0');
    expect(() => pool([{ n: 1, mean: 5, sd: 0 }])).toThrow(
      'pool: needs at least 2 values in all parts together, got 1',
    );
  });

  it('when a part is invalid, then it throws naming the part and the problem', () => {
    expect(() => pool([{ n: 0, mean: 1, sd: 1 }])).toThrow(
      'pool: part 0 n must be an integer of at least 1, got 0',
    );
    expect(() => pool([{ n: 2.5, mean: 1, sd: 1 }])).toThrow(
      'pool: part 0 n must be an integer of at least 1, got 2.5',
    );
    expect(() => pool([{ n: 3, mean: Number.NaN, sd: 1 }])).toThrow(
      'pool: part 0 mean must be a finite number, got NaN',
    );
    expect(() => pool([{ n: 3, mean: 1, sd: -1 }])).toThrow('pool: part 0 sd must not be negative, got -1');
  });

  it('when finite parts overflow the pooled figures, then it throws naming the figure and the part', () => {
    // (2e200)² exceeds the largest double (about 1.8e308): the between-part sum of squares overflows.
    expect(() =>
      pool([
        { n: 10, mean: 1e200, sd: 1 },
        { n: 10, mean: -1e200, sd: 1 },
      ]),
    ).toThrow("pool: pooled SD is not finite (Infinity): the parts' figures are too large or too far apart");
    expect(() =>
      pool([
        { n: 10, mean: 1, sd: 1e300 },
        { n: 10, mean: 2, sd: 1 },
      ]),
    ).toThrow('largest SD 1e+300 in part 0');
    expect(() =>
      pool([
        { n: 10, mean: 1.5e308, sd: 0 },
        { n: 10, mean: 1.5e308, sd: 0 },
      ]),
    ).not.toThrow();
  });
});
