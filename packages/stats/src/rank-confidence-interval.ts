import { checkInteger, checkProbability } from './validate.ts';

/**
 * Binomial(n, p) probabilities over the range that holds all but a negligible mass
 * (terms below 1e-20 of the largest are dropped). Built from the mode outwards with the ratio of
 * successive terms and normalised by their sum, so it needs no factorials and works for n = 10⁶.
 */
function binomialMass(n: number, p: number): { start: number; mass: Float64Array } {
  const mode = Math.min(n, Math.floor((n + 1) * p));
  const odds = p / (1 - p);
  const below: number[] = [];
  let term = 1;
  for (let k = mode; k > 0; k--) {
    term *= k / (n - k + 1) / odds; // P(k − 1) / P(k)
    if (term < 1e-20) break;
    below.push(term);
  }
  const above: number[] = [];
  term = 1;
  for (let k = mode; k < n; k++) {
    term *= ((n - k) / (k + 1)) * odds; // P(k + 1) / P(k)
    if (term < 1e-20) break;
    above.push(term);
  }
  const mass = new Float64Array(below.length + 1 + above.length);
  let i = 0;
  for (let j = below.length - 1; j >= 0; j--) mass[i++] = below[j];
  mass[i++] = 1;
  for (const t of above) mass[i++] = t;
  let total = 0;
  for (const t of mass) total += t;
  for (let j = 0; j < mass.length; j++) mass[j] /= total;
  return { start: mode - below.length, mass };
}

/**
 * Confidence interval of the p-quantile as 1-based ranks [r₁, r₂] of the ordered sample:
 * with B ~ Binomial(n, p), r₁ is the largest rank with P(B ≤ r₁ − 1) ≤ α/2 and r₂ the smallest
 * with P(B ≥ r₂) ≤ α/2 (α = 1 − confidence), so P(x₍ᵣ₁₎ ≤ quantile ≤ x₍ᵣ₂₎) ≥ confidence with at
 * most α/2 in each tail. Null when no such ranks exist (for p = 0.025 at 90 %: n < 119).
 *
 * Source: CLSI EP28-A3c (nonparametric confidence intervals of reference limits, table of ranks);
 * the order-statistic/binomial argument in e.g. Conover, Practical Nonparametric Statistics, §3.2.
 *
 * @throws {Error} when n is not an integer ≥ 1 or p or confidence is not strictly between 0 and 1.
 * @example
 * rankConfidenceInterval(120, 0.025); // => [1, 7]
 * rankConfidenceInterval(120, 0.975); // => [114, 120]
 */
export function rankConfidenceInterval(n: number, p: number, confidence = 0.9): [number, number] | null {
  const fn = 'rankConfidenceInterval';
  checkInteger(fn, 'n', n, 1);
  checkProbability(fn, 'p', p);
  checkProbability(fn, 'confidence', confidence);
  const tail = (1 - confidence) / 2;
  const { start, mass } = binomialMass(n, p);
  const end = start + mass.length - 1; // P(B = k) for k outside [start, end] is negligible

  // Largest r with P(B ≤ r − 1) ≤ tail: walk up the lower tail.
  let lowerRank = start; // P(B ≤ start − 1) is negligible
  let cumulative = 0;
  for (let k = start; k <= end; k++) {
    cumulative += mass[k - start];
    if (cumulative > tail) break;
    lowerRank = k + 1;
  }
  // Smallest r with P(B ≥ r) ≤ tail: walk down the upper tail.
  let upperRank = end + 1;
  cumulative = 0;
  for (let k = end; k >= start; k--) {
    cumulative += mass[k - start];
    if (cumulative > tail) break;
    upperRank = k;
  }
  if (lowerRank < 1 || upperRank > n) return null;
  return [lowerRank, upperRank];
}
