import { checkFinite, checkPositive, fail } from './validate.ts';

/**
 * Sigma metric of a procedure: σ = (TEa % − |bias %|) / CV %. Negative when the bias alone
 * exceeds the allowable total error.
 *
 * Source: Westgard JO, "Six Sigma quality design and control" (2001), as used in
 * Biochem Med 2018;28(2):020711; docs/methods.md §3.
 *
 * @throws {Error} when TEa or CV is not greater than 0, or the bias is not finite.
 * @example
 * sigmaMetric(10, 1.7, 2.1); // => 3.9523809523809526
 */
export function sigmaMetric(teaPct: number, biasPct: number, cvPct: number): number {
  const fn = 'sigmaMetric';
  checkPositive(fn, 'teaPct', teaPct);
  checkFinite(fn, 'biasPct', biasPct);
  checkPositive(fn, 'cvPct', cvPct);
  return (teaPct - Math.abs(biasPct)) / cvPct;
}

/** A total allowable error rule: "± absolute (in the analyte's unit) or ± percent %, whichever is greater". */
export interface TeaRule {
  /** Absolute limit in the analyte's unit; null or absent when the rule has no absolute part. */
  absolute?: number | null;
  /** Percentage limit; null or absent when the rule has no percentage part. */
  percent?: number | null;
}

/** A total allowable error evaluated at one concentration. */
export interface EvaluatedTea {
  /** TEa in % of the concentration. */
  teaPct: number;
  /** TEa in the analyte's unit. */
  teaUnits: number;
  /** Which part of the rule gives the larger limit here ('both' when they are equal). */
  governing: 'absolute' | 'percent' | 'both';
}

/**
 * Evaluates a total allowable error rule at a concentration: the larger of the absolute limit and
 * the percentage of the concentration, in units and in %. A rule with one part is that part.
 * Percentages are taken of |concentration| (some quantities can be negative).
 *
 * Source: the form in which published rules state acceptance limits, e.g. the US CLIA proficiency
 * testing acceptance limits of the 2024 rule (42 CFR 493.931): "± X units or ± Y %, whichever is
 * greater"; docs/methods.md §3.
 *
 * @throws {Error} when neither part is given, a given part is not greater than 0, the concentration
 *   is not finite, or the concentration is 0 while the absolute part governs (no % exists).
 * @example
 * evaluateTea({ absolute: 6, percent: 8 }, 50); // glucose in mg/dL
 * // => { teaPct: 12, teaUnits: 6, governing: 'absolute' }
 */
export function evaluateTea(rule: TeaRule, concentration: number): EvaluatedTea {
  const fn = 'evaluateTea';
  const absolute = rule.absolute ?? null;
  const percent = rule.percent ?? null;
  if (absolute === null && percent === null)
    fail(fn, 'the rule has neither an absolute nor a percentage part');
  if (absolute !== null) checkPositive(fn, 'absolute', absolute);
  if (percent !== null) checkPositive(fn, 'percent', percent);
  checkFinite(fn, 'concentration', concentration);
  const level = Math.abs(concentration);
  const fromPercent = percent === null ? -1 : (percent * level) / 100;
  const fromAbsolute = absolute ?? -1;
  if (fromPercent >= fromAbsolute) {
    return {
      teaPct: percent!,
      teaUnits: fromPercent,
      governing: fromPercent === fromAbsolute ? 'both' : 'percent',
    };
  }
  if (level === 0) fail(fn, `concentration is 0, so the absolute limit ${absolute} has no value in %`);
  const teaPct = (100 * fromAbsolute) / level;
  checkFinite(fn, 'TEa %', teaPct);
  return { teaPct, teaUnits: fromAbsolute, governing: 'absolute' };
}

/** Quality level of a biological-variation specification. */
export type BiologicalVariationLevel = 'optimum' | 'desirable' | 'minimum';

/** Allowable imprecision, bias and total error, all in %. */
export interface BiologicalVariationSpecification {
  imprecisionPct: number;
  biasPct: number;
  teaPct: number;
}

// Multipliers of CV_I (imprecision) and of √(CV_I² + CV_G²) (bias) for each level (Fraser 2001).
const LEVEL_FACTORS: Record<BiologicalVariationLevel, { imprecision: number; bias: number }> = {
  optimum: { imprecision: 0.25, bias: 0.125 },
  desirable: { imprecision: 0.5, bias: 0.25 },
  minimum: { imprecision: 0.75, bias: 0.375 },
};

/**
 * Analytical performance specifications from biological variation: allowable imprecision
 * I = k_I · CV_I, allowable bias B = k_B · √(CV_I² + CV_G²), allowable total error
 * TEa = 1.65 · I + B. Desirable level: k_I = 0.5, k_B = 0.25 (optimum 0.25/0.125,
 * minimum 0.75/0.375).
 *
 * Source: Fraser CG, Biological Variation: From Principles to Practice (AACC Press 2001);
 * desirable formulas as read in Clin Chem 2005;51:450; optimum/minimum factors from memory.
 *
 * @throws {Error} when CV_I or CV_G is not greater than 0, or the level is unknown.
 * @example
 * teaFromBiologicalVariation(4.6, 5.6); // potassium
 * // => { imprecisionPct: 2.3, biasPct: 1.8117670931993435, teaPct: 5.606767093199343 }
 */
export function teaFromBiologicalVariation(
  cvWithinPct: number,
  cvBetweenPct: number,
  level: BiologicalVariationLevel = 'desirable',
): BiologicalVariationSpecification {
  const fn = 'teaFromBiologicalVariation';
  checkPositive(fn, 'cvWithinPct', cvWithinPct);
  checkPositive(fn, 'cvBetweenPct', cvBetweenPct);
  if (!Object.hasOwn(LEVEL_FACTORS, level)) {
    fail(fn, `unknown level '${String(level)}', expected optimum, desirable or minimum`);
  }
  const factors = LEVEL_FACTORS[level];
  const imprecisionPct = factors.imprecision * cvWithinPct;
  const biasPct = factors.bias * Math.hypot(cvWithinPct, cvBetweenPct);
  return { imprecisionPct, biasPct, teaPct: 1.65 * imprecisionPct + biasPct };
}
