import { checkFinite, checkValues, fail } from './validate.ts';

export interface IntervalVerification {
  n: number;
  /** Results strictly below the lower or above the upper limit. */
  outside: number;
  /** True when no more than 2 of the 20 results fall outside. */
  accepted: boolean;
}

/**
 * Verification of a transferred reference interval with 20 results from the lab's own reference
 * individuals: accept when no more than 2 fall outside the interval (a result equal to a limit is
 * inside). With a correct interval the acceptance probability is P(X ≤ 2 | n = 20, p = 0.05) = 0.9245.
 * When rejected, EP28 suggests testing 20 more results before giving up the interval.
 *
 * Source: CLSI EP28-A3c, verification of transference (memory).
 *
 * @throws {Error} when there are not exactly 20 results, a result or limit is not finite, or
 *   lower > upper.
 * @example
 * const results = [3.6, 3.8, 3.9, 4.0, 4.1, 4.1, 4.2, 4.2, 4.3, 4.3,
 *                  4.4, 4.4, 4.5, 4.6, 4.7, 4.8, 4.9, 5.0, 5.2, 5.4];
 * verifyInterval(results, [3.5, 5.1]); // => { n: 20, outside: 2, accepted: true }
 */
export function verifyInterval(
  values: readonly number[],
  interval: readonly [number, number],
): IntervalVerification {
  const fn = 'verifyInterval';
  checkValues(fn, values, 0, '', ['results', 'result']);
  if (values.length !== 20) fail(fn, `needs exactly 20 results, got ${values.length}`);
  if (!Array.isArray(interval) || interval.length !== 2) fail(fn, 'interval must be [lower, upper]');
  const [lower, upper] = interval;
  checkFinite(fn, 'interval lower limit', lower);
  checkFinite(fn, 'interval upper limit', upper);
  if (lower > upper) fail(fn, `interval lower limit ${lower} is above the upper limit ${upper}`);
  const outside = values.filter((v) => v < lower || v > upper).length;
  return { n: values.length, outside, accepted: outside <= 2 };
}
