import { chiSquareCdf, normalCdf, normalQuantile } from './distributions.ts';
import { boxCoxInverseUnchecked, boxCoxUnchecked } from './box-cox.ts';
import { checkFinite, checkInteger, checkProbability, fail, sortedCopy } from './validate.ts';

export interface IndirectIntervalOptions {
  /** Lower percentile of the healthy distribution as a fraction (default 0.025). */
  lower?: number;
  /** Upper percentile as a fraction (default 0.975). */
  upper?: number;
  /** Fewest values accepted (default 1000). */
  minValues?: number;
  /** Search range of λ, searched in steps of 0.1 (default [-1, 2]). */
  lambdaRange?: [number, number];
  /** A truncation interval is acceptable when its chi-square p-value is at least this (default 0.2). */
  fitPValue?: number;
}

export interface IndirectDiagnostics {
  n: number;
  /** Box-Cox λ of the healthy component. */
  lambda: number;
  /** Mean and SD of the healthy component on the transformed scale. */
  mu: number;
  sigma: number;
  /** Truncation interval [A, B) in original units, and the share of all values inside it. */
  truncation: [number, number];
  fractionInTruncation: number;
  /** Estimated share of all values that belong to the healthy component. */
  healthyFraction: number;
  /** Chi-square goodness of fit inside the truncation interval (plus any outside overshoot), its df and p-value. */
  chiSquare: number;
  degreesOfFreedom: number;
  pValue: number;
  /** True when the chosen interval passed the fit test; false when none did and the best-fitting one was used. */
  fitAccepted: boolean;
  /** Resolution the values were rounded to (0 when they look continuous). */
  resolution: number;
  /** Number of truncation intervals fitted. */
  candidates: number;
}

export interface IndirectInterval {
  lower: number;
  upper: number;
  method: string;
  diagnostics: IndirectDiagnostics;
}

const LAMBDA_STEP = 0.1;
const EDGE_QUANTILES_LOW = [0.01, 0.025, 0.05, 0.075, 0.1, 0.125, 0.15, 0.175, 0.2, 0.25, 0.3, 0.35, 0.4];
const EDGE_QUANTILES_HIGH = [0.6, 0.65, 0.7, 0.75, 0.8, 0.825, 0.85, 0.875, 0.9, 0.925, 0.95, 0.975, 0.99];

interface Fit {
  mu: number;
  sigma: number;
  logLikelihood: number;
}

/**
 * Indirect reference interval from routine (mixed healthy and pathological) results by a
 * truncated-normal fit after a Box-Cox transform, in the spirit of the truncated maximum
 * likelihood methods recommended by the IFCC C-RIDL.
 *
 * Model: a dominant healthy component whose Box-Cox transform (λ) is normal (μ, σ); inside a
 * truncation interval [A, B) around the bulk of the data all values are assumed healthy.
 * 1. Candidate edges A at the data's 1 … 40 % quantiles and B at 60 … 99 % (13 each; between
 *    neighbouring values, or between rounding cells when the values are rounded), keeping
 *    intervals with at least 30 % of the values.
 * 2. For every candidate and every λ on a 0.1 grid over `lambdaRange`, μ and σ by maximum
 *    likelihood of the normal truncated to [A, B) (moment equations of the exponential family);
 *    λ by the largest likelihood including the Jacobian (λ − 1)Σ ln x.
 * 3. Each candidate's fit is judged by chi-square in ≤ 20 equal-expectation bins inside [A, B)
 *    plus a one-sided penalty where the healthy component would predict more values outside
 *    [A, B) than observed; df = bins − 4. Chosen: the candidate with the most values whose
 *    p-value ≥ `fitPValue` (0.2); when none passes, the smallest chi-square/df (diagnostics say so).
 * 4. Limits: the healthy component's quantiles, back-transformed: bc⁻¹(μ + z_p σ).
 * Checked by simulation: 80 % N(140, 2²) with 20 % pathological tails, and log-normal healthy
 * data with tails, n = 5 000 … 200 000 (see docs/methods.md for the tolerance).
 *
 * Sources: Jones GRD et al., Indirect methods for reference interval determination – review and
 * recommendations (IFCC C-RIDL), Clin Chem Lab Med 2019;57:20–29; Arzideh F et al., Clin Chem Lab
 * Med 2007;45:1043–1057 (truncated maximum likelihood); Box & Cox 1964. The candidate grid, the
 * fit test and its 0.2 level are choices of this service (memory of the published methods).
 *
 * @throws {Error} when there are fewer than `minValues` values (default 1000), a value is not
 *   finite or not greater than 0, an option is invalid, or no candidate gives a usable fit.
 * @example
 * // 80 % healthy N(140, 2²) (true limits 136.08 / 143.92) with 20 % pathological tails:
 * const random = seededRandom(2024);
 * const values = Array.from({ length: 20000 }, () => {
 *   const u = random.uniform();
 *   return u < 0.8 ? random.normal(140, 2) : u < 0.88 ? random.normal(130, 4) : random.normal(150, 4);
 * });
 * const { lower, upper } = indirectInterval(values);
 * // => lower 135.92335485229054, upper 144.03145471996493
 */
export function indirectInterval(
  values: readonly number[],
  options: IndirectIntervalOptions = {},
): IndirectInterval {
  const fn = 'indirectInterval';
  const lowerP = options.lower ?? 0.025;
  const upperP = options.upper ?? 0.975;
  const minValues = options.minValues ?? 1000;
  const [lambdaFrom, lambdaTo] = options.lambdaRange ?? [-1, 2];
  const fitPValue = options.fitPValue ?? 0.2;
  checkProbability(fn, 'fitPValue', fitPValue);
  checkProbability(fn, 'lower', lowerP);
  checkProbability(fn, 'upper', upperP);
  if (lowerP >= upperP) fail(fn, `lower (${lowerP}) must be below upper (${upperP})`);
  checkInteger(fn, 'minValues', minValues, 100);
  checkFinite(fn, 'lambdaRange[0]', lambdaFrom);
  checkFinite(fn, 'lambdaRange[1]', lambdaTo);
  if (lambdaFrom >= lambdaTo) fail(fn, `lambdaRange must be increasing, got [${lambdaFrom}, ${lambdaTo}]`);
  const sorted = sortedCopy(fn, values, minValues);
  const n = sorted.length;
  if (sorted[0] <= 0)
    fail(fn, `needs values greater than 0 for the Box-Cox transform; the smallest is ${sorted[0]}`);

  const resolution = roundingResolution(sorted);
  // Candidate truncation edges in original units, between values (or between rounding cells).
  const edgeAt = (q: number) => {
    const k = Math.min(n - 1, Math.max(1, Math.round(q * n)));
    return resolution > 0 ? sorted[k] - resolution / 2 : (sorted[k - 1] + sorted[k]) / 2;
  };
  const lowEdges = unique(EDGE_QUANTILES_LOW.map(edgeAt));
  const highEdges = unique(EDGE_QUANTILES_HIGH.map(edgeAt));
  const edges = unique([...lowEdges, ...highEdges]).sort((a, b) => a - b);
  const edgeIndex = edges.map((e) => lowerBound(sorted, e));

  const logs = Float64Array.from(sorted, Math.log);
  const lambdas: number[] = [];
  for (let l = lambdaFrom; l <= lambdaTo + 1e-9; l += LAMBDA_STEP) lambdas.push(Math.round(l * 1e6) / 1e6);

  // Best fit per candidate interval over the λ grid.
  interface Candidate {
    low: number;
    high: number;
    lambda: number;
    fit: Fit;
    count: number;
  }
  const best = new Map<string, Candidate>();
  for (const lambda of lambdas) {
    const sums = segmentSums(sorted, logs, edgeIndex, lambda);
    for (const lowEdge of lowEdges) {
      for (const highEdge of highEdges) {
        if (highEdge <= lowEdge) continue;
        const i = edges.indexOf(lowEdge);
        const j = edges.indexOf(highEdge);
        const count = sums.count[j] - sums.count[i];
        if (count < 0.3 * n || count < 50) continue;
        const s1 = sums.s1[j] - sums.s1[i];
        const s2 = sums.s2[j] - sums.s2[i];
        const sl = sums.sl[j] - sums.sl[i];
        const a = boxCoxUnchecked(lowEdge, lambda) - sums.center;
        const b = boxCoxUnchecked(highEdge, lambda) - sums.center;
        const fit = fitTruncatedNormal(count, s1, s2, a, b);
        if (!fit) continue;
        fit.logLikelihood += (lambda - 1) * sl;
        fit.mu += sums.center;
        const key = `${i}:${j}`;
        const previous = best.get(key);
        if (!previous || fit.logLikelihood > previous.fit.logLikelihood) {
          best.set(key, { low: lowEdge, high: highEdge, lambda, fit, count });
        }
      }
    }
  }

  // Choose the widest candidate whose fit passes the chi-square test; when none passes, the one
  // with the smallest chi-square per degree of freedom.
  type Judged = Candidate & { chiSquare: number; df: number; pValue: number };
  let widestAccepted: Judged | null = null;
  let bestFitting: Judged | null = null;
  for (const candidate of best.values()) {
    const judged = judge(sorted, resolution, candidate, n);
    if (!judged) continue;
    const pValue = 1 - chiSquareCdf(judged.chiSquare, judged.df);
    const entry = { ...candidate, ...judged, pValue };
    if (pValue >= fitPValue && (!widestAccepted || entry.count > widestAccepted.count))
      widestAccepted = entry;
    if (!bestFitting || entry.chiSquare / entry.df < bestFitting.chiSquare / bestFitting.df)
      bestFitting = entry;
  }
  const chosen = widestAccepted ?? bestFitting;
  if (!chosen)
    fail(fn, 'no truncation interval gave a usable fit; the values may have no dominant healthy component');

  const { mu, sigma } = chosen.fit;
  const lambda = chosen.lambda;
  const za = (boxCoxUnchecked(chosen.low, lambda) - mu) / sigma;
  const zb = (boxCoxUnchecked(chosen.high, lambda) - mu) / sigma;
  const mass = normalCdf(zb) - normalCdf(za);
  return {
    lower: boxCoxInverseUnchecked(mu + normalQuantile(lowerP) * sigma, lambda),
    upper: boxCoxInverseUnchecked(mu + normalQuantile(upperP) * sigma, lambda),
    method: 'truncated-normal-box-cox',
    diagnostics: {
      n,
      lambda,
      mu,
      sigma,
      truncation: [chosen.low, chosen.high],
      fractionInTruncation: chosen.count / n,
      healthyFraction: chosen.count / mass / n,
      chiSquare: chosen.chiSquare,
      degreesOfFreedom: chosen.df,
      pValue: chosen.pValue,
      fitAccepted: widestAccepted !== null,
      resolution: Number(resolution.toPrecision(12)),
      candidates: best.size,
    },
  };
}

function normalPdf(z: number): number {
  return Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
}

/** Sufficient statistics of the transformed values between consecutive candidate edges, cumulated. */
function segmentSums(sorted: Float64Array, logs: Float64Array, edgeIndex: number[], lambda: number) {
  const center = boxCoxUnchecked(sorted[sorted.length >> 1], lambda);
  const k = edgeIndex.length;
  const count = new Float64Array(k);
  const s1 = new Float64Array(k);
  const s2 = new Float64Array(k);
  const sl = new Float64Array(k);
  let c = 0;
  let a1 = 0;
  let a2 = 0;
  let al = 0;
  let i = edgeIndex[0];
  for (let e = 0; e < k; e++) {
    const stop = edgeIndex[e];
    for (; i < stop; i++) {
      const l = logs[i];
      const y = (lambda === 0 ? l : Math.expm1(lambda * l) / lambda) - center; // grid λ is exactly 0 or |λ| ≥ 0.1
      c++;
      a1 += y;
      a2 += y * y;
      al += l;
    }
    count[e] = c;
    s1[e] = a1;
    s2[e] = a2;
    sl[e] = al;
  }
  return { center, count, s1, s2, sl };
}

/** Standardised truncated-normal mean and variance on [α, β). */
function truncatedMoments(
  alpha: number,
  beta: number,
): { mean: number; variance: number; mass: number } | null {
  const mass = normalCdf(beta) - normalCdf(alpha);
  if (!(mass > 1e-12)) return null;
  const pa = normalPdf(alpha);
  const pb = normalPdf(beta);
  const mean = (pa - pb) / mass;
  const second = 1 + (alpha * pa - beta * pb) / mass;
  return { mean, variance: second - mean * mean, mass };
}

/**
 * Maximum-likelihood mean and SD of a normal truncated to [a, b) from m, Σy, Σy².
 * The truncated normal is an exponential family, so the estimates match the sample mean and
 * variance (divisor m) to the truncated model's; solved by damped Newton steps in (μ, ln σ).
 */
function fitTruncatedNormal(m: number, s1: number, s2: number, a: number, b: number): Fit | null {
  const sampleMean = s1 / m;
  const sampleVariance = s2 / m - sampleMean * sampleMean;
  if (!(sampleVariance > 0)) return null;
  // A sample as spread as a uniform on [a, b) has no finite normal MLE.
  if (sampleVariance >= ((b - a) * (b - a)) / 12) return null;
  const scale = Math.sqrt(sampleVariance);
  const residual = (mu: number, logSigma: number): [number, number] | null => {
    const sigma = Math.exp(logSigma);
    const t = truncatedMoments((a - mu) / sigma, (b - mu) / sigma);
    if (!t) return null;
    return [(mu + sigma * t.mean - sampleMean) / scale, (sigma * sigma * t.variance) / sampleVariance - 1];
  };
  let mu = sampleMean;
  let logSigma = Math.log(scale);
  let r = residual(mu, logSigma);
  if (!r) return null;
  for (let iteration = 0; iteration < 100 && Math.hypot(r[0], r[1]) > 1e-12; iteration++) {
    const h = 1e-6;
    const rMu = residual(mu + h * scale, logSigma);
    const rSigma = residual(mu, logSigma + h);
    if (!rMu || !rSigma) return null;
    const j11 = (rMu[0] - r[0]) / h;
    const j21 = (rMu[1] - r[1]) / h;
    const j12 = (rSigma[0] - r[0]) / h;
    const j22 = (rSigma[1] - r[1]) / h;
    const det = j11 * j22 - j12 * j21;
    if (!(Math.abs(det) > 1e-300)) return null;
    const dMu = ((r[0] * j22 - r[1] * j12) / det) * scale;
    const dLogSigma = (r[1] * j11 - r[0] * j21) / det;
    // Damping: halve the step until the residual shrinks.
    let step = 1;
    let accepted = false;
    for (let halving = 0; halving < 30; halving++) {
      const next = residual(mu - step * dMu, logSigma - step * dLogSigma);
      if (next && Math.hypot(next[0], next[1]) < Math.hypot(r[0], r[1])) {
        mu -= step * dMu;
        logSigma -= step * dLogSigma;
        r = next;
        accepted = true;
        break;
      }
      step /= 2;
    }
    if (!accepted) break;
    if (logSigma > Math.log(scale) + 5) return null; // running off to an infinite SD
  }
  if (Math.hypot(r[0], r[1]) > 1e-6) return null;
  const sigma = Math.exp(logSigma);
  const t = truncatedMoments((a - mu) / sigma, (b - mu) / sigma)!;
  const squares = s2 - 2 * mu * s1 + m * mu * mu;
  return {
    mu,
    sigma,
    logLikelihood:
      -m * logSigma - squares / (2 * sigma * sigma) - m * Math.log(t.mass) - (m / 2) * Math.log(2 * Math.PI),
  };
}

/**
 * Goodness of fit of a candidate: chi-square of observed against expected counts in up to 20 bins
 * of equal expected count inside [low, high) (edges snapped to rounding cells), plus a one-sided
 * term for each side outside the interval where the healthy component predicts more values than
 * were observed (the pathological share cannot be negative). Null when the fit is implausible.
 */
function judge(
  sorted: Float64Array,
  resolution: number,
  candidate: { low: number; high: number; lambda: number; fit: Fit; count: number },
  n: number,
): { chiSquare: number; df: number } | null {
  const { low, high, lambda, fit, count } = candidate;
  const { mu, sigma } = fit;
  const cdfAt = (x: number) => normalCdf((boxCoxUnchecked(x, lambda) - mu) / sigma);
  const fLow = cdfAt(low);
  const fHigh = cdfAt(high);
  const mass = fHigh - fLow;
  if (!(mass > 0)) return null;
  const healthyTotal = count / mass;
  if (healthyTotal > n * 1.05) return null; // more healthy values predicted than there are values
  // Bins with equal expected counts inside the truncation interval.
  const bins = 20;
  const binEdges = [low];
  for (let j = 1; j < bins; j++) {
    const p = fLow + (mass * j) / bins;
    let x = boxCoxInverseUnchecked(mu + sigma * normalQuantile(p), lambda);
    if (resolution > 0) x = Math.round((x - low) / resolution) * resolution + low; // snap to cell boundaries
    if (x > binEdges[binEdges.length - 1] && x < high) binEdges.push(x);
  }
  binEdges.push(high);
  if (binEdges.length < 7) return null;
  let chiSquare = 0;
  let previousIndex = lowerBound(sorted, low);
  let previousCdf = fLow;
  for (let j = 1; j < binEdges.length; j++) {
    const index = lowerBound(sorted, binEdges[j]);
    const cdf = cdfAt(binEdges[j]);
    const expected = (count * (cdf - previousCdf)) / mass;
    const observed = index - previousIndex;
    chiSquare += (observed - expected) ** 2 / expected;
    previousIndex = index;
    previousCdf = cdf;
  }
  // Outside the interval the healthy component cannot exceed what was observed.
  let overshoot = 0;
  const belowObserved = lowerBound(sorted, low);
  const aboveObserved = n - lowerBound(sorted, high);
  for (const [expected, observed] of [
    [healthyTotal * fLow, belowObserved],
    [healthyTotal * (1 - fHigh), aboveObserved],
  ]) {
    if (expected > observed) overshoot += (expected - observed) ** 2 / expected;
  }
  // Degrees of freedom: bins − 1 − three fitted parameters (λ, μ, σ).
  return { chiSquare: chiSquare + overshoot, df: binEdges.length - 1 - 3 };
}

/** Rounding step of the values when they take few distinct values (ties), else 0. */
function roundingResolution(sorted: Float64Array): number {
  let distinct = 1;
  let smallestGap = Infinity;
  for (let i = 1; i < sorted.length; i++) {
    const gap = sorted[i] - sorted[i - 1];
    if (gap > 0) {
      distinct++;
      if (gap < smallestGap) smallestGap = gap;
    }
  }
  return distinct < sorted.length / 5 ? smallestGap : 0;
}

/** First index whose value is ≥ x. */
function lowerBound(sorted: Float64Array, x: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

function unique(values: number[]): number[] {
  return [...new Set(values)];
}
