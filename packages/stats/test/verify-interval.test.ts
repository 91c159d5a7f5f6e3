import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { seededRandom, verifyInterval } from '../src/index.ts';

const results = [
  3.6, 3.8, 3.9, 4.0, 4.1, 4.1, 4.2, 4.2, 4.3, 4.3, 4.4, 4.4, 4.5, 4.6, 4.7, 4.8, 4.9, 5.0, 5.2, 5.4,
];

describe('verifyInterval (EP28-A3c: 20 results, accept when ≤ 2 outside; memory)', () => {
  it('when 2 of 20 fall outside, then the interval is accepted; when 3 do, it is not', () => {
    expect(verifyInterval(results, [3.5, 5.1])).toEqual({ n: 20, outside: 2, accepted: true });
    expect(verifyInterval(results, [3.7, 5.1])).toEqual({ n: 20, outside: 3, accepted: false });
  });

  it('when a result equals a limit, then it counts as inside', () => {
    expect(verifyInterval(results, [3.6, 5.4]).outside).toBe(0);
  });

  it('when the interval is correct, then about 92.45 % of verifications pass: P(X ≤ 2 | n = 20, p = 0.05) = 0.924516 (computed; simulation)', () => {
    expect(jStat.binomial.cdf(2, 20, 0.05)).toBeCloseTo(0.924516, 6);
    const random = seededRandom(77);
    const z = 1.959963984540054; // central 95 % of N(0, 1)
    let accepted = 0;
    const trials = 5000;
    for (let t = 0; t < trials; t++) {
      const sample = Array.from({ length: 20 }, () => random.normal(0, 1));
      if (verifyInterval(sample, [-z, z]).accepted) accepted++;
    }
    const se = Math.sqrt((0.924516 * (1 - 0.924516)) / trials);
    expect(Math.abs(accepted / trials - 0.924516)).toBeLessThan(4 * se);
  });

  it('when the input is invalid, then it throws naming the function and the problem', () => {
    expect(() => verifyInterval(results.slice(1), [3, 5])).toThrow(
      'verifyInterval: needs exactly 20 results, got 19',
    );
    expect(() => verifyInterval([...results.slice(1), Number.NaN], [3, 5])).toThrow(
      'verifyInterval: result at index 19 is not a finite number (NaN)',
    );
    expect(() => verifyInterval(results, [5, 3])).toThrow(
      'verifyInterval: interval lower limit 5 is above the upper limit 3',
    );
  });
});
