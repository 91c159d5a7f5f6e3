import { algorithmA, algorithmAStart } from './robust-mean-sd.ts';
import { pool } from './pool.ts';
import { checkInteger, fail } from './validate.ts';

/** One member lab's summary for the period. */
export interface LabSummary {
  id: string;
  n: number;
  mean: number;
  sd: number;
}

/** Options of {@link peerStatistics}. */
export interface PeerStatisticsOptions {
  /** Fewest labs that must remain for the figures to be published (default 3). */
  minLabs?: number;
  /** Labs excluded by the coordinator; ids not present are ignored. */
  excludeIds?: readonly string[];
  /** Fewest labs for the Algorithm A outlier screen to run (default 5); below it no lab is excluded as an outlier. */
  minLabsForScreening?: number;
}

/** A lab left out of the peer figures and why. */
export interface PeerExclusion {
  id: string;
  reason: 'outlier' | 'manual';
}

/** Peer-group figures for one group, control lot, level and period. */
export interface PeerStatistics {
  /** Number of labs in the figures (after exclusions). */
  labs: number;
  /** Number of values in the figures. */
  n: number;
  /** n-weighted mean of the remaining labs' means. */
  mean: number;
  /** Total SD of the remaining labs' data by the pooling formula. */
  sd: number;
  /** 100 · sd / mean. */
  cv: number;
  /** Pooled within-lab SD √(Σ(nᵢ − 1)sᵢ² / Σ(nᵢ − 1)). */
  withinSd: number;
  /** 100 · withinSd / mean. */
  withinCv: number;
  /** Algorithm A robust mean x* of the lab means (after manual exclusions). */
  robustMean: number;
  /** Algorithm A robust SD s* of the lab means: the between-lab robust SD. */
  robustSd: number;
  excluded: PeerExclusion[];
  /** True when at least minLabs labs remain. */
  sufficient: boolean;
}

export const DEFAULT_MIN_LABS = 3;
export const DEFAULT_MIN_LABS_FOR_SCREENING = 5;
/**
 * In groups of at least 3 labs, a lab mean further than this many scale units from the median of
 * the lab means is a gross error (e.g. a unit or decimal-point mistake) and is left out before
 * Algorithm A; the scale is the larger of 1.483 · MAD of the means and the median within-lab SD.
 */
export const GROSS_ERROR_FACTOR = 10;

/**
 * Peer-group statistics from member labs' summaries (docs/methods.md §2).
 *
 * 1. Labs in `excludeIds` are left out with reason 'manual'.
 * 2. Algorithm A (ISO 13528) gives the robust mean x* and robust SD s* of the remaining lab
 *    means; a lab whose mean lies strictly outside x* ± 3s* is left out with reason 'outlier'.
 *    This screen runs only with at least `minLabsForScreening` labs (default 5: with 4 labs, one
 *    far lab breaks Algorithm A down to the plain mean and SD), only when s* > 0 (s* falls back to
 *    the mean-absolute-deviation scale when more than half the means are equal, see
 *    robustMeanSd) and only when Algorithm A converged. Before Algorithm A, with at least 3 labs,
 *    a gross-error screen (median ± GROSS_ERROR_FACTOR · scale, see below) leaves out absurd
 *    means, so with 3–4 labs, or several absurd labs, the figures cannot be carried to infinity;
 *    x* and s* are those of the labs that pass it.
 * 3. Peer mean = Σnᵢx̄ᵢ / Σnᵢ; peer SD = total SD by the pooling formula (within-lab plus
 *    between-lab); pooled within-lab SD and CV; `sufficient` = at least `minLabs` labs remain.
 * With one lab remaining, robustSd is NaN; with none, every figure is NaN; the CVs are NaN when
 * the peer mean is 0. No figure is ever ±Infinity: that throws, naming the figure.
 *
 * Source: ISO 13528:2015 Annex C.3 (Algorithm A); the x* ± 3s* limit mirrors the standard's
 * |z| > 3 action signal (docs/methods.md §2); pooling as in {@link pool}.
 *
 * @throws {Error} when `labs` is empty, an id is empty or repeated, a lab has n < 2, a non-finite
 *   mean, a negative or non-finite SD, the options are invalid, or a figure would not be finite
 *   (e.g. two labs whose means are too far apart for their squares to be held).
 * @example
 * peerStatistics([
 *   { id: 'a', n: 20, mean: 5.0, sd: 0.1 }, { id: 'b', n: 20, mean: 5.1, sd: 0.1 },
 *   { id: 'c', n: 20, mean: 4.9, sd: 0.1 }, { id: 'd', n: 20, mean: 5.05, sd: 0.1 },
 *   { id: 'e', n: 20, mean: 7.0, sd: 0.1 },
 * ]).excluded;
 * // => [{ id: 'e', reason: 'outlier' }]
 */
export function peerStatistics(
  labs: readonly LabSummary[],
  options: PeerStatisticsOptions = {},
): PeerStatistics {
  const fn = 'peerStatistics';
  if (!Array.isArray(labs) || labs.length === 0) fail(fn, 'needs at least 1 lab, got 0');
  const minLabs = options.minLabs ?? DEFAULT_MIN_LABS;
  const minLabsForScreening = options.minLabsForScreening ?? DEFAULT_MIN_LABS_FOR_SCREENING;
  checkInteger(fn, 'minLabs', minLabs, 1);
  checkInteger(fn, 'minLabsForScreening', minLabsForScreening, 3);
  const seen = new Set<string>();
  // Conditions are tested inline so that messages are only built on failure (hot path).
  for (let i = 0; i < labs.length; i++) {
    const { id, n, mean, sd } = labs[i];
    if (typeof id !== 'string' || id === '') fail(fn, `lab ${i} has no id`);
    if (seen.has(id)) fail(fn, `lab id '${id}' appears more than once`);
    seen.add(id);
    if (!Number.isInteger(n) || n < 2) fail(fn, `lab '${id}' n must be an integer of at least 2, got ${n}`);
    if (!Number.isFinite(mean)) fail(fn, `lab '${id}' mean must be a finite number, got ${mean}`);
    if (!Number.isFinite(sd)) fail(fn, `lab '${id}' sd must be a finite number, got ${sd}`);
    if (sd < 0) fail(fn, `lab '${id}' sd must not be negative, got ${sd}`);
  }

  const manual = new Set(options.excludeIds ?? []);
  const excluded: PeerExclusion[] = [];
  const candidates: LabSummary[] = [];
  for (const lab of labs) {
    if (manual.has(lab.id)) excluded.push({ id: lab.id, reason: 'manual' });
    else candidates.push(lab);
  }

  let robustMean = Number.NaN;
  let robustSd = Number.NaN;
  let kept = candidates.length >= 3 ? screenGrossErrors(candidates, excluded) : candidates;
  if (kept.length === 1) {
    robustMean = kept[0].mean;
  } else if (kept.length >= 2) {
    const means = new Float64Array(kept.length);
    for (let i = 0; i < kept.length; i++) means[i] = kept[i].mean;
    const robust = algorithmA(means, 1e-10, 1000);
    robustMean = robust.mean;
    robustSd = robust.sd;
    if (kept.length >= minLabsForScreening && robustSd > 0 && robust.converged) {
      const low = robustMean - 3 * robustSd;
      const high = robustMean + 3 * robustSd;
      const screened: LabSummary[] = [];
      for (const lab of kept) {
        if (lab.mean < low || lab.mean > high) excluded.push({ id: lab.id, reason: 'outlier' });
        else screened.push(lab);
      }
      kept = screened;
    }
  }
  checkFigure(fn, 'robust mean x*', robustMean, candidates);
  checkFigure(fn, 'robust SD s*', robustSd, candidates);

  const base = { robustMean, robustSd, excluded, sufficient: kept.length >= minLabs };
  if (kept.length === 0) {
    const nan = Number.NaN;
    return { labs: 0, n: 0, mean: nan, sd: nan, cv: nan, withinSd: nan, withinCv: nan, ...base };
  }
  let pooled: ReturnType<typeof pool>;
  try {
    pooled = pool(kept);
  } catch (error) {
    fail(fn, `peer mean and SD cannot be computed: ${(error as Error).message}`);
  }
  // A CV is undefined when the peer mean is 0 (possible where results can be negative): NaN, as in summarize.
  const cv = pooled.mean === 0 ? Number.NaN : (100 * pooled.sd) / pooled.mean;
  const withinCv = pooled.mean === 0 ? Number.NaN : (100 * pooled.withinSd) / pooled.mean;
  if (pooled.mean !== 0) {
    checkFigure(fn, 'peer CV', cv, kept);
    checkFigure(fn, 'peer within-lab CV', withinCv, kept);
  }
  return {
    labs: kept.length,
    n: pooled.n,
    mean: pooled.mean,
    sd: pooled.sd,
    cv,
    withinSd: pooled.withinSd,
    withinCv,
    ...base,
  };
}

/**
 * Gross-error screen, run before Algorithm A on every group of at least 3 labs: a lab whose mean lies
 * further than GROSS_ERROR_FACTOR · scale from the median of the means is left out as an outlier
 * (pushed onto `excluded`). scale = max(1.483 · MAD of the means, median lab SD), or the mean
 * absolute deviation scale when both are 0. The MAD cannot be moved by absurd means while they are
 * fewer than half, and the within-lab SD floor keeps two nearly equal means from making a genuine
 * third lab look far away. Needed because Algorithm A breaks down with 3–4 labs and one far mean,
 * and its mean-absolute-deviation fallback (most means equal) is inflated by several far means.
 */
function screenGrossErrors(labs: readonly LabSummary[], excluded: PeerExclusion[]): LabSummary[] {
  const start = algorithmAStart(labs.map((lab) => lab.mean));
  const sds = Float64Array.from(labs, (lab) => lab.sd).sort();
  const middle = sds.length >> 1;
  const medianSd = sds.length % 2 === 1 ? sds[middle] : (sds[middle - 1] + sds[middle]) / 2;
  // The MAD-based scale, not its mean-absolute-deviation fallback: far values inflate the fallback.
  let scale = Math.max(start.madSd, medianSd);
  if (scale === 0) scale = start.sd; // no spread within labs and most means equal
  if (scale === 0) return [...labs]; // every mean equal
  const limit = GROSS_ERROR_FACTOR * scale;
  const kept: LabSummary[] = [];
  for (const lab of labs) {
    if (Math.abs(lab.mean - start.mean) > limit) excluded.push({ id: lab.id, reason: 'outlier' });
    else kept.push(lab);
  }
  return kept;
}

/** Throws when a computed figure is ±Infinity (NaN means "not defined" and is allowed), naming it and the labs' largest mean. */
function checkFigure(fn: string, figure: string, value: number, labs: readonly LabSummary[]): void {
  if (Number.isFinite(value) || Number.isNaN(value)) return;
  let largest = labs[0];
  for (const lab of labs) if (Math.abs(lab.mean) > Math.abs(largest.mean)) largest = lab;
  fail(
    fn,
    `${figure} is not finite (${value}): the labs' figures are too large or too far apart to combine ` +
      `(largest mean ${largest.mean} from lab '${largest.id}')`,
  );
}

/** One peer tier with its member labs, narrowest first when passed to {@link selectPeerTier}. */
export interface PeerTier<T extends string = string> {
  tier: T;
  labs: readonly LabSummary[];
}

/** The tier whose figures are published, and the narrower tiers passed over. */
export interface PeerTierChoice<T extends string = string> {
  tier: T;
  statistics: PeerStatistics;
  /** Narrower tiers skipped because too few labs remained (or they had no labs). */
  skipped: { tier: T; labs: number }[];
}

/**
 * Peer figures from the narrowest tier that keeps at least `minLabs` labs after exclusions,
 * e.g. [instrument model + method + reagent, method principle, all procedures for the analyte].
 * When no tier is sufficient, the broadest tier with labs is returned with `sufficient: false`.
 *
 * Source: docs/methods.md §2 (tier fallback), a choice of this service (no published source).
 *
 * @throws {Error} when no tier has any lab, or as {@link peerStatistics}.
 * @example
 * selectPeerTier([
 *   { tier: 'instrument', labs: [{ id: 'a', n: 20, mean: 5, sd: 0.1 }] },
 *   { tier: 'method', labs: [
 *     { id: 'a', n: 20, mean: 5, sd: 0.1 }, { id: 'b', n: 20, mean: 5.1, sd: 0.1 },
 *     { id: 'c', n: 20, mean: 4.9, sd: 0.1 } ] },
 * ]).tier;
 * // => 'method'
 */
export function selectPeerTier<T extends string>(
  tiers: readonly PeerTier<T>[],
  options: PeerStatisticsOptions = {},
): PeerTierChoice<T> {
  const skipped: { tier: T; labs: number }[] = [];
  let broadest: { tier: T; statistics: PeerStatistics; skippedIndex: number } | null = null;
  for (const { tier, labs } of tiers) {
    if (labs.length === 0) {
      skipped.push({ tier, labs: 0 });
      continue;
    }
    const statistics = peerStatistics(labs, options);
    if (statistics.sufficient) return { tier, statistics, skipped };
    broadest = { tier, statistics, skippedIndex: skipped.length };
    skipped.push({ tier, labs: statistics.labs });
  }
  if (!broadest) fail('selectPeerTier', 'needs at least 1 tier with labs');
  // The tier returned is not one of the skipped ones.
  skipped.splice(broadest.skippedIndex, 1);
  return { tier: broadest.tier, statistics: broadest.statistics, skipped };
}
