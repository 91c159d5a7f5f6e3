import { linearRegression } from 'simple-statistics';
import { checkFinite, fail } from './validate.ts';

export interface BhattacharyaFit {
  mean: number;
  sd: number;
  /** Slope of Δ ln(count) against the bin boundary: −h/σ² before the Sheppard correction. */
  slope: number;
  /** Number of consecutive bin pairs used. */
  points: number;
}

/**
 * Bhattacharya's method for one Gaussian component of a histogram with equal bins of width h:
 * for consecutive bins with counts fᵢ, fᵢ₊₁ > 0, y = ln fᵢ₊₁ − ln fᵢ plotted against the boundary
 * between them is a straight line y = −λ(x − μ); a least-squares line gives λ = −slope and
 * μ = the x-intercept, and σ² = h/λ − h²/12 (Sheppard's correction). Pass only the bins of the
 * component (e.g. the central, healthy part of routine data).
 *
 * Source: Bhattacharya CG. A simple method of resolution of a distribution into Gaussian
 * components. Biometrics 1967;23:115–135; Sheppard's correction (memory).
 *
 * @throws {Error} when edges and counts do not match (edges = counts + 1), the bins are not of equal
 *   increasing width, a count is negative or not finite, fewer than 2 usable pairs remain, or the
 *   fitted slope is not negative.
 * @example
 * bhattacharya([-1.5, -0.5, 0.5, 1.5], [Math.exp(-0.5), 1, Math.exp(-0.5)]);
 * // => { mean: 0, sd: 0.9574271077563381, slope: -1, points: 2 }
 */
export function bhattacharya(edges: readonly number[], counts: readonly number[]): BhattacharyaFit {
  const fn = 'bhattacharya';
  if (!Array.isArray(edges) || !Array.isArray(counts) || edges.length !== counts.length + 1) {
    fail(fn, 'needs bin edges with one more entry than counts');
  }
  edges.forEach((e, i) => checkFinite(fn, `edge ${i}`, e));
  const width = edges[1] - edges[0];
  for (let i = 1; i < edges.length; i++) {
    const w = edges[i] - edges[i - 1];
    if (!(w > 0) || Math.abs(w - width) > 1e-9 * Math.abs(width))
      fail(fn, `bins must have equal increasing width; bin ${i - 1} differs`);
  }
  counts.forEach((c, i) => {
    checkFinite(fn, `count ${i}`, c);
    if (c < 0) fail(fn, `count ${i} must not be negative, got ${c}`);
  });
  const pairs: [number, number][] = [];
  for (let i = 0; i + 1 < counts.length; i++) {
    if (counts[i] > 0 && counts[i + 1] > 0)
      pairs.push([edges[i + 1], Math.log(counts[i + 1]) - Math.log(counts[i])]);
  }
  if (pairs.length < 2)
    fail(fn, `needs at least 2 pairs of neighbouring non-empty bins, got ${pairs.length}`);
  const { m: slope, b: intercept } = linearRegression(pairs);
  if (!(slope < 0))
    fail(fn, `the fitted slope is ${slope}, not negative, so the bins are not one Gaussian component`);
  const lambda = -slope;
  const variance = width / lambda - (width * width) / 12;
  if (!(variance > 0)) fail(fn, 'the fitted variance is not positive (bins too wide for this component)');
  return { mean: intercept / lambda, sd: Math.sqrt(variance), slope, points: pairs.length };
}
