import { normalCdf } from './distributions.ts';
import { qcPlanPower, type QcPlanRule } from './qc-plan.ts';
import { checkFinite, checkPositive, fail } from './validate.ts';

/**
 * Critical systematic error ΔSEcrit = (TEa − |bias|)/CV − 1.65 = σ − 1.65: the shift, in SDs, that
 * would let 5 % of results exceed TEa (1.65 = one-sided 95 % normal quantile, rounded as published).
 *
 * Source: Westgard JO, Six Sigma Quality Design and Control, 2001 (from memory).
 * @example criticalSystematicError(10, 1, 1.5); // => 4.35
 */
export function criticalSystematicError(teaPct: number, biasPct: number, cvPct: number): number {
  const fn = 'criticalSystematicError';
  checkPositive(fn, 'teaPct', teaPct);
  checkFinite(fn, 'biasPct', biasPct);
  checkPositive(fn, 'cvPct', cvPct);
  return (teaPct - Math.abs(biasPct)) / cvPct - 1.65;
}

/** A candidate QC plan: rejection rules, controls per run, runs the rules span. */
export interface QcPlan {
  rules: QcPlanRule[];
  n: number;
  runs: number;
}

export interface EvaluatedQcPlan extends QcPlan {
  ped: number;
  pfr: number;
  /** 'closed form' for one 1-ks rule, else 'simulation'. */
  method: 'closed form' | 'simulation';
}

/** Settings of {@link recommendQcPlan}. */
export interface RecommendQcPlanOptions {
  /** Ped that a plan must reach at ΔSEcrit. Default 0.90. */
  minPed?: number;
  /** Pfr that a plan must not exceed. Default 0.05. */
  maxPfr?: number;
  /** Simulated run groups per multirule plan. Default 4,000 (Monte Carlo SE ≤ 0.008). */
  simulations?: number;
  seed?: number;
}

export interface QcPlanRecommendation {
  deltaSeCrit: number;
  /** The plan: fewest controls (n · runs) reaching the targets, or the most powerful when none does. */
  plan: EvaluatedQcPlan;
  /** Whether the plan reaches Ped ≥ minPed with Pfr ≤ maxPfr. */
  reached: boolean;
  explanation: string;
}

const SINGLE_RULES: Array<[QcPlanRule, number]> = [
  ['1-3.5s', 3.5],
  ['1-3s', 3],
  ['1-2.5s', 2.5],
];
/** 1-2s as a rejection rule: evaluated in closed form when a lab uses it, never recommended (Pfr ≈ 0.09 at N = 2). */
const ONE_2S: [QcPlanRule, number] = ['1-2s', 2];
const MULTIRULES: QcPlanRule[][] = [
  ['1-3s', '2-2s', 'R-4s'],
  ['1-3s', '2-2s', 'R-4s', '4-1s'],
  ['1-3s', '2-2s', 'R-4s', '4-1s', '10-x'],
];

/** Candidate plans: single rules 1-2.5s, 1-3s, 1-3.5s and three multirule sets, N = 1–4, R = 1–2. */
export function candidateQcPlans(): QcPlan[] {
  const plans: QcPlan[] = [];
  for (let runs = 1; runs <= 2; runs++) {
    for (let n = 1; n <= 4; n++) {
      for (const [rule] of SINGLE_RULES) plans.push({ rules: [rule], n, runs });
      for (const rules of MULTIRULES) plans.push({ rules, n, runs });
    }
  }
  return plans.sort((a, b) => a.n * a.runs - b.n * b.runs);
}

/**
 * Ped at `shift` and Pfr of a plan. One 1-ks rule: the closed form over the N·R values,
 * Pfr = 1 − (2Φ(k) − 1)^NR, Ped = 1 − (Φ(k − ΔSE) − Φ(−k − ΔSE))^NR (Westgard & Groth 1979, from
 * memory); otherwise `qcPlanPower`. Simulated Pfr are cached (they do not depend on the shift).
 */
export function evaluateQcPlan(plan: QcPlan, shift: number, simulations = 4000, seed = 1): EvaluatedQcPlan {
  const single =
    plan.rules.length === 1 ? [...SINGLE_RULES, ONE_2S].find(([rule]) => rule === plan.rules[0]) : undefined;
  if (single) {
    const k = single[1];
    const count = plan.n * plan.runs;
    const pfr = 1 - (2 * normalCdf(k) - 1) ** count;
    const ped = 1 - (normalCdf(k - shift) - normalCdf(-k - shift)) ** count;
    return { ...plan, ped, pfr, method: 'closed form' };
  }
  const { ped, pfr } = qcPlanPower({
    rules: plan.rules,
    n: plan.n,
    runs: plan.runs,
    shift,
    simulations,
    seed,
  });
  return { ...plan, ped, pfr, method: 'simulation' };
}

/** Of two plans with as many controls: a single rule first, then the lower Pfr. */
function better(a: EvaluatedQcPlan, b: EvaluatedQcPlan): boolean {
  const singleA = a.method === 'closed form';
  const singleB = b.method === 'closed form';
  if (singleA !== singleB) return singleA;
  return a.pfr < b.pfr;
}

/**
 * The QC plan with the fewest controls per run group (n · runs) whose Ped at ΔSEcrit is at least
 * `minPed` and whose Pfr is at most `maxPfr`; among plans with that many controls, a single rule before
 * a multirule (simpler, and its power is exact), then the lowest Pfr (i.e. the widest limits). When no candidate reaches the targets, the candidate with the
 * highest Ped among those within `maxPfr`, marked not reached.
 *
 * Source: Westgard JO, Six Sigma Quality Design and Control, 2001 (ΔSEcrit and the Ped 0.90 / Pfr
 * 0.05 targets, from memory); targets are settings.
 */
export function recommendQcPlan(sigma: number, options: RecommendQcPlanOptions = {}): QcPlanRecommendation {
  const fn = 'recommendQcPlan';
  checkFinite(fn, 'sigma', sigma);
  const minPed = options.minPed ?? 0.9;
  const maxPfr = options.maxPfr ?? 0.05;
  if (!(minPed > 0 && minPed < 1)) fail(fn, `minPed must be between 0 and 1, got ${minPed}`);
  if (!(maxPfr > 0 && maxPfr < 1)) fail(fn, `maxPfr must be between 0 and 1, got ${maxPfr}`);
  const deltaSeCrit = sigma - 1.65;
  const shift = Math.max(0, deltaSeCrit);
  let best: EvaluatedQcPlan | null = null;
  let bestTotal = Infinity;
  let strongest: EvaluatedQcPlan | null = null;
  for (const plan of candidateQcPlans()) {
    const total = plan.n * plan.runs;
    if (total > bestTotal) break;
    const evaluated = evaluateQcPlan(plan, shift, options.simulations, options.seed);
    if (evaluated.pfr > maxPfr) continue;
    if (!strongest || evaluated.ped > strongest.ped) strongest = evaluated;
    if (evaluated.ped < minPed) continue;
    if (!best || better(evaluated, best)) best = evaluated;
    bestTotal = total;
  }
  if (!strongest) fail(fn, `no candidate plan has Pfr ≤ ${maxPfr}`);
  const plan = best ?? strongest;
  const reached = best !== null;
  const describe = `${plan.rules.join('/')} with ${plan.n} control${plan.n > 1 ? 's' : ''} per run${plan.runs > 1 ? ` over ${plan.runs} runs` : ''}`;
  const figures = `Ped ${plan.ped.toFixed(2)} at ΔSEcrit ${deltaSeCrit.toFixed(2)}, Pfr ${plan.pfr.toFixed(3)}`;
  const explanation =
    deltaSeCrit <= 0
      ? `σ ${sigma.toFixed(1)}: below 1.65 sigma more than 5 % of results exceed TEa even without a shift, so no QC plan can make the procedure fit for purpose; improve its imprecision or bias. ${describe} is the most powerful candidate (${figures}).`
      : reached
        ? `σ ${sigma.toFixed(1)}: ${describe} is the plan with the fewest controls that detects the critical shift with probability ≥ ${minPed} and rejects good runs with probability ≤ ${maxPfr} (${figures}).`
        : `σ ${sigma.toFixed(1)}: no candidate plan reaches Ped ≥ ${minPed} with Pfr ≤ ${maxPfr}; ${describe} detects best (${figures}). Improve the procedure's imprecision or bias, or add controls and runs beyond the candidates.`;
  return { deltaSeCrit, plan, reached, explanation };
}
