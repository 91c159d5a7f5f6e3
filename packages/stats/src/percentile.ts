import { checkProbability, fail, sortedCopy } from './validate.ts';

/**
 * The p-quantile of ascending-sorted values by rank r = p · (n + 1) (1-based) with linear
 * interpolation between the neighbouring order statistics (numpy's `method='weibull'`).
 * Throws when r falls outside [1, n]: the sample is too small to estimate that quantile
 * without extrapolation.
 */
export function percentileOfSorted(fn: string, sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  const rank = p * (n + 1);
  if (rank < 1 || rank > n) {
    const needed = Math.ceil(Math.max(1 / p, 1 / (1 - p)) - 1);
    fail(fn, `needs at least ${needed} values to estimate the ${p} quantile by rank p(n + 1), got ${n}`);
  }
  const below = Math.floor(rank);
  const fraction = rank - below;
  const low = sorted[below - 1];
  return fraction === 0 ? low : low + fraction * (sorted[below] - low);
}

/**
 * The p-quantile by rank r = p · (n + 1) with linear interpolation between order statistics.
 *
 * Source: CLSI EP28-A3c / Solberg HE, J Clin Chem Clin Biochem 1987;25:645–656 (IFCC); equals
 * `numpy.percentile(values, 100 * p, method='weibull')` for 1 ≤ r ≤ n.
 *
 * @throws {Error} when a value is not finite, p is not strictly between 0 and 1, or r = p(n + 1)
 *   falls outside [1, n].
 * @example
 * percentile([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14, 15, 16, 17, 18, 19], 0.25); // => 5
 */
export function percentile(values: readonly number[], p: number): number {
  checkProbability('percentile', 'p', p);
  return percentileOfSorted('percentile', sortedCopy('percentile', values, 1), p);
}
