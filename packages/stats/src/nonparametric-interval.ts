import { percentileOfSorted } from './percentile.ts';
import { rankConfidenceInterval } from './rank-confidence-interval.ts';
import { checkProbability, fail, sortedCopy } from './validate.ts';

/** A reference limit with the confidence interval of its value (null when n is too small). */
export interface ReferenceLimit {
  value: number;
  ci: [number, number] | null;
}

export interface NonparametricInterval {
  n: number;
  lower: ReferenceLimit;
  upper: ReferenceLimit;
}

export interface NonparametricIntervalOptions {
  /** Lower percentile as a fraction (default 0.025). */
  lower?: number;
  /** Upper percentile as a fraction (default 0.975). */
  upper?: number;
  /** Confidence level of the limits' intervals (default 0.90). */
  confidence?: number;
}

/**
 * Nonparametric reference interval: each limit is the p-quantile by rank r = p · (n + 1) with
 * linear interpolation; its confidence interval is [x₍ᵣ₁₎, x₍ᵣ₂₎] with ranks from
 * {@link rankConfidenceInterval} (null below n = 119 for the 2.5th/97.5th percentiles at 90 %).
 * The values are copied to a Float64Array and sorted once.
 *
 * Source: CLSI EP28-A3c; Solberg HE (IFCC), J Clin Chem Clin Biochem 1987;25:645–656.
 * EP28 asks for at least 120 reference values; below that, say so and offer {@link robustInterval}.
 *
 * @throws {Error} when a value is not finite, lower ≥ upper, a fraction is not strictly between 0
 *   and 1, or n is too small for rank p(n + 1) to lie in [1, n] (39 values for 2.5 %/97.5 %).
 * @example
 * const values = Array.from({ length: 119 }, (_, i) => i + 1); // 1 … 119
 * nonparametricInterval(values);
 * // => { n: 119, lower: { value: 3, ci: [1, 7] }, upper: { value: 117, ci: [113, 119] } }
 */
export function nonparametricInterval(
  values: readonly number[],
  options: NonparametricIntervalOptions = {},
): NonparametricInterval {
  checkOptions(options);
  return nonparametricIntervalOfSorted(sortedCopy('nonparametricInterval', values, 2), options);
}

/**
 * {@link nonparametricInterval} of finite values already sorted ascending (at least 2), for a caller
 * that has sorted them anyway.
 */
export function nonparametricIntervalOfSorted(
  sorted: Float64Array,
  options: NonparametricIntervalOptions = {},
): NonparametricInterval {
  const fn = 'nonparametricInterval';
  const { lower, upper, confidence } = checkOptions(options);
  if (sorted.length < 2) fail(fn, `needs at least 2 values, got ${sorted.length}`);
  const n = sorted.length;
  const limit = (p: number): ReferenceLimit => {
    const ranks = rankConfidenceInterval(n, p, confidence);
    return {
      value: percentileOfSorted(fn, sorted, p),
      ci: ranks ? [sorted[ranks[0] - 1], sorted[ranks[1] - 1]] : null,
    };
  };
  return { n, lower: limit(lower), upper: limit(upper) };
}

function checkOptions(options: NonparametricIntervalOptions): Required<NonparametricIntervalOptions> {
  const fn = 'nonparametricInterval';
  const lower = options.lower ?? 0.025;
  const upper = options.upper ?? 0.975;
  const confidence = options.confidence ?? 0.9;
  checkProbability(fn, 'lower', lower);
  checkProbability(fn, 'upper', upper);
  checkProbability(fn, 'confidence', confidence);
  if (lower >= upper) fail(fn, `lower (${lower}) must be below upper (${upper})`);
  return { lower, upper, confidence };
}
