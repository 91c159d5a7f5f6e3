import { checkFinite, checkInteger, checkPositive, fail } from './validate.ts';

/** Where a lab stands against its peers. */
export interface Standing {
  /** Standard deviation index (lab mean − peer mean) / peer SD. */
  sdi: number;
  /** Coefficient of variation ratio: lab CV / peer pooled within-lab CV. */
  cvr: number;
  /** 100 · (lab mean − peer mean) / peer mean. */
  biasPct: number;
}

/**
 * A lab's standing against its peer group: SDI = (lab mean − peer mean) / peer SD;
 * CVR = lab CV % / peer within-lab CV %; bias % = 100 · (lab mean − peer mean) / peer mean.
 *
 * Source: docs/methods.md §3 (definitions in common use in interlaboratory QC programmes).
 *
 * @throws {Error} when a figure is not finite, the lab's n < 2, its SD is negative, the lab or peer
 *   mean is 0, the peer SD or peer within-lab CV is not greater than 0, or the SDI, CVR or bias %
 *   would not be finite (overflow), naming the figure and the inputs.
 * @example
 * standing({ n: 20, mean: 102, sd: 3 }, { mean: 100, sd: 4, withinCv: 2.5 });
 * // => { sdi: 0.5, cvr: 1.1764705882352942, biasPct: 2 }
 */
export function standing(
  lab: { n: number; mean: number; sd: number },
  peer: { mean: number; sd: number; withinCv: number },
): Standing {
  const fn = 'standing';
  checkInteger(fn, 'lab n', lab.n, 2);
  checkFinite(fn, 'lab mean', lab.mean);
  checkFinite(fn, 'lab sd', lab.sd);
  if (lab.sd < 0) fail(fn, `lab sd must not be negative, got ${lab.sd}`);
  if (lab.mean === 0) fail(fn, 'lab mean is 0, so its CV is undefined');
  checkFinite(fn, 'peer mean', peer.mean);
  if (peer.mean === 0) fail(fn, 'peer mean is 0, so the bias % is undefined');
  checkPositive(fn, 'peer sd', peer.sd);
  checkPositive(fn, 'peer withinCv', peer.withinCv);
  const labCv = (100 * lab.sd) / Math.abs(lab.mean);
  const sdi = (lab.mean - peer.mean) / peer.sd;
  const cvr = labCv / peer.withinCv;
  const biasPct = (100 * (lab.mean - peer.mean)) / peer.mean;
  // Finite inputs can still overflow, e.g. a huge mean difference over a tiny peer SD.
  const inputs = `lab mean ${lab.mean}, lab sd ${lab.sd}, peer mean ${peer.mean}, peer sd ${peer.sd}, peer withinCv ${peer.withinCv}`;
  if (!Number.isFinite(sdi)) fail(fn, `SDI is not finite (${sdi}) for ${inputs}`);
  if (!Number.isFinite(cvr)) fail(fn, `CVR is not finite (${cvr}) for ${inputs}`);
  if (!Number.isFinite(biasPct)) fail(fn, `bias % is not finite (${biasPct}) for ${inputs}`);
  return { sdi, cvr, biasPct };
}

/** Flag of a figure, from best to worst. */
export type Flag = 'fine' | 'acceptable' | 'warning' | 'action';

/** Upper bounds (inclusive) of the fine, acceptable and warning bands; above `warning` is action. */
export interface FlagThresholds {
  fine: number;
  acceptable: number;
  warning: number;
}

/** |SDI| ≤ 1 fine, ≤ 2 acceptable, ≤ 3 warning, > 3 action (common practice, no single source). */
export const DEFAULT_SDI_THRESHOLDS: Readonly<FlagThresholds> = Object.freeze({
  fine: 1,
  acceptable: 2,
  warning: 3,
});

/** CVR ≤ 1 fine, ≤ 1.5 acceptable, ≤ 2 warning, > 2 action (common practice, no single source). */
export const DEFAULT_CVR_THRESHOLDS: Readonly<FlagThresholds> = Object.freeze({
  fine: 1,
  acceptable: 1.5,
  warning: 2,
});

function classify(fn: string, value: number, thresholds: FlagThresholds): Flag {
  checkFinite(fn, 'value', value);
  const { fine, acceptable, warning } = thresholds;
  checkFinite(fn, 'thresholds.fine', fine);
  checkFinite(fn, 'thresholds.acceptable', acceptable);
  checkFinite(fn, 'thresholds.warning', warning);
  if (!(0 <= fine && fine <= acceptable && acceptable <= warning)) {
    fail(
      fn,
      `thresholds must satisfy 0 ≤ fine ≤ acceptable ≤ warning, got ${fine}, ${acceptable}, ${warning}`,
    );
  }
  if (value <= fine) return 'fine';
  if (value <= acceptable) return 'acceptable';
  if (value <= warning) return 'warning';
  return 'action';
}

/**
 * Flag an SDI by its absolute value: ≤ fine → 'fine', ≤ acceptable → 'acceptable',
 * ≤ warning → 'warning', above → 'action'. A value exactly on a bound takes the better flag.
 *
 * Source: docs/methods.md §3 — common practice, no single published source; thresholds are settings.
 *
 * @throws {Error} when the SDI is not finite or the thresholds are not ordered.
 * @example
 * classifySdi(-2.4); // => 'warning'
 */
export function classifySdi(sdi: number, thresholds: FlagThresholds = DEFAULT_SDI_THRESHOLDS): Flag {
  checkFinite('classifySdi', 'sdi', sdi);
  return classify('classifySdi', Math.abs(sdi), thresholds);
}

/**
 * Flag a CVR: ≤ fine → 'fine', ≤ acceptable → 'acceptable', ≤ warning → 'warning', above → 'action'.
 *
 * Source: docs/methods.md §3 — common practice, no single published source; thresholds are settings.
 *
 * @throws {Error} when the CVR is negative or not finite, or the thresholds are not ordered.
 * @example
 * classifyCvr(1.2); // => 'acceptable'
 */
export function classifyCvr(cvr: number, thresholds: FlagThresholds = DEFAULT_CVR_THRESHOLDS): Flag {
  checkFinite('classifyCvr', 'cvr', cvr);
  if (cvr < 0) fail('classifyCvr', `cvr must not be negative, got ${cvr}`);
  return classify('classifyCvr', cvr, thresholds);
}
