import { evaluateMultirule, type ControlPoint } from './multirule.ts';
import { seededRandom } from './random.ts';
import { checkFinite, checkInteger, fail } from './validate.ts';

/** Rejection rules a QC plan can use: single limits and the multirule rules. */
export const QC_PLAN_RULES = ['1-2s', '1-2.5s', '1-3s', '1-3.5s', '2-2s', 'R-4s', '4-1s', '10-x'] as const;
export type QcPlanRule = (typeof QC_PLAN_RULES)[number];

/** Input of {@link qcPlanPower}. */
export interface QcPlanPowerInput {
  /** Rules that reject a run (every rule named rejects, including 1-2s). */
  rules: readonly QcPlanRule[];
  /** Control measurements per run (1–10). */
  n: number;
  /** Runs over which the rules are applied together (1–10). Default 1. */
  runs?: number;
  /** Systematic shift of every value, in SDs. */
  shift: number;
  /** Simulated run groups. Default 10,000. */
  simulations?: number;
  seed?: number;
}

/** Power of a QC plan, with the Monte Carlo standard errors √(p(1 − p)/simulations). */
export interface QcPlanPower {
  /** Probability of error detection: a run group shifted by `shift` SDs is rejected. */
  ped: number;
  /** Probability of false rejection: a run group without error is rejected. */
  pfr: number;
  pedStandardError: number;
  pfrStandardError: number;
  simulations: number;
}

const SINGLE_LIMITS: Partial<Record<QcPlanRule, number>> = {
  '1-2s': 2,
  '1-2.5s': 2.5,
  '1-3s': 3,
  '1-3.5s': 3.5,
};

/**
 * Probability of error detection and of false rejection of a QC plan by seeded simulation: each
 * simulated group is `runs` runs of `n` standard normal control values (control j of a run is
 * level j), evaluated with `evaluateMultirule`; the group is rejected when any value breaks one of
 * `rules` (1-ks: |z| > k; the others as `evaluateMultirule` defines them). Pfr uses the values as
 * drawn, Ped the same values plus `shift` (common random numbers). Monte Carlo standard error of a
 * probability p from S groups: √(p(1 − p)/S), at most 0.005 for the default S = 10,000.
 *
 * Source: Westgard JO, Groth T. Power functions for statistical control rules. Clin Chem
 * 1979;25:863–869 (power functions by simulation; from memory). Closed form for one 1-ks rule:
 * Pfr = 1 − (1 − 2(1 − Φ(k)))^N, Ped = 1 − (Φ(k − ΔSE) − Φ(−k − ΔSE))^N.
 *
 * @throws {Error} when a rule is unknown or missing, n or runs is not a whole number in 1–10,
 *   shift is not finite, or simulations is not a whole number in 100–1,000,000.
 * @example
 * qcPlanPower({ rules: ['1-3s'], n: 2, shift: 0 }).pfr; // => about 0.0054
 */
export function qcPlanPower(input: QcPlanPowerInput): QcPlanPower {
  const fn = 'qcPlanPower';
  const { n, shift } = input;
  const rules: readonly QcPlanRule[] = input.rules;
  const runs = input.runs ?? 1;
  const simulations = input.simulations ?? 10_000;
  if (!Array.isArray(input.rules) || rules.length === 0)
    fail(fn, 'rules must be a non-empty list of rule names');
  for (const rule of rules) {
    if (!(QC_PLAN_RULES as readonly string[]).includes(rule)) {
      fail(fn, `unknown rule '${String(rule)}'; known: ${QC_PLAN_RULES.join(', ')}`);
    }
  }
  checkInteger(fn, 'n', n, 1);
  checkInteger(fn, 'runs', runs, 1);
  if (n > 10) fail(fn, `n must be at most 10, got ${n}`);
  if (runs > 10) fail(fn, `runs must be at most 10, got ${runs}`);
  checkFinite(fn, 'shift', shift);
  checkInteger(fn, 'simulations', simulations, 100);
  if (simulations > 1_000_000) fail(fn, `simulations must be at most 1000000, got ${simulations}`);
  const seed = input.seed ?? 1;
  if (!Number.isInteger(seed)) fail(fn, `seed must be an integer, got ${seed}`);

  const random = seededRandom(seed);
  const targets: Record<number, { mean: number; sd: number }> = {};
  for (let level = 1; level <= n; level++) targets[level] = { mean: 0, sd: 1 };
  const singleLimit = Math.min(...rules.map((rule) => SINGLE_LIMITS[rule] ?? Infinity));
  const multirule = rules.filter((rule) => SINGLE_LIMITS[rule] === undefined);

  const rejected = (points: ControlPoint[]): boolean => {
    for (const point of points) if (Math.abs(point.value) > singleLimit) return true;
    if (multirule.length === 0) return false;
    const result = evaluateMultirule(points, targets);
    return result.points.some((point) => point.rules.some((rule) => multirule.includes(rule)));
  };

  const clean: ControlPoint[] = new Array(n * runs);
  const shifted: ControlPoint[] = new Array(n * runs);
  let falseRejections = 0;
  let detections = 0;
  for (let s = 0; s < simulations; s++) {
    for (let r = 0; r < runs; r++) {
      for (let j = 0; j < n; j++) {
        const value = random.normal();
        const run = `r${r}`;
        clean[r * n + j] = { run, level: j + 1, value };
        shifted[r * n + j] = { run, level: j + 1, value: value + shift };
      }
    }
    if (rejected(clean)) falseRejections += 1;
    if (rejected(shifted)) detections += 1;
  }
  const ped = detections / simulations;
  const pfr = falseRejections / simulations;
  return {
    ped,
    pfr,
    pedStandardError: Math.sqrt((ped * (1 - ped)) / simulations),
    pfrStandardError: Math.sqrt((pfr * (1 - pfr)) / simulations),
    simulations,
  };
}
