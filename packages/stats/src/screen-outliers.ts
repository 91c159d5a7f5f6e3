import { boxCoxLambdaOfSorted, boxCoxUnchecked } from './box-cox.ts';
import { percentileOfSorted } from './percentile.ts';
import { checkValues, fail } from './validate.ts';

export interface OutlierScreen {
  /** Values kept, in their original order. */
  kept: number[];
  /** Values removed, in their original order. */
  removed: number[];
}

/**
 * Screen reference values for outliers.
 *
 * 'tukey' (Horn et al.): transform the values with the maximum-likelihood Box-Cox λ
 * ({@link boxCoxLambda}), take the quartiles Q1, Q3 of the transformed values (rank p(n + 1),
 * interpolated) and remove values outside [Q1 − 1.5·IQR, Q3 + 1.5·IQR]; one pass. Needs values
 * greater than 0 and at least 4 values.
 *
 * 'dixon' (Reed, Henry & Mason; Dixon): with D the gap between the most extreme value and its
 * neighbour and R the range, remove the extreme when D/R ≥ 1/3; the lowest and highest are
 * tested, and the test is repeated on what is left until neither end qualifies or fewer than 3
 * values remain. Equal values at an end are never split (D = 0).
 *
 * Sources: Horn PS, Pesce AJ, Copeland BE, Clin Chem 1998;44:622–631 and Horn PS et al.,
 * Clin Chem 2001;47:2137–2145 (Box-Cox then Tukey fences; memory); Tukey JW, Exploratory Data
 * Analysis 1977 (fences); Reed AH, Henry RJ, Mason WB, Clin Chem 1971;17:275–284 (D/R ≥ 1/3);
 * CLSI EP28-A3c.
 *
 * @throws {Error} when the method is unknown, there are too few values (4 for 'tukey', 3 for
 *   'dixon'), a value is not finite, or ('tukey') a value is not greater than 0.
 * @example
 * screenOutliers([3.1, 3.3, 3.4, 3.4, 3.5, 3.6, 3.7, 3.8, 9.9], 'dixon');
 * // => { kept: [3.1, 3.3, 3.4, 3.4, 3.5, 3.6, 3.7, 3.8], removed: [9.9] }
 */
export function screenOutliers(values: readonly number[], method: 'tukey' | 'dixon'): OutlierScreen {
  const { kept, removed } = screenOutliersKeepingSorted(values, method);
  return { kept, removed };
}

/**
 * {@link screenOutliers}, also giving the kept values sorted ascending: the values are sorted once for
 * the screen, and the kept ones are a run of them, so a caller going on to order statistics
 * ({@link nonparametricIntervalOfSorted}) need not sort again.
 */
export function screenOutliersKeepingSorted(
  values: readonly number[],
  method: 'tukey' | 'dixon',
): OutlierScreen & { keptSorted: Float64Array } {
  const fn = 'screenOutliers';
  if (method === 'tukey') {
    checkValues(fn, values, 4);
    for (let i = 0; i < values.length; i++) {
      if (values[i] <= 0)
        fail(
          fn,
          `Tukey screening after a Box-Cox transform needs values greater than 0; value at index ${i} is ${values[i]}`,
        );
    }
    const sorted = new Float64Array(values).sort();
    return split(values, sorted, tukeyFences(sorted));
  }
  if (method === 'dixon') {
    checkValues(fn, values, 3);
    const sorted = new Float64Array(values).sort();
    return split(values, sorted, dixonBounds(sorted));
  }
  return fail(fn, `unknown method '${String(method)}', expected 'tukey' or 'dixon'`);
}

/**
 * Fences in the original units, from the values sorted once. The transform is increasing, so the
 * transformed values are in the same order: each quartile interpolates between the transforms of two
 * neighbouring sorted values, and the kept values are a run of the sorted ones.
 */
function tukeyFences(sorted: Float64Array): [number, number] {
  const lambda = boxCoxLambdaOfSorted(sorted);
  const quartile = (p: number) => {
    percentileOfSorted('screenOutliers', sorted, p); // refuses a sample too small for rank p(n + 1)
    const rank = p * (sorted.length + 1);
    const below = Math.floor(rank);
    const fraction = rank - below;
    const low = boxCoxUnchecked(sorted[below - 1], lambda);
    return fraction === 0 ? low : low + fraction * (boxCoxUnchecked(sorted[below], lambda) - low);
  };
  const q1 = quartile(0.25);
  const q3 = quartile(0.75);
  const iqr = q3 - q1;
  const lowT = q1 - 1.5 * iqr;
  const highT = q3 + 1.5 * iqr;
  // Smallest and largest values whose transform lies inside the fences (each distinct value once).
  let low = Infinity;
  let high = -Infinity;
  for (let i = 0; i < sorted.length; i++) {
    const v = sorted[i];
    if (i > 0 && v === sorted[i - 1]) continue;
    const t = boxCoxUnchecked(v, lambda);
    if (t >= lowT && t <= highT) {
      if (v < low) low = v;
      high = v;
    }
  }
  return [low, high];
}

/** The smallest and largest values kept by the repeated D/R ≥ 1/3 test. */
function dixonBounds(sorted: Float64Array): [number, number] {
  let first = 0;
  let last = sorted.length - 1;
  while (last - first + 1 >= 3) {
    const range = sorted[last] - sorted[first];
    if (range === 0) break;
    const lowOut = (sorted[first + 1] - sorted[first]) / range >= 1 / 3;
    const highOut = (sorted[last] - sorted[last - 1]) / range >= 1 / 3;
    if (!lowOut && !highOut) break;
    if (lowOut) first++;
    if (highOut) last--;
  }
  return [sorted[first], sorted[last]];
}

/** Values within [low, high] kept, the others removed, both in their original order. */
function split(
  values: readonly number[],
  sorted: Float64Array,
  [low, high]: [number, number],
): OutlierScreen & { keptSorted: Float64Array } {
  const kept: number[] = [];
  const removed: number[] = [];
  for (const v of values) (v >= low && v <= high ? kept : removed).push(v);
  let first = 0;
  while (first < sorted.length && sorted[first] < low) first++;
  return { kept, removed, keptSorted: sorted.subarray(first, first + kept.length) };
}
