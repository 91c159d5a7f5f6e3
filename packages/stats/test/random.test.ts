import { describe, expect, it } from 'vitest';
import { mean, sampleStandardDeviation, sampleSkewness } from 'simple-statistics';
import { seededRandom } from '../src/index.ts';

describe('seededRandom (Mulberry32 + Box-Muller)', () => {
  it('when two generators share a seed, then they give the same sequence; another seed differs', () => {
    const a = seededRandom(42);
    const b = seededRandom(42);
    const c = seededRandom(43);
    const first = Array.from({ length: 5 }, () => a.uniform());
    expect(Array.from({ length: 5 }, () => b.uniform())).toEqual(first);
    expect(Array.from({ length: 5 }, () => c.uniform())).not.toEqual(first);
  });

  it('when 100 000 uniforms are drawn, then they lie in [0, 1) with mean 1/2 and SD 1/√12 (uniform distribution theory)', () => {
    const random = seededRandom(1);
    const values = Array.from({ length: 100_000 }, () => random.uniform());
    expect(Math.min(...values)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...values)).toBeLessThan(1);
    expect(Math.abs(mean(values) - 0.5)).toBeLessThan(0.005);
    expect(Math.abs(sampleStandardDeviation(values) - 1 / Math.sqrt(12))).toBeLessThan(0.005);
  });

  it('when 100 000 normals are drawn, then mean, SD and skewness match N(10, 2²) within sampling error (simple-statistics)', () => {
    const random = seededRandom(2);
    const values = Array.from({ length: 100_000 }, () => random.normal(10, 2));
    expect(Math.abs(mean(values) - 10)).toBeLessThan(0.03);
    expect(Math.abs(sampleStandardDeviation(values) - 2)).toBeLessThan(0.03);
    expect(Math.abs(sampleSkewness(values))).toBeLessThan(0.03);
  });

  it('when the seed is not an integer, then it throws', () => {
    expect(() => seededRandom(1.5)).toThrow('seededRandom: seed must be an integer, got 1.5');
  });
});
