import { checkValues } from './validate.ts';

/** n, mean, SD (n − 1) and CV % of a set of values. */
export interface Summary {
  n: number;
  mean: number;
  sd: number;
  /** 100 · SD / mean; NaN when the mean is 0. */
  cv: number;
}

/**
 * Summarize values: n, arithmetic mean, sample standard deviation (divisor n − 1) and
 * coefficient of variation CV % = 100 · SD / mean.
 *
 * The mean is taken as an offset from the first value plus the mean of the deviations, and the
 * SD by the corrected two-pass algorithm, so data with a large offset and a small spread keep
 * their precision (NIST StRD NumAcc1–4 give the certified values).
 *
 * Source: Chan, Golub & LeVeque, "Algorithms for computing the sample variance", Am Stat
 * 1983;37:242–247 (corrected two-pass formula); CV as in docs/methods.md §1.
 *
 * @throws {Error} when there are fewer than 2 values or a value is not a finite number.
 * @example
 * summarize([2, 4, 4, 4, 5, 5, 7, 9]);
 * // => { n: 8, mean: 5, sd: 2.138089935299395, cv: 42.76179870598791 }
 */
export function summarize(values: readonly number[]): Summary {
  checkValues('summarize', values, 2);
  const n = values.length;
  const offset = values[0];
  let sumDeviation = 0;
  for (let i = 0; i < n; i++) sumDeviation += values[i] - offset;
  const mean = offset + sumDeviation / n;
  let sumSquares = 0;
  let sumResidual = 0;
  for (let i = 0; i < n; i++) {
    const d = values[i] - mean;
    sumSquares += d * d;
    sumResidual += d;
  }
  // The correction term removes the rounding error left in the mean (Chan, Golub & LeVeque).
  const variance = (sumSquares - (sumResidual * sumResidual) / n) / (n - 1);
  const sd = Math.sqrt(Math.max(variance, 0));
  return { n, mean, sd, cv: mean === 0 ? Number.NaN : (100 * sd) / mean };
}
