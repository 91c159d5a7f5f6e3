import { normalCdf } from './distributions.ts';
import { checkFinite, checkPositive, checkValues, fail } from './validate.ts';

/** Options of {@link detectShifts}. Defaults suit a series of SDIs (in-control mean 0, SD 1). */
export interface DetectShiftsOptions {
  /** In-control mean of the series (μ0). Default 0. */
  mean?: number;
  /** In-control SD of the series (σ). Default 1. */
  sd?: number;
  /** Reference value k, in SDs: half the shift to detect quickly. Default 0.5. */
  k?: number;
  /** Decision interval h, in SDs. Default 5. */
  h?: number;
  /**
   * Optional Shewhart limit, in SDs: a single point beyond ±limit also signals (combined
   * Shewhart-CUSUM), so a large jump is flagged at once. Default none (CUSUM alone).
   */
  shewhart?: number;
}

/** A detected shift of a series' mean. */
export interface DetectedShift {
  /** Index of the first point after the shift (the estimated change point). */
  index: number;
  /** Index of the point at which the CUSUM crossed h. */
  signalIndex: number;
  /** Estimated new mean minus the in-control mean, in SDs (negative for a downward shift). */
  size: number;
  direction: 'up' | 'down';
  /** Mean of the points from `index` to `signalIndex`, in the series' units. */
  meanAfter: number;
  /**
   * 1 − two-sided p of a z-test that the points from `index` to `signalIndex` have the in-control
   * mean (σ known). Approximate: the points were chosen by the detector, so it is optimistic.
   */
  confidence: number;
}

/**
 * Shifts of a series' mean by the two-sided tabular CUSUM, restarted after each signal.
 * With x standardised as z = (x − μ0)/σ:
 *   C⁺ᵢ = max(0, zᵢ − k + C⁺ᵢ₋₁),  C⁻ᵢ = max(0, −zᵢ − k + C⁻ᵢ₋₁),  C⁺₀ = C⁻₀ = 0;
 * a signal when C⁺ᵢ > h or C⁻ᵢ > h, or (with `shewhart`) when |zᵢ| > the Shewhart limit. The change point is estimated as the first point of the current
 * run of non-zero C (τ̂ = i − N⁺, so `index` = i − N⁺ + 1), and the new mean as
 * μ0 + σ · (k + C⁺ᵢ / N⁺) (down: μ0 − σ · (k + C⁻ᵢ / N⁻)).
 * k = 0.5 and h = 5 give an in-control average run length of about 465 points and detect a
 * 1 SD shift after about 10 points, two-sided (Montgomery's table of CUSUM ARLs, from memory).
 *
 * Source: Montgomery DC. Introduction to Statistical Quality Control, 6th ed. Wiley 2009, §9.1
 * (tabular CUSUM, recommended k and h, change-point and new-mean estimates; from memory); Lucas JM.
 * Combined Shewhart-CUSUM quality control schemes. J Qual Technol 1982;14:51–59 (from memory).
 *
 * @throws {Error} when a value is not finite, sd, k or h is not greater than 0, or mean is not finite.
 * @example
 * detectShifts([0, 0, 0, 0, 3, 3, 3]);
 * // => [{ index: 4, signalIndex: 6, size: 3, direction: 'up', meanAfter: 3, confidence: 0.9999997... }]
 */
export function detectShifts(series: readonly number[], options: DetectShiftsOptions = {}): DetectedShift[] {
  const fn = 'detectShifts';
  checkValues(fn, series, 0);
  const mean = options.mean ?? 0;
  const sd = options.sd ?? 1;
  const k = options.k ?? 0.5;
  const h = options.h ?? 5;
  checkFinite(fn, 'mean', mean);
  checkPositive(fn, 'sd', sd);
  checkPositive(fn, 'k', k);
  checkPositive(fn, 'h', h);
  const shewhart = options.shewhart ?? Infinity;
  if (options.shewhart !== undefined) checkPositive(fn, 'shewhart', shewhart);
  if (!Number.isFinite((series.length * k) / sd)) fail(fn, 'k or sd out of range');

  const shifts: DetectedShift[] = [];
  let upper = 0;
  let lower = 0;
  let upperLength = 0; // N⁺: consecutive points with C⁺ > 0
  let lowerLength = 0;
  for (let i = 0; i < series.length; i++) {
    const z = (series[i] - mean) / sd;
    upper = Math.max(0, z - k + upper);
    lower = Math.max(0, -z - k + lower);
    upperLength = upper > 0 ? upperLength + 1 : 0;
    lowerLength = lower > 0 ? lowerLength + 1 : 0;
    const up = upper > h || z > shewhart;
    const down = lower > h || z < -shewhart;
    if (!up && !down) continue;
    // Both sides at once cannot happen (C⁺ and C⁻ cannot both grow on one point); take the larger.
    const isUp = up && (!down || upper >= lower);
    const length = isUp ? upperLength : lowerLength;
    const start = i - length + 1;
    const size = isUp ? k + upper / length : -(k + lower / length);
    shifts.push(describe(series, start, i, size, mean, sd));
    upper = 0;
    lower = 0;
    upperLength = 0;
    lowerLength = 0;
  }
  return shifts;
}

function describe(
  series: readonly number[],
  start: number,
  signal: number,
  size: number,
  mean: number,
  sd: number,
): DetectedShift {
  let sum = 0;
  for (let j = start; j <= signal; j++) sum += series[j];
  const count = signal - start + 1;
  const meanAfter = sum / count;
  const z = ((meanAfter - mean) / sd) * Math.sqrt(count);
  const confidence = 1 - 2 * (1 - normalCdf(Math.abs(z)));
  return {
    index: start,
    signalIndex: signal,
    size,
    direction: size > 0 ? 'up' : 'down',
    meanAfter,
    confidence,
  };
}
