import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { criticalSystematicError, qcPlanPower, recommendQcPlan, sigmaMetric } from '../src/index.ts';

// Closed-form power of a single 1-ks rule over N values (Westgard JO, Groth T, Clin Chem
// 1979;25:863–869, from memory), computed here with jStat's normal distribution (normalCdf),
// a general-purpose reference library: Pfr = 1 − (2Φ(k) − 1)^N; Ped = 1 − (Φ(k − Δ) − Φ(−k − Δ))^N.
const normalCdf = (z: number) => jStat.normal.cdf(z, 0, 1);
const closedPfr = (k: number, n: number) => 1 - (2 * normalCdf(k) - 1) ** n;
const closedPed = (k: number, n: number, shift: number) =>
  1 - (normalCdf(k - shift) - normalCdf(-k - shift)) ** n;

describe('qcPlanPower', () => {
  const simulations = 40_000;

  it('when 1-3s with N = 2 at ΔSE = 0, then Pfr matches the closed form 1 − (1 − 0.0027)² ≈ 0.0054 within 4 Monte Carlo SE', () => {
    const expected = closedPfr(3, 2);
    expect(expected).toBeCloseTo(0.0054, 4); // the usual printed figure (from memory)
    const power = qcPlanPower({ rules: ['1-3s'], n: 2, shift: 0, simulations, seed: 7 });
    console.log(
      `1-3s N=2 ΔSE=0: simulated Pfr ${power.pfr.toFixed(4)} ± ${power.pfrStandardError.toFixed(4)}, closed form ${expected.toFixed(4)}`,
    );
    expect(Math.abs(power.pfr - expected)).toBeLessThanOrEqual(
      4 * Math.sqrt((expected * (1 - expected)) / simulations),
    );
    // At no shift, Ped is Pfr.
    expect(power.ped).toBe(power.pfr);
  });

  it('when 1-3s with N = 2 at ΔSE = 3, then Ped matches the closed form (≈ 0.75) within 4 Monte Carlo SE', () => {
    const expected = closedPed(3, 2, 3);
    const power = qcPlanPower({ rules: ['1-3s'], n: 2, shift: 3, simulations, seed: 8 });
    console.log(
      `1-3s N=2 ΔSE=3: simulated Ped ${power.ped.toFixed(4)} ± ${power.pedStandardError.toFixed(4)}, closed form ${expected.toFixed(4)}`,
    );
    expect(Math.abs(power.ped - expected)).toBeLessThanOrEqual(
      4 * Math.sqrt((expected * (1 - expected)) / simulations),
    );
  });

  it('when the multirule 1-3s/2-2s/R-4s with N = 2, then Pfr is about 0.01 (Westgard 1981 power curves, from memory) and above 1-3s alone', () => {
    const multi = qcPlanPower({ rules: ['1-3s', '2-2s', 'R-4s'], n: 2, shift: 0, simulations, seed: 9 });
    const single = qcPlanPower({ rules: ['1-3s'], n: 2, shift: 0, simulations, seed: 9 });
    console.log(`1-3s/2-2s/R-4s N=2: Pfr ${multi.pfr.toFixed(4)}`);
    expect(multi.pfr).toBeGreaterThan(single.pfr);
    expect(multi.pfr).toBeLessThan(0.02);
  });

  it('when inputs are bad, then it throws naming them', () => {
    expect(() => qcPlanPower({ rules: ['1-9s' as never], n: 2, shift: 0 })).toThrow(
      "qcPlanPower: unknown rule '1-9s'",
    );
    expect(() => qcPlanPower({ rules: ['1-3s'], n: 0, shift: 0 })).toThrow(
      'qcPlanPower: n must be an integer of at least 1',
    );
    expect(() => qcPlanPower({ rules: [], n: 1, shift: 0 })).toThrow(
      'qcPlanPower: rules must be a non-empty list',
    );
  });
});

describe('criticalSystematicError and recommendQcPlan', () => {
  it('when TEa 10 %, bias 1 %, CV 1.5 %, then ΔSEcrit = σ − 1.65 = 4.35 (definition)', () => {
    expect(criticalSystematicError(10, 1, 1.5)).toBeCloseTo(sigmaMetric(10, 1, 1.5) - 1.65, 12);
    expect(criticalSystematicError(10, -1, 1.5)).toBeCloseTo(4.35, 12);
  });

  it('when the procedure is 6-sigma, then it needs fewer controls or wider limits than a 3-sigma one', () => {
    const six = recommendQcPlan(6);
    const three = recommendQcPlan(3);
    console.log(six.explanation);
    console.log(three.explanation);
    const controls = (r: typeof six) => r.plan.n * r.plan.runs;
    expect(six.reached).toBe(true);
    expect(six.plan.ped).toBeGreaterThanOrEqual(0.9);
    expect(six.plan.pfr).toBeLessThanOrEqual(0.05);
    expect(controls(six) < controls(three) || six.plan.pfr < three.plan.pfr).toBe(true);
  });

  it('when sigma is below 1.65, then no plan is reached and the explanation says the procedure must improve', () => {
    const low = recommendQcPlan(1.2, { simulations: 500 });
    expect(low.reached).toBe(false);
    expect(low.explanation).toMatch(/no QC plan can make the procedure fit for purpose/);
  });

  it('when the thresholds are settings, then a stricter Ped needs at least as many controls', () => {
    const usual = recommendQcPlan(4.5);
    const strict = recommendQcPlan(4.5, { minPed: 0.99 });
    expect(strict.plan.n * strict.plan.runs).toBeGreaterThanOrEqual(usual.plan.n * usual.plan.runs);
  });
});
