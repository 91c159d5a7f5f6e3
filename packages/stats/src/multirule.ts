import { fail } from './validate.ts';

/** Rule names of the multirule procedure, in the order they are reported. */
export const MULTIRULE_RULES = ['1-2s', '1-3s', '2-2s', 'R-4s', '4-1s', '10-x'] as const;
export type MultiruleRule = (typeof MULTIRULE_RULES)[number];

/** One control value, in chronological order. */
export interface ControlPoint {
  run: string;
  level: number;
  value: number;
}

/** A control value with its z-score and the rules it takes part in violating. */
export interface EvaluatedPoint extends ControlPoint {
  z: number;
  rules: MultiruleRule[];
}

/** Verdict of one run. */
export interface RunVerdict {
  run: string;
  verdict: 'accept' | 'warn' | 'reject';
  rules: MultiruleRule[];
}

export interface MultiruleResult {
  points: EvaluatedPoint[];
  runs: RunVerdict[];
}

/**
 * Multirule evaluation of control values against target means and SDs (Levey-Jennings).
 * z = (value − target mean) / target SD; "beyond" is strict (a value exactly at 2s does not
 * violate). Rules:
 * - 1-2s (warning): |z| > 2. 1-3s: |z| > 3.
 * - 2-2s: two points beyond the same 2s limit — two points of different levels in one run,
 *   or two consecutive points of one level (across runs).
 * - R-4s: in one run, one point with z > 2 and another with z < −2.
 * - 4-1s: four consecutive points beyond the same 1s limit, within a level and across levels
 *   (all points in chronological order).
 * - 10-x: ten consecutive points on the same side of the mean (z = 0 breaks the sequence),
 *   within a level and across levels.
 * Every rule is checked for every run (the 1981 flowchart checks the others only after a 1-2s
 * warning; we do not). A rule is attached to the points of the violating group that belong to
 * the run in which the group is completed, so earlier runs are never changed afterwards. A run is
 * rejected on any rule other than 1-2s, warned on 1-2s alone, otherwise accepted.
 *
 * Source: Westgard JO, Barry PL, Hunt MR, Groth T. A multi-rule Shewhart chart for quality
 * control in clinical chemistry. Clin Chem 1981;27:493–501.
 *
 * @throws {Error} when a level has no target, a target SD is not greater than 0, a value is not
 *   finite, a run is empty-named, or a run's points are not contiguous.
 * @example
 * evaluateMultirule(
 *   [{ run: 'r1', level: 1, value: 104.5 }, { run: 'r1', level: 2, value: 209 }],
 *   { 1: { mean: 100, sd: 2 }, 2: { mean: 200, sd: 4 } },
 * ).runs;
 * // => [{ run: 'r1', verdict: 'reject', rules: ['1-2s', '2-2s'] }]
 */
export function evaluateMultirule(
  points: readonly ControlPoint[],
  targets: Readonly<Record<number, { mean: number; sd: number }>>,
): MultiruleResult {
  const fn = 'evaluateMultirule';
  if (!Array.isArray(points)) fail(fn, 'points must be an array');
  const evaluated: EvaluatedPoint[] = points.map((point, i) => {
    if (typeof point.run !== 'string' || point.run === '') fail(fn, `point ${i} has no run`);
    if (!Number.isFinite(point.value))
      fail(fn, `point ${i} (run '${point.run}') value is not a finite number`);
    const target = Object.hasOwn(targets, point.level) ? targets[point.level] : undefined;
    if (!target) fail(fn, `no target for level ${point.level} (point ${i}, run '${point.run}')`);
    if (!Number.isFinite(target.mean)) fail(fn, `target mean of level ${point.level} is not a finite number`);
    if (!(Number.isFinite(target.sd) && target.sd > 0)) {
      fail(fn, `target sd of level ${point.level} must be greater than 0, got ${target.sd}`);
    }
    return { ...point, z: (point.value - target.mean) / target.sd, rules: [] };
  });

  // Runs in order of first appearance; a run's points must be contiguous (chronological input).
  const runOrder: string[] = [];
  const runPoints = new Map<string, number[]>();
  evaluated.forEach((point, i) => {
    const current = runOrder[runOrder.length - 1];
    if (point.run !== current) {
      if (runPoints.has(point.run)) {
        fail(
          fn,
          `run '${point.run}' appears again at point ${i} after other runs; give points in chronological order`,
        );
      }
      runOrder.push(point.run);
      runPoints.set(point.run, []);
    }
    runPoints.get(point.run)!.push(i);
  });

  const ruleSets = evaluated.map(() => new Set<MultiruleRule>());
  // Attach a rule to the members of a violating group that lie in the run where it completes.
  const attach = (rule: MultiruleRule, group: number[], run: string) => {
    for (const i of group) if (evaluated[i].run === run) ruleSets[i].add(rule);
  };
  const sameSide = (group: number[], limit: number) =>
    group.every((i) => evaluated[i].z > limit) || group.every((i) => evaluated[i].z < -limit);

  const history: number[] = [];
  const levelHistory = new Map<number, number[]>();
  for (const run of runOrder) {
    const members = runPoints.get(run)!;
    for (const i of members) {
      const { z, level } = evaluated[i];
      if (Math.abs(z) > 2) ruleSets[i].add('1-2s');
      if (Math.abs(z) > 3) ruleSets[i].add('1-3s');

      history.push(i);
      const ofLevel = levelHistory.get(level) ?? [];
      ofLevel.push(i);
      levelHistory.set(level, ofLevel);

      // Consecutive points of one level (across runs, or replicates in one run).
      const lastTwo = ofLevel.slice(-2);
      if (lastTwo.length === 2 && sameSide(lastTwo, 2)) attach('2-2s', lastTwo, run);
      for (const sequence of [ofLevel, history]) {
        const lastFour = sequence.slice(-4);
        if (lastFour.length === 4 && sameSide(lastFour, 1)) attach('4-1s', lastFour, run);
        const lastTen = sequence.slice(-10);
        if (lastTen.length === 10 && sameSide(lastTen, 0)) attach('10-x', lastTen, run);
      }
    }

    // Within the run, across levels.
    const high = members.filter((i) => evaluated[i].z > 2);
    const low = members.filter((i) => evaluated[i].z < -2);
    for (const side of [high, low]) {
      const levels = new Set(side.map((i) => evaluated[i].level));
      if (levels.size >= 2) attach('2-2s', side, run);
    }
    if (high.length > 0 && low.length > 0) attach('R-4s', [...high, ...low], run);
  }

  const ordered = (rules: Set<MultiruleRule>) => MULTIRULE_RULES.filter((rule) => rules.has(rule));
  evaluated.forEach((point, i) => (point.rules = ordered(ruleSets[i])));
  const runs: RunVerdict[] = runOrder.map((run) => {
    const rules = new Set<MultiruleRule>();
    for (const i of runPoints.get(run)!) for (const rule of ruleSets[i]) rules.add(rule);
    const list = ordered(rules);
    const verdict = list.some((rule) => rule !== '1-2s') ? 'reject' : list.length > 0 ? 'warn' : 'accept';
    return { run, verdict, rules: list };
  });
  return { points: evaluated, runs };
}
