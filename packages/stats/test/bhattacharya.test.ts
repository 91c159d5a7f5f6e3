import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { bhattacharya, seededRandom } from '../src/index.ts';

describe('bhattacharya (Biometrics 1967;23:115–135)', () => {
  it('when the exact bin probabilities of N(140, 2²) with unit bins 134–146 are used, then μ = 140 and σ² = 3.9995 (computed identity)', () => {
    const edges = Array.from({ length: 13 }, (_, i) => 134 + i);
    const counts = edges
      .slice(0, -1)
      .map((e) => jStat.normal.cdf(e + 1, 140, 2) - jStat.normal.cdf(e, 140, 2));
    const fit = bhattacharya(edges, counts);
    expect(fit.mean).toBeCloseTo(140, 8);
    expect(fit.sd ** 2).toBeCloseTo(3.9995, 4);
    expect(fit.points).toBe(11);
  });

  it('when a simulated N(100, 5²) sample of 100 000 is binned, then the component is recovered within 1 % (simulation)', () => {
    const random = seededRandom(8);
    const edges = Array.from({ length: 21 }, (_, i) => 90 + i);
    const counts = new Array(20).fill(0);
    for (let i = 0; i < 100_000; i++) {
      const bin = Math.floor(random.normal(100, 5)) - 90;
      if (bin >= 0 && bin < 20) counts[bin]++;
    }
    const fit = bhattacharya(edges, counts);
    expect(Math.abs(fit.mean - 100)).toBeLessThan(0.5);
    expect(Math.abs(fit.sd - 5)).toBeLessThan(0.05 * 5);
  });

  it('when the bins are invalid, then it throws naming the function and the problem', () => {
    expect(() => bhattacharya([0, 1, 2], [1, 2, 3])).toThrow(
      'bhattacharya: needs bin edges with one more entry than counts',
    );
    expect(() => bhattacharya([0, 1, 3], [1, 2])).toThrow(
      'bhattacharya: bins must have equal increasing width; bin 1 differs',
    );
    expect(() => bhattacharya([0, 1, 2], [1, 2])).toThrow(
      'bhattacharya: needs at least 2 pairs of neighbouring non-empty bins, got 1',
    );
    expect(() => bhattacharya([0, 1, 2, 3], [1, 2, 4])).toThrow('bhattacharya: the fitted slope is');
  });
});
