import { studentTQuantile } from './distributions.ts';
import { checkFinite, checkInteger, checkProbability, checkValues, fail } from './validate.ts';

/** A difference of two means (second − first) with its two-sided confidence interval. */
export interface MeanDifference {
  /** Second mean − first mean. */
  difference: number;
  /** Standard error of the difference. */
  se: number;
  /** Degrees of freedom of the t distribution used. */
  dof: number;
  /** Lower and upper limit of the interval. */
  low: number;
  high: number;
}

/** The lab means of one lot: their mean, their SD (between labs) and the number of labs. */
export interface LotGroup {
  mean: number;
  sd: number;
  labs: number;
}

/**
 * Difference of two peer means (second lot − first lot) with Welch's t interval, for two independent
 * groups of lab means: se = √(s₁²/n₁ + s₂²/n₂), ν = se⁴ / ((s₁²/n₁)²/(n₁−1) + (s₂²/n₂)²/(n₂−1)),
 * interval difference ± t(1 − α/2, ν) · se. The inputs are the classical mean and SD of the lab means
 * (not the robust ones): the t interval assumes those, and a robust SD would not give its coverage.
 *
 * Source: Welch (1947), Biometrika 34:28–35; Satterthwaite (1946) for ν (formulas from memory, as in
 * any statistics handbook).
 *
 * @throws {Error} when a figure is not finite, a group has fewer than 2 labs, an SD is negative, the
 *   confidence is not between 0 and 1, or both SDs are 0 (no interval can be formed).
 * @example
 * welchMeanDifference({ mean: 100, sd: 2, labs: 5 }, { mean: 103, sd: 3, labs: 5 });
 * // => { difference: 3, se: 1.6125, dof: 6.969, low: 0.18, high: 6.82 } (rounded)
 */
export function welchMeanDifference(first: LotGroup, second: LotGroup, confidence = 0.95): MeanDifference {
  const fn = 'welchMeanDifference';
  for (const [name, g] of [
    ['first', first],
    ['second', second],
  ] as const) {
    checkFinite(fn, `${name} mean`, g.mean);
    checkFinite(fn, `${name} sd`, g.sd);
    if (g.sd < 0) fail(fn, `${name} sd must not be negative, got ${g.sd}`);
    checkInteger(fn, `${name} labs`, g.labs, 2);
  }
  checkProbability(fn, 'confidence', confidence);
  const v1 = (first.sd * first.sd) / first.labs;
  const v2 = (second.sd * second.sd) / second.labs;
  const variance = v1 + v2;
  if (!(variance > 0)) fail(fn, 'both SDs are 0, so the difference has no standard error');
  const se = Math.sqrt(variance);
  const dof = (variance * variance) / ((v1 * v1) / (first.labs - 1) + (v2 * v2) / (second.labs - 1));
  const difference = second.mean - first.mean;
  const half = studentTQuantile(1 - (1 - confidence) / 2, dof) * se;
  return { difference, se, dof, low: difference - half, high: difference + half };
}

/** The mean of per-lab differences with its t interval. */
export interface PairedDifference extends MeanDifference {
  /** Number of labs (pairs). */
  n: number;
  /** SD of the per-lab differences. */
  sd: number;
}

/**
 * Paired difference of two lots reported by the same labs: the mean of the per-lab differences
 * (second lot − first lot) with the one-sample t interval mean ± t(1 − α/2, n − 1) · sd/√n. Pairing
 * removes the lab-to-lab differences, so a shift common to the labs (a lot effect) shows even when
 * labs differ much more from each other than the lot moved.
 *
 * Source: Student's paired t interval (Student 1908, Biometrika 6:1–25; formula from memory, as in any
 * statistics handbook).
 *
 * @throws {Error} when fewer than 2 differences are given, one is not finite, or the confidence is not
 *   between 0 and 1.
 * @example
 * pairedMeanDifference([1, 2, 3, 4, 5]);
 * // => { n: 5, difference: 3, sd: 1.5811, se: 0.7071, dof: 4, low: 1.037, high: 4.963 } (rounded)
 */
export function pairedMeanDifference(differences: readonly number[], confidence = 0.95): PairedDifference {
  const fn = 'pairedMeanDifference';
  checkValues(fn, differences, 2, '', ['differences', 'difference']);
  checkProbability(fn, 'confidence', confidence);
  const n = differences.length;
  let sum = 0;
  for (const d of differences) sum += d;
  const difference = sum / n;
  let squares = 0;
  for (const d of differences) squares += (d - difference) * (d - difference);
  const sd = Math.sqrt(squares / (n - 1));
  const se = sd / Math.sqrt(n);
  const dof = n - 1;
  const half = studentTQuantile(1 - (1 - confidence) / 2, dof) * se;
  return { n, difference, sd, se, dof, low: difference - half, high: difference + half };
}
