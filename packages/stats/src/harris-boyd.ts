import { summarize } from './summarize.ts';
import { checkValues, fail } from './validate.ts';

export interface HarrisBoydResult {
  /** |x̄₁ − x̄₂| / √(s₁²/n₁ + s₂²/n₂). */
  z: number;
  /** 3 · √((n₁ + n₂) / 240). */
  zCritical: number;
  /** Larger SD / smaller SD. */
  sdRatio: number;
  /** True when z > zCritical or sdRatio > 1.5: give the subgroups separate intervals. */
  partition: boolean;
}

/**
 * Harris & Boyd test whether two subgroups (sexes, age bands, sites) need separate reference
 * intervals: z = |x̄₁ − x̄₂| / √(s₁²/n₁ + s₂²/n₂) against z* = 3·√((n₁ + n₂)/240), and the SD
 * ratio against 1.5. Partition when z > z* or SD ratio > 1.5. Apply to Gaussian (transformed) data.
 *
 * Source: Harris EK, Boyd JC. On dividing reference data into subgroups to produce separate
 * reference ranges. Clin Chem 1990;36:265–270 (z*, published); SD-ratio criterion 1.5 (memory,
 * widely cited).
 *
 * @throws {Error} when a group has fewer than 2 values, a value is not finite, or both SDs are 0.
 * @example
 * const a = Array.from({ length: 120 }, (_, i) => 140 + (i % 2 === 0 ? 2 : -2));
 * harrisBoyd(a, a.map((v) => v + 1)).partition; // => true
 */
export function harrisBoyd(a: readonly number[], b: readonly number[]): HarrisBoydResult {
  const fn = 'harrisBoyd';
  checkValues(fn, a, 2, ' in the first group');
  checkValues(fn, b, 2, ' in the second group');
  const first = summarize(a);
  const second = summarize(b);
  if (first.sd === 0 && second.sd === 0) fail(fn, 'both groups have SD 0, so the test is undefined');
  return harrisBoydFromSummaries(first, second);
}

/**
 * Harris & Boyd test from the two groups' summaries (n, mean, SD); see {@link harrisBoyd}.
 *
 * @throws {Error} when a group has n < 2, a figure is not finite, an SD is negative, or both SDs are 0.
 * @example
 * harrisBoydFromSummaries({ n: 120, mean: 140, sd: 2 }, { n: 120, mean: 141, sd: 2 });
 * // => { z: 3.872983346207417, zCritical: 3, sdRatio: 1, partition: true }
 */
export function harrisBoydFromSummaries(
  a: { n: number; mean: number; sd: number },
  b: { n: number; mean: number; sd: number },
): HarrisBoydResult {
  const fn = 'harrisBoydFromSummaries';
  for (const [name, group] of [
    ['first', a],
    ['second', b],
  ] as const) {
    if (!Number.isInteger(group.n) || group.n < 2) fail(fn, `${name} group needs n ≥ 2, got ${group.n}`);
    if (!Number.isFinite(group.mean)) fail(fn, `${name} group mean is not a finite number`);
    if (!(Number.isFinite(group.sd) && group.sd >= 0))
      fail(fn, `${name} group sd must be a finite number ≥ 0, got ${group.sd}`);
  }
  if (a.sd === 0 && b.sd === 0) fail(fn, 'both groups have SD 0, so the test is undefined');
  const z = Math.abs(a.mean - b.mean) / Math.sqrt((a.sd * a.sd) / a.n + (b.sd * b.sd) / b.n);
  const zCritical = 3 * Math.sqrt((a.n + b.n) / 240);
  const sdRatio = Math.max(a.sd, b.sd) / Math.min(a.sd, b.sd);
  return { z, zCritical, sdRatio, partition: z > zCritical || sdRatio > 1.5 };
}
