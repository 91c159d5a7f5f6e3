import { checkFinite, checkValues, fail } from './validate.ts';

/**
 * Box-Cox power transform of one positive value: (x^λ − 1) / λ, or ln x when λ = 0.
 * Computed as expm1(λ ln x) / λ so that λ near 0 loses no precision; |λ| < 1e-12 counts as 0.
 *
 * Source: Box GEP, Cox DR. An analysis of transformations. J R Stat Soc B 1964;26:211–252.
 *
 * @throws {Error} when x is not a finite number greater than 0 or λ is not finite.
 * @example
 * boxCox(4, 0.5); // => 2
 */
export function boxCox(x: number, lambda: number): number {
  checkFinite('boxCox', 'lambda', lambda);
  if (!(Number.isFinite(x) && x > 0)) fail('boxCox', `x must be a finite number greater than 0, got ${x}`);
  return boxCoxUnchecked(x, lambda);
}

// Below this |λ| the transform is taken as ln x: the difference is about λ(ln x)²/2, and tiny
// (subnormal) λ would lose all precision in λ · ln x.
const LOG_LAMBDA = 1e-12;

/** Box-Cox transform without input checks, for inner loops over checked data. */
export function boxCoxUnchecked(x: number, lambda: number): number {
  const logX = Math.log(x);
  return Math.abs(lambda) < LOG_LAMBDA ? logX : Math.expm1(lambda * logX) / lambda;
}

/**
 * Inverse of the Box-Cox transform: (λy + 1)^(1/λ), or e^y when λ = 0. NaN when λy + 1 ≤ 0
 * (outside the range of the transform).
 *
 * Source: Box & Cox 1964 (inverse of the transform).
 *
 * @throws {Error} when y or λ is not finite.
 * @example
 * boxCoxInverse(2, 0.5); // => 4
 */
export function boxCoxInverse(y: number, lambda: number): number {
  checkFinite('boxCoxInverse', 'y', y);
  checkFinite('boxCoxInverse', 'lambda', lambda);
  return boxCoxInverseUnchecked(y, lambda);
}

/** Inverse Box-Cox transform without input checks. */
export function boxCoxInverseUnchecked(y: number, lambda: number): number {
  if (Math.abs(lambda) < LOG_LAMBDA) return Math.exp(y);
  const base = lambda * y + 1;
  return base > 0 ? Math.exp(Math.log1p(lambda * y) / lambda) : Number.NaN;
}

/**
 * Profile log-likelihood of λ for positive values under a Box-Cox-normal model:
 * ℓ(λ) = −(n/2) ln σ̂²(λ) + (λ − 1) Σ ln xᵢ, with σ̂² the variance (divisor n) of the transformed
 * values. Same definition as scipy.stats.boxcox_llf.
 *
 * Source: Box & Cox 1964, §3.
 *
 * @throws {Error} when there are fewer than 2 values, a value is not finite and greater than 0,
 *   or λ is not finite.
 * @example
 * boxCoxLogLikelihood([1, 2, 3, 4, 5], 1); // => -1.7328679513998626
 */
export function boxCoxLogLikelihood(values: readonly number[], lambda: number): number {
  checkPositiveValues('boxCoxLogLikelihood', values);
  checkFinite('boxCoxLogLikelihood', 'lambda', lambda);
  return logLikelihood(groupedLogs(new Float64Array(values).sort()), lambda);
}

export interface BoxCoxLambdaOptions {
  /** Search range of λ (default [-3, 3]). */
  range?: [number, number];
}

/**
 * Maximum-likelihood Box-Cox λ: the maximiser of {@link boxCoxLogLikelihood} within `range`
 * (default −3 … 3), found by golden-section search refined to 1e-10. A maximiser on the edge of
 * the range means the data give no interior optimum (e.g. a very small CV).
 *
 * Source: Box & Cox 1964; same objective as scipy.stats.boxcox_normmax(method='mle').
 *
 * @throws {Error} when there are fewer than 3 values, a value is not finite and greater than 0,
 *   all values are equal, or the range is invalid.
 * @example
 * boxCoxLambda([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 12, 15, 20, 30, 50]); // => 0.04799159639697161
 */
export function boxCoxLambda(values: readonly number[], options: BoxCoxLambdaOptions = {}): number {
  const fn = 'boxCoxLambda';
  checkPositiveValues(fn, values, 3);
  const [from, to] = options.range ?? [-3, 3];
  checkFinite(fn, 'range[0]', from);
  checkFinite(fn, 'range[1]', to);
  if (from >= to) fail(fn, `range must be increasing, got [${from}, ${to}]`);
  return boxCoxLambdaOfSorted(new Float64Array(values).sort(), [from, to]);
}

/**
 * {@link boxCoxLambda} for values already checked (finite, greater than 0, at least 3) and sorted
 * ascending, so a caller that needs the sorted values anyway sorts them once.
 */
export function boxCoxLambdaOfSorted(sorted: Float64Array, range: [number, number] = [-3, 3]): number {
  if (sorted[0] === sorted[sorted.length - 1])
    fail('boxCoxLambda', 'all values are equal, so λ is undefined');
  const grouped = groupedLogs(sorted);
  return maximise((lambda) => logLikelihood(grouped, lambda), range[0], range[1]);
}

function checkPositiveValues(fn: string, values: readonly number[], min = 2): void {
  checkValues(fn, values, min);
  for (let i = 0; i < values.length; i++) {
    if (values[i] <= 0)
      fail(fn, `value at index ${i} must be greater than 0 for a Box-Cox transform, got ${values[i]}`);
  }
}

/**
 * The distinct logs of sorted positive values with their counts, and Σ ln x. Laboratory results
 * are rounded, so a large sample holds few distinct values and each likelihood evaluation costs one
 * transform per distinct value instead of one per value.
 */
interface GroupedLogs {
  n: number;
  logs: Float64Array;
  counts: Float64Array;
  sumLogs: number;
}

function groupedLogs(sorted: Float64Array): GroupedLogs {
  const logs = new Float64Array(sorted.length);
  const counts = new Float64Array(sorted.length);
  let distinct = 0;
  let sumLogs = 0;
  for (let i = 0; i < sorted.length;) {
    let j = i + 1;
    while (j < sorted.length && sorted[j] === sorted[i]) j++;
    const l = Math.log(sorted[i]);
    logs[distinct] = l;
    counts[distinct] = j - i;
    sumLogs += (j - i) * l;
    distinct++;
    i = j;
  }
  return {
    n: sorted.length,
    logs: logs.subarray(0, distinct),
    counts: counts.subarray(0, distinct),
    sumLogs,
  };
}

function logLikelihood({ n, logs, counts, sumLogs }: GroupedLogs, lambda: number): number {
  // Two-pass variance of the transformed values, each distinct value weighted by its count.
  const asLog = Math.abs(lambda) < LOG_LAMBDA;
  const transformed = new Float64Array(logs.length);
  let mean = 0;
  for (let k = 0; k < logs.length; k++) {
    const t = asLog ? logs[k] : Math.expm1(lambda * logs[k]) / lambda;
    transformed[k] = t;
    mean += counts[k] * t;
  }
  mean /= n;
  let squares = 0;
  for (let k = 0; k < logs.length; k++) {
    const d = transformed[k] - mean;
    squares += counts[k] * d * d;
  }
  return -(n / 2) * Math.log(squares / n) + (lambda - 1) * sumLogs;
}

/** Golden-section search for the maximum of a unimodal function on [a, b]. */
export function maximise(f: (x: number) => number, a: number, b: number, tolerance = 1e-10): number {
  const ratio = (Math.sqrt(5) - 1) / 2;
  let c = b - ratio * (b - a);
  let d = a + ratio * (b - a);
  let fc = f(c);
  let fd = f(d);
  while (b - a > tolerance) {
    if (fc > fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - ratio * (b - a);
      fc = f(c);
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + ratio * (b - a);
      fd = f(d);
    }
  }
  return (a + b) / 2;
}
