import { fail } from './validate.ts';

/** One part to pool: a month, a lab, a period. */
export interface PoolPart {
  n: number;
  mean: number;
  sd: number;
}

/** Pooled figures of several parts. */
export interface Pooled {
  n: number;
  mean: number;
  /** Total SD of all values (within-part plus between-part spread). */
  sd: number;
  /** Pooled within-part SD, √(Σ(nᵢ − 1)sᵢ² / Σ(nᵢ − 1)); NaN when no part has n ≥ 2. */
  withinSd: number;
}

/**
 * Pool summaries (n, mean, SD) into the figures of all their values together:
 * N = Σnᵢ, mean = Σnᵢx̄ᵢ / N, SS = Σ(nᵢ − 1)sᵢ² + Σnᵢ(x̄ᵢ − mean)², SD = √(SS / (N − 1)),
 * and the pooled within-part SD √(Σ(nᵢ − 1)sᵢ² / Σ(nᵢ − 1)).
 *
 * Source: the analysis-of-variance decomposition of the total sum of squares (any one-way
 * ANOVA text); docs/methods.md §1. A part with n = 1 must have SD 0.
 *
 * @throws {Error} when there are no parts, a part has a non-integer n < 1, a non-finite mean,
 *   a negative or non-finite SD, all parts together hold fewer than 2 values, or a pooled figure
 *   would not be finite (overflow of finite but huge inputs), naming the figure and the part.
 * @example
 * pool([{ n: 3, mean: 2, sd: 1 }, { n: 3, mean: 5, sd: 1 }]);
 * // => { n: 6, mean: 3.5, sd: 1.8708286933869707, withinSd: 1 }
 */
export function pool(parts: readonly PoolPart[]): Pooled {
  const fn = 'pool';
  if (!Array.isArray(parts) || parts.length === 0) fail(fn, 'needs at least 1 part, got 0');
  let total = 0;
  // Conditions are tested inline so that messages are only built on failure (hot path).
  for (let i = 0; i < parts.length; i++) {
    const { n, mean, sd } = parts[i];
    if (!Number.isInteger(n) || n < 1) fail(fn, `part ${i} n must be an integer of at least 1, got ${n}`);
    if (!Number.isFinite(mean)) fail(fn, `part ${i} mean must be a finite number, got ${mean}`);
    if (!Number.isFinite(sd)) fail(fn, `part ${i} sd must be a finite number, got ${sd}`);
    if (sd < 0) fail(fn, `part ${i} sd must not be negative, got ${sd}`);
    total += n;
  }
  if (total < 2) fail(fn, `needs at least 2 values in all parts together, got ${total}`);

  // Work relative to the first mean so large offsets do not cost precision.
  const offset = parts[0].mean;
  let weighted = 0;
  for (const part of parts) weighted += part.n * (part.mean - offset);
  const mean = offset + weighted / total;

  let withinSquares = 0;
  let withinDegrees = 0;
  let betweenSquares = 0;
  for (const part of parts) {
    withinSquares += (part.n - 1) * part.sd * part.sd;
    withinDegrees += part.n - 1;
    const d = part.mean - mean;
    betweenSquares += part.n * d * d;
  }
  const sd = Math.sqrt((withinSquares + betweenSquares) / (total - 1));
  const withinSd = withinDegrees > 0 ? Math.sqrt(withinSquares / withinDegrees) : Number.NaN;
  // Finite inputs can still overflow: n·mean, n·(mean difference)² or (n − 1)·sd² beyond ~1.8e308.
  if (!Number.isFinite(mean)) fail(fn, `pooled mean is not finite (${mean}): ${largestPart(parts)}`);
  if (!Number.isFinite(sd)) fail(fn, `pooled SD is not finite (${sd}): ${largestPart(parts)}`);
  if (withinDegrees > 0 && !Number.isFinite(withinSd)) {
    fail(fn, `pooled within-part SD is not finite (${withinSd}): ${largestPart(parts)}`);
  }
  return { n: total, mean, sd, withinSd };
}

/** Why pooled figures overflowed, naming the part with the largest |mean| and the one with the largest SD. */
function largestPart(parts: readonly PoolPart[]): string {
  let byMean = 0;
  let bySd = 0;
  for (let i = 1; i < parts.length; i++) {
    if (Math.abs(parts[i].mean) > Math.abs(parts[byMean].mean)) byMean = i;
    if (parts[i].sd > parts[bySd].sd) bySd = i;
  }
  return (
    `the parts' figures are too large or too far apart to combine in double precision ` +
    `(largest |mean| ${parts[byMean].mean} in part ${byMean}, largest SD ${parts[bySd].sd} in part ${bySd})`
  );
}
