import { checkFinite, checkPositive, fail } from './validate.ts';

/** One comparison with the peer group (a period and level): the lab's bias and the peer mean's uncertainty. */
export interface BiasComparison {
  /** 100 · (lab mean − peer mean) / peer mean. */
  biasPct: number;
  /** Relative standard uncertainty of the peer mean in %, e.g. from {@link peerMeanUncertaintyPct}. */
  uRefPct: number;
}

export interface MeasurementUncertaintyInput {
  /** The lab's long-term (within-lab reproducibility) CV in %, from its QC data. */
  cvPct: number;
  /** Peer comparisons; at least one. */
  comparisons: readonly BiasComparison[];
  /** Coverage factor of the expanded uncertainty (default 2, ≈ 95 %). */
  coverageFactor?: number;
}

export interface MeasurementUncertainty {
  /** u(Rw) %: the long-term CV. */
  uRw: number;
  /** RMS of the biases %. */
  rmsBias: number;
  /** u(Cref) %: mean of the peer means' relative standard uncertainties. */
  uRef: number;
  /** u(bias) % = √(RMS(bias)² + u(Cref)²). */
  uBias: number;
  /** Combined standard uncertainty % = √(u(Rw)² + u(bias)²). */
  uc: number;
  /** Expanded uncertainty % = k · uc. */
  U: number;
}

/**
 * Measurement uncertainty from QC and peer-comparison data (Nordtest approach):
 * u(Rw) = long-term CV; RMS(bias) = √(Σ biasᵢ² / m); u(Cref) = mean of the comparisons' u(Cref,i);
 * u(bias) = √(RMS(bias)² + u(Cref)²); uc = √(u(Rw)² + u(bias)²); U = k · uc with k = 2. All in %.
 *
 * Source: Magnusson B, Näykki T, Hovind H, Krysell M, Sahlin E. Handbook for calculation of
 * measurement uncertainty in environmental laboratories, Nordtest Report TR 537 (ed. 4, 2017),
 * §6 (bias from interlaboratory comparisons); docs/methods.md §3.
 *
 * @throws {Error} when the CV is not greater than 0, there are no comparisons, a bias is not
 *   finite, a u(Cref) is negative or not finite, or the coverage factor is not greater than 0.
 * @example
 * measurementUncertainty({ cvPct: 3, comparisons: [{ biasPct: 4, uRefPct: 0 }, { biasPct: -2, uRefPct: 1 }] });
 * // => { uRw: 3, rmsBias: 3.1622776601683795, uRef: 0.5, uBias: 3.2015621187164243,
 * //      uc: 4.38748219369606, U: 8.77496438739212 }
 */
export function measurementUncertainty(input: MeasurementUncertaintyInput): MeasurementUncertainty {
  const fn = 'measurementUncertainty';
  checkPositive(fn, 'cvPct', input.cvPct);
  const k = input.coverageFactor ?? 2;
  checkPositive(fn, 'coverageFactor', k);
  const { comparisons } = input;
  if (!Array.isArray(comparisons) || comparisons.length === 0)
    fail(fn, 'needs at least 1 peer comparison, got 0');
  let squares = 0;
  let uRefSum = 0;
  comparisons.forEach((c, i) => {
    checkFinite(fn, `comparison ${i} biasPct`, c.biasPct);
    checkFinite(fn, `comparison ${i} uRefPct`, c.uRefPct);
    if (c.uRefPct < 0) fail(fn, `comparison ${i} uRefPct must not be negative, got ${c.uRefPct}`);
    squares += c.biasPct * c.biasPct;
    uRefSum += c.uRefPct;
  });
  const m = comparisons.length;
  const uRw = input.cvPct;
  const rmsBias = Math.sqrt(squares / m);
  const uRef = uRefSum / m;
  const uBias = Math.hypot(rmsBias, uRef);
  const uc = Math.hypot(uRw, uBias);
  return { uRw, rmsBias, uRef, uBias, uc, U: k * uc };
}

/**
 * Relative standard uncertainty of a consensus (peer) mean in %, from the between-lab dispersion of
 * the lab means: u(Cref) = 100 · s_between / (|peer mean| · √m), with m the number of labs in the
 * peer mean. Pass the robust SD s* of the lab means (ISO 13528 Algorithm A, as published with the
 * peer figures) as s_between: it estimates the spread of the lab means while resisting a lab the
 * outlier screen removed. Not the peer CV: that mixes the within-lab spread of single values into a
 * figure about lab means.
 *
 * Source: Nordtest TR 537 (ed. 4, 2017), bias from interlaboratory comparisons: u(Cref) = s_R / √m,
 * s_R the between-laboratory standard deviation of the participants' results (memory of the
 * handbook, not re-read for the test).
 *
 * @throws {Error} when the SD is negative or not finite, the peer mean is 0 or not finite, labs is
 *   not an integer ≥ 1, or the result would not be finite.
 * @example
 * peerMeanUncertaintyPct(0.2, 5, 16); // => 1
 */
export function peerMeanUncertaintyPct(betweenLabSd: number, peerMean: number, labs: number): number {
  const fn = 'peerMeanUncertaintyPct';
  checkFinite(fn, 'betweenLabSd', betweenLabSd);
  if (betweenLabSd < 0) fail(fn, `betweenLabSd must not be negative, got ${betweenLabSd}`);
  checkFinite(fn, 'peerMean', peerMean);
  if (peerMean === 0) fail(fn, 'peerMean is 0, so a relative uncertainty is undefined');
  if (!Number.isInteger(labs) || labs < 1) fail(fn, `labs must be an integer of at least 1, got ${labs}`);
  const u = (100 * betweenLabSd) / (Math.abs(peerMean) * Math.sqrt(labs));
  checkFinite(fn, 'u(Cref) %', u);
  return u;
}
