import { checkFinite, checkPositive, fail } from './validate.ts';

/**
 * Sigma metric of a procedure: σ = (TEa % − |bias %|) / CV %. Negative when the bias alone
 * exceeds the allowable total error.
 *
 * Source: Westgard JO, "Six Sigma quality design and control" (2001), as used in
 * Biochem Med 2018;28(2):020711; METHODS.md §3.
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
