// Test-only reference: the first, straightforward implementation of evaluateMultirule (it takes a
// slice and a Set per point). It is kept, unchanged apart from its name, to check that the O(1)-per-point
// implementation in src/multirule.ts gives exactly the same points, rules, verdicts and errors.
import { fail } from '../../src/validate.ts';
import {
  MULTIRULE_RULES,
  type ControlPoint,
  type EvaluatedPoint,
  type MultiruleResult,
  type MultiruleRule,
  type RunVerdict,
} from '../../src/multirule.ts';

export function evaluateMultiruleReference(
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
    return { ...point, z: onLimitOr(point.value, target.mean, target.sd), rules: [] };
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

/** z, or the limit k (0, ±1, ±2, ±3) when value lies on mean + k·sd within a relative 1e-9 (decimal inputs). */
function onLimitOr(value: number, mean: number, sd: number): number {
  for (const k of [0, 1, -1, 2, -2, 3, -3]) {
    const limit = mean + k * sd;
    const scale = Math.max(Math.abs(value), Math.abs(mean), Math.abs(k * sd));
    if (Math.abs(value - limit) <= 1e-9 * scale) return k;
  }
  return (value - mean) / sd;
}
