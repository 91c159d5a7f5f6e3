import { describe, expect, it } from 'vitest';
import { screenOutliers, seededRandom } from '../src/index.ts';
import { readNhanesAdults, referenceFolder } from './helpers/reference-data.ts';

const nhanes = referenceFolder('nhanes-2017-2018-biopro');

describe("screenOutliers 'tukey' (Box-Cox then Tukey fences, Horn et al.)", () => {
  it.skipIf(!nhanes.present)(
    `when given NHANES 2017–2018 adult ALT, then 41 low and 40 high values are removed and 7–106 U/L kept ${nhanes.skipReason}`,
    () => {
      // Expected from an independent computation with scipy 1.17.1 / numpy 2.4.6: λ = boxcox_normmax(method='mle'),
      // quartiles numpy.percentile(method='weibull') of the transformed values, fences Q1 − 1.5·IQR, Q3 + 1.5·IQR.
      const alt = readNhanesAdults('LBXSATSI');
      const { kept, removed } = screenOutliers(alt, 'tukey');
      expect(removed.length).toBe(81);
      expect(Math.min(...kept)).toBe(7);
      expect(Math.max(...kept)).toBe(106);
      expect(removed.filter((v) => v < 7).length).toBe(41);
      expect(kept.length + removed.length).toBe(alt.length);
    },
  );

  it('when log-normal values get one gross value, then only that value is removed (by construction)', () => {
    const random = seededRandom(3);
    const values = Array.from({ length: 200 }, () => Math.exp(random.normal(3, 0.3)));
    const { removed } = screenOutliers([...values, 5000], 'tukey');
    expect(removed).toContain(5000);
    // A Gaussian sample has 0.7 % beyond Tukey's fences: ≈ 1.4 of 200 (Poisson: P(> 5) ≈ 0.004).
    expect(removed.length - 1).toBeLessThanOrEqual(5);
  });

  it('when values are not positive, then it throws (Box-Cox needs x > 0)', () => {
    expect(() => screenOutliers([1, 2, 3, 0], 'tukey')).toThrow(
      'screenOutliers: Tukey screening after a Box-Cox transform needs values greater than 0; value at index 3 is 0',
    );
  });
});

describe("screenOutliers 'dixon' (D/R ≥ 1/3, Reed, Henry & Mason 1971)", () => {
  it('when the gap to the highest value is at least a third of the range, then it is removed', () => {
    // D = 9.9 − 3.8 = 6.1, R = 9.9 − 3.1 = 6.8, D/R = 0.897 ≥ 1/3.
    expect(screenOutliers([3.1, 3.3, 3.4, 3.4, 3.5, 3.6, 3.7, 3.8, 9.9], 'dixon')).toEqual({
      kept: [3.1, 3.3, 3.4, 3.4, 3.5, 3.6, 3.7, 3.8],
      removed: [9.9],
    });
  });

  it('when D/R is exactly 1/3, then the value is removed; just below, it is kept (boundary of "≥")', () => {
    // Range 0 … 3 and gap 1 at the top: D/R = 1/3.
    expect(screenOutliers([0, 0.5, 1, 1.5, 2, 3], 'dixon').removed).toEqual([3]);
    expect(screenOutliers([0, 0.5, 1, 1.5, 2.01, 3], 'dixon').removed).toEqual([]);
  });

  it('when both ends are outlying, then both are removed and the test repeats on what is left', () => {
    const values = [-50, 10, 10.2, 10.4, 10.6, 10.8, 11, 60, 200];
    // Round 1: high D/R = 140/250 → remove 200; low D/R = 60/250 → keep. Round 2: range −50 … 60:
    // low D/R = 60/110 → remove −50; high D/R = 49/110 → remove 60. Round 3: 10 … 11 evenly spaced → stop.
    expect(screenOutliers(values, 'dixon')).toEqual({
      kept: [10, 10.2, 10.4, 10.6, 10.8, 11],
      removed: [-50, 60, 200],
    });
  });

  it('when fewer than 3 values or an unknown method, then it throws', () => {
    expect(() => screenOutliers([1, 2], 'dixon')).toThrow('screenOutliers: needs at least 3 values, got 2');
    expect(() => screenOutliers([1, 2, 3], 'grubbs' as never)).toThrow(
      "screenOutliers: unknown method 'grubbs', expected 'tukey' or 'dixon'",
    );
  });
});
