import { describe, expect, it } from 'vitest';
import { indirectInterval, seededRandom } from '../src/index.ts';

// No published worked example of a truncated-normal indirect method with its raw data was available,
// so recovery is checked by simulation where the true healthy limits are known.
//
// Stated tolerance: each recovered limit within 0.4 healthy SD of the true limit for n ≥ 10 000 and
// within 0.5 SD for n = 5 000 (SD on the scale where the healthy data are normal: mmol/L for the
// Gaussian scenario, ln units for the log-normal one). For comparison, the 90 % CI of a direct
// nonparametric 2.5th percentile from 120 reference individuals (ranks 1–7) spans about ±0.5 SD.

type Random = ReturnType<typeof seededRandom>;
interface Scenario {
  name: string;
  truth: [number, number];
  sd: number;
  logScale: boolean;
  healthyFraction: number;
  draw: (random: Random) => number;
}

const z975 = 1.959963984540054;
const gaussianWithTails: Scenario = {
  // 80 % healthy N(140, 2²) (limits 140 ∓ z₀.₉₇₅·2 = 136.08 / 143.92, computed from the normal quantile)
  // + 8 % N(130, 4²) + 12 % N(150, 4²). z₀.₉₇₅ is the standard normal quantile (textbook value).
  name: '80 % N(140, 2²) with 20 % pathological tails',
  truth: [140 - z975 * 2, 140 + z975 * 2],
  sd: 2,
  logScale: false,
  healthyFraction: 0.8,
  draw: (random) => {
    const u = random.uniform();
    if (u < 0.8) return random.normal(140, 2);
    return u < 0.88 ? random.normal(130, 4) : random.normal(150, 4);
  },
};
const logNormalWithTails: Scenario = {
  // 85 % healthy log-normal (median 20, SD of ln 0.35) + 5 % low (median 5) + 10 % high (median 80).
  name: '85 % log-normal(ln 20, 0.35²) with 15 % pathological tails',
  truth: [20 * Math.exp(-z975 * 0.35), 20 * Math.exp(z975 * 0.35)],
  sd: 0.35,
  logScale: true,
  healthyFraction: 0.85,
  draw: (random) => {
    const u = random.uniform();
    if (u < 0.85) return Math.exp(random.normal(Math.log(20), 0.35));
    return u < 0.9 ? Math.exp(random.normal(Math.log(5), 0.4)) : Math.exp(random.normal(Math.log(80), 0.5));
  },
};
const roundedGaussian: Scenario = {
  ...gaussianWithTails,
  name: 'the Gaussian scenario rounded to whole mmol/L, as analysers report sodium',
  draw: (random) => Math.round(gaussianWithTails.draw(random)),
};
const healthyOnly: Scenario = {
  ...gaussianWithTails,
  name: 'healthy N(140, 2²) only',
  healthyFraction: 1,
  draw: (random) => random.normal(140, 2),
};

/** Error of a recovered limit in healthy SDs. */
function errorInSd(scenario: Scenario, recovered: number, truth: number): number {
  return scenario.logScale ? Math.log(recovered / truth) / scenario.sd : (recovered - truth) / scenario.sd;
}

const runs: { scenario: Scenario; n: number; seeds: number[] }[] = [
  { scenario: gaussianWithTails, n: 5_000, seeds: [11, 12, 13] },
  { scenario: gaussianWithTails, n: 20_000, seeds: [21, 22] },
  { scenario: gaussianWithTails, n: 200_000, seeds: [31] },
  { scenario: logNormalWithTails, n: 5_000, seeds: [41, 42, 43] },
  { scenario: logNormalWithTails, n: 20_000, seeds: [51, 52] },
  { scenario: logNormalWithTails, n: 200_000, seeds: [61] },
  { scenario: roundedGaussian, n: 20_000, seeds: [71, 72] },
  { scenario: healthyOnly, n: 10_000, seeds: [81] },
];

describe('indirectInterval (truncated normal after Box-Cox; recovery by simulation)', () => {
  for (const { scenario, n, seeds } of runs) {
    const tolerance = n >= 10_000 ? 0.4 : 0.5;
    it(`when given ${n} values of ${scenario.name}, then both limits are within ${tolerance} SD of the truth (seeds ${seeds.join(', ')})`, () => {
      for (const seed of seeds) {
        const random = seededRandom(seed);
        const values = Array.from({ length: n }, () => scenario.draw(random));
        const result = indirectInterval(values);
        expect(Math.abs(errorInSd(scenario, result.lower, scenario.truth[0]))).toBeLessThanOrEqual(tolerance);
        expect(Math.abs(errorInSd(scenario, result.upper, scenario.truth[1]))).toBeLessThanOrEqual(tolerance);
        expect(Math.abs(result.diagnostics.healthyFraction - scenario.healthyFraction)).toBeLessThan(0.1);
        expect(result.method).toBe('truncated-normal-box-cox');
      }
    });
  }

  it('when values are rounded, then the rounding step is detected and truncation edges fall between rounding cells', () => {
    const random = seededRandom(5);
    const values = Array.from({ length: 5_000 }, () => roundedGaussian.draw(random));
    const { diagnostics } = indirectInterval(values);
    expect(diagnostics.resolution).toBe(1);
    expect(diagnostics.truncation.map((edge) => edge % 1)).toEqual([0.5, 0.5]);
  });

  it('when the input is invalid, then it throws naming the function and the problem', () => {
    expect(() => indirectInterval(Array.from({ length: 999 }, (_, i) => i + 1))).toThrow(
      'indirectInterval: needs at least 1000 values, got 999',
    );
    expect(() => indirectInterval(Array.from({ length: 1000 }, (_, i) => i))).toThrow(
      'indirectInterval: needs values greater than 0 for the Box-Cox transform; the smallest is 0',
    );
    expect(() => indirectInterval([1, 2], { lower: 0.5, upper: 0.5 })).toThrow(
      'indirectInterval: lower (0.5) must be below upper (0.5)',
    );
  });
});
