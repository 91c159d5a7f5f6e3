import { checkInteger, checkPositive, checkValues, medianOfSorted } from './validate.ts';

/** Result of ISO 13528 Algorithm A. */
export interface RobustMeanSd {
  /** Robust average x*. */
  mean: number;
  /** Robust standard deviation s*. */
  sd: number;
  /** Number of iterations done after the start values (0 = start values only). */
  iterations: number;
  /** False when the iteration cap was reached before the stopping rule was met. */
  converged: boolean;
  /**
   * Which scale s* is: 'algorithm-a' (the iterated estimate), or 'mean-absolute-deviation' when more
   * than half the values are equal (median|xᵢ − x*| = 0) and s* = √(π/2) · mean|xᵢ − x*| instead.
   */
  scale: 'algorithm-a' | 'mean-absolute-deviation';
}

/** Options of {@link robustMeanSd}. */
export interface RobustMeanSdOptions {
  /** Stop when x* and s* both change by less than tolerance · s* (default 1e-10). */
  tolerance?: number;
  /** Iteration cap (default 1000); a small cap reproduces the published intermediate iterations. */
  maxIterations?: number;
}

/**
 * Robust average x* and robust standard deviation s* by ISO 13528 Algorithm A (Huber's
 * "proposal 2" with winsorising at 1.5 s*).
 *
 * Start: x* = median, s* = 1.483 · median|xᵢ − x*|. Each iteration: δ = 1.5 s*; every value is
 * clipped to [x* − δ, x* + δ]; x* = mean of the clipped values; s* = 1.134 · SD(clipped values).
 *
 * Stopping rule (our choice, stricter than the standard's "no change in the third significant
 * figure"): stop when both x* and s* change by less than `tolerance` · s* from one iteration to
 * the next, or after `maxIterations` (then `converged` is false).
 *
 * More than half the values equal (s* = 0 at the start): Algorithm A cannot give a scale, and
 * iterating from any other start shrinks s* towards 0 (the equal values dominate the winsorised SD).
 * ISO 13528 then lets the scale be set by other means (memory of the standard, not re-read); we
 * return x* = median and s* = √(π/2) · mean|xᵢ − median| (the mean absolute deviation scaled to
 * estimate σ of a normal distribution, as Iglewicz & Hoaglin use when the MAD is 0 — memory), without
 * iterating, and say so in `scale`. Only when every value is equal is s* = 0.
 * With very few values one far value breaks the estimate down: with 3 values close together and 1
 * far away, s* grows by the factor 1.134 in every iteration until the far value is no longer
 * clipped, ending at the plain mean and 1.134 · SD; from 5 values on, one far value cannot do this.
 *
 * Source: ISO 13528:2015, Annex C.3 (Algorithm A); worked example in ISO 13528:2015 Annex E.3 /
 * ISO 5725-5:1998 §6.2.
 *
 * @throws {Error} when there are fewer than 2 values, a value is not finite, or the options are invalid.
 * @example
 * robustMeanSd([1.69, 0.74, 2.05, 1.14, 2.19, 1.39, 1.52, 1.50, 1.58, 0.80, 1.21, 1.63]);
 * // => { mean: 1.4533333333333334, sd: 0.49614831763385936, iterations: 6, converged: true,
 * //      scale: 'algorithm-a' }
 */
export function robustMeanSd(values: readonly number[], options: RobustMeanSdOptions = {}): RobustMeanSd {
  const fn = 'robustMeanSd';
  checkValues(fn, values, 2);
  const tolerance = options.tolerance ?? 1e-10;
  const maxIterations = options.maxIterations ?? 1000;
  checkPositive(fn, 'tolerance', tolerance);
  checkInteger(fn, 'maxIterations', maxIterations, 0);
  return algorithmA(new Float64Array(values), tolerance, maxIterations);
}

/**
 * Algorithm A on already-checked values; `work` is overwritten. Shared with peerStatistics.
 * The values are sorted once and centred on the median; winsorised sums then come from prefix
 * sums and two binary searches, so each iteration costs O(log p) instead of O(p).
 */
export function algorithmA(work: Float64Array, tolerance: number, maxIterations: number): RobustMeanSd {
  const p = work.length;
  const sorted = work.sort();
  const center = medianOfSorted(sorted);
  const deviations = new Float64Array(p);
  for (let i = 0; i < p; i++) deviations[i] = Math.abs(sorted[i] - center);
  deviations.sort();
  let sd = 1.483 * medianOfSorted(deviations);
  if (sd === 0) {
    return {
      mean: center,
      sd: meanAbsoluteDeviationScale(deviations),
      iterations: 0,
      converged: true,
      scale: 'mean-absolute-deviation',
    };
  }

  // Prefix sums of the centred values and of their squares.
  const sums = new Float64Array(p + 1);
  const squares = new Float64Array(p + 1);
  for (let i = 0; i < p; i++) {
    const d = sorted[i] - center;
    sums[i + 1] = sums[i] + d;
    squares[i + 1] = squares[i] + d * d;
  }
  let mean = 0; // centred
  let iterations = 0;
  let converged = false;
  while (iterations < maxIterations) {
    const delta = 1.5 * sd;
    const low = mean - delta;
    const high = mean + delta;
    const below = countBelow(sorted, center + low); // values clipped up to low
    const notAbove = countNotAbove(sorted, center + high); // values up to high; the rest are clipped down
    const above = p - notAbove;
    const sum = below * low + above * high + (sums[notAbove] - sums[below]);
    const sumSquares = below * low * low + above * high * high + (squares[notAbove] - squares[below]);
    const nextMean = sum / p;
    const nextSd = 1.134 * Math.sqrt(Math.max(0, (sumSquares - sum * nextMean) / (p - 1)));
    iterations++;
    converged = Math.abs(nextMean - mean) < tolerance * nextSd && Math.abs(nextSd - sd) < tolerance * nextSd;
    mean = nextMean;
    sd = nextSd;
    if (converged) break;
  }
  return { mean: center + mean, sd, iterations, converged, scale: 'algorithm-a' };
}

/** √(π/2): E|X − μ| = σ · √(2/π) for a normal distribution. */
const MEAN_ABSOLUTE_DEVIATION_TO_SD = Math.sqrt(Math.PI / 2);

/** √(π/2) · mean of the absolute deviations; each term divided first so huge values cannot overflow the sum. */
function meanAbsoluteDeviationScale(deviations: Float64Array): number {
  let mean = 0;
  for (let i = 0; i < deviations.length; i++) mean += deviations[i] / deviations.length;
  return MEAN_ABSOLUTE_DEVIATION_TO_SD * mean;
}

/**
 * Algorithm A's start values without iterating: x* = median, s* = 1.483 · median|xᵢ − x*| (`madSd`),
 * or in `sd` the mean-absolute-deviation scale when more than half the values are equal. `madSd` is
 * median-based, so far values cannot move it while they are fewer than half (the iteration can, with
 * fewer than 5 values). Values must be finite.
 */
export function algorithmAStart(values: ArrayLike<number>): { mean: number; sd: number; madSd: number } {
  const sorted = Float64Array.from(values).sort();
  const center = medianOfSorted(sorted);
  const deviations = sorted.map((x) => Math.abs(x - center)).sort();
  const madSd = 1.483 * medianOfSorted(deviations);
  return { mean: center, sd: madSd > 0 ? madSd : meanAbsoluteDeviationScale(deviations), madSd };
}

/** Number of sorted values strictly below x. */
function countBelow(sorted: Float64Array, x: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Number of sorted values less than or equal to x. */
function countNotAbove(sorted: Float64Array, x: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] <= x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}
