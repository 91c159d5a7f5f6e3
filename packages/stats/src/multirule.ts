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
 * An earlier control value that was already evaluated (e.g. the previous month's), given by its
 * z-score against the target it was evaluated with, in chronological order. It extends the 2-2s
 * (across runs), 4-1s and 10-x sequences into the new points but gets no rule itself.
 */
export interface HistoryPoint {
  level: number;
  z: number;
}

/** Options of {@link evaluateMultirule}. */
export interface MultiruleOptions {
  /** Earlier evaluated values, oldest first, that come just before `points`. */
  history?: readonly HistoryPoint[];
}

/**
 * Multirule evaluation of control values against target means and SDs (Levey-Jennings).
 * z = (value − target mean) / target SD; "beyond" is strict (a value exactly at 2s does not
 * violate), and a value within a relative 1e-9 of a limit (0, ±1s, ±2s, ±3s) is taken as on it,
 * with z set to that whole number, so decimal inputs are not pushed beyond by binary rounding.
 * Rules:
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
 * `options.history` (earlier evaluated values, e.g. the previous month's, by their stored z) lets
 * 2-2s across runs, 4-1s and 10-x sequences span the boundary; a sequence is reported only when it
 * is completed by a new point, so a violation already reported among the earlier values is not
 * reported again.
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
  options: MultiruleOptions = {},
): MultiruleResult {
  const fn = 'evaluateMultirule';
  if (!Array.isArray(points)) fail(fn, 'points must be an array');
  const history = options.history ?? [];
  if (!Array.isArray(history)) fail(fn, 'history must be an array');
  for (let i = 0; i < history.length; i++) {
    if (!Number.isFinite(history[i].z)) fail(fn, `history point ${i} z is not a finite number`);
  }
  const count = points.length;

  // z of every point; each level's target is checked once, at its first point.
  const z = new Float64Array(count);
  const checkedTargets = new Map<number, { mean: number; sd: number }>();
  for (let i = 0; i < count; i++) {
    const point = points[i];
    if (typeof point.run !== 'string' || point.run === '') fail(fn, `point ${i} has no run`);
    if (!Number.isFinite(point.value))
      fail(fn, `point ${i} (run '${point.run}') value is not a finite number`);
    let target = checkedTargets.get(point.level);
    if (target === undefined) {
      target = Object.hasOwn(targets, point.level) ? targets[point.level] : undefined;
      if (!target) fail(fn, `no target for level ${point.level} (point ${i}, run '${point.run}')`);
      if (!Number.isFinite(target.mean))
        fail(fn, `target mean of level ${point.level} is not a finite number`);
      if (!(Number.isFinite(target.sd) && target.sd > 0)) {
        fail(fn, `target sd of level ${point.level} must be greater than 0, got ${target.sd}`);
      }
      checkedTargets.set(point.level, target);
    }
    z[i] = zScore(point.value, target.mean, target.sd);
  }

  // Runs in order of first appearance, as [start, end) index ranges; a run's points must be
  // contiguous (chronological input).
  const runNames: string[] = [];
  const runStarts: number[] = [];
  const seenRuns = new Set<string>();
  for (let i = 0; i < count; i++) {
    const run = points[i].run;
    if (i > 0 && run === points[i - 1].run) continue;
    if (seenRuns.has(run)) {
      fail(
        fn,
        `run '${run}' appears again at point ${i} after other runs; give points in chronological order`,
      );
    }
    seenRuns.add(run);
    runNames.push(run);
    runStarts.push(i);
  }
  runStarts.push(count);

  // Rules of each point as bits of RULE_BIT. A rule is attached only to points of the run in which
  // the violating group completes, i.e. points with an index at or after that run's start.
  const ruleBits = new Uint8Array(count);
  const all = new Streak();
  const byLevel = new Map<number, Streak>();
  // Earlier values only extend the sequences: index -1 lies before every run, so no rule is attached
  // to them, and a group completed among them alone was reported when they were evaluated.
  for (const { level, z: zh } of history) {
    let ofLevel = byLevel.get(level);
    if (ofLevel === undefined) {
      ofLevel = new Streak();
      byLevel.set(level, ofLevel);
    }
    ofLevel.add(-1, zh);
    all.add(-1, zh);
  }
  const attachToLatest = (streak: Streak, length: number, bit: number, runStart: number) => {
    for (let back = 1; back <= length; back++) {
      const index = streak.latest(back);
      if (index < runStart) break;
      ruleBits[index] |= bit;
    }
  };

  for (let r = 0; r < runNames.length; r++) {
    const runStart = runStarts[r];
    const runEnd = runStarts[r + 1];
    // Within the run, across levels: which sides beyond 2s have points, and of how many levels.
    let highCount = 0;
    let lowCount = 0;
    let highLevel = 0;
    let lowLevel = 0;
    let highLevels = 0;
    let lowLevels = 0;

    for (let i = runStart; i < runEnd; i++) {
      const zi = z[i];
      const level = points[i].level;
      if (Math.abs(zi) > 2) ruleBits[i] |= RULE_BIT['1-2s'];
      if (Math.abs(zi) > 3) ruleBits[i] |= RULE_BIT['1-3s'];

      let ofLevel = byLevel.get(level);
      if (ofLevel === undefined) {
        ofLevel = new Streak();
        byLevel.set(level, ofLevel);
      }
      ofLevel.add(i, zi);
      all.add(i, zi);

      // Consecutive points of one level (across runs, or replicates in one run).
      if (ofLevel.beyond2 >= 2) attachToLatest(ofLevel, 2, RULE_BIT['2-2s'], runStart);
      // Four beyond 1s and ten on one side: within the level and across levels.
      if (ofLevel.beyond1 >= 4) attachToLatest(ofLevel, 4, RULE_BIT['4-1s'], runStart);
      if (ofLevel.sameSide >= 10) attachToLatest(ofLevel, 10, RULE_BIT['10-x'], runStart);
      if (all.beyond1 >= 4) attachToLatest(all, 4, RULE_BIT['4-1s'], runStart);
      if (all.sameSide >= 10) attachToLatest(all, 10, RULE_BIT['10-x'], runStart);

      if (zi > 2) {
        if (highCount === 0) {
          highLevel = level;
          highLevels = 1;
        } else if (highLevels === 1 && !sameLevel(level, highLevel)) highLevels = 2;
        highCount += 1;
      } else if (zi < -2) {
        if (lowCount === 0) {
          lowLevel = level;
          lowLevels = 1;
        } else if (lowLevels === 1 && !sameLevel(level, lowLevel)) lowLevels = 2;
        lowCount += 1;
      }
    }

    const highBits = (highLevels >= 2 ? RULE_BIT['2-2s'] : 0) | (lowCount > 0 ? RULE_BIT['R-4s'] : 0);
    const lowBits = (lowLevels >= 2 ? RULE_BIT['2-2s'] : 0) | (highCount > 0 ? RULE_BIT['R-4s'] : 0);
    if (highBits !== 0 || lowBits !== 0) {
      for (let i = runStart; i < runEnd; i++) {
        if (z[i] > 2) ruleBits[i] |= highBits;
        else if (z[i] < -2) ruleBits[i] |= lowBits;
      }
    }
  }

  const evaluated: EvaluatedPoint[] = new Array(count);
  for (let i = 0; i < count; i++) {
    evaluated[i] = withResult(points[i], z[i], rulesOf(ruleBits[i]));
  }
  const runs: RunVerdict[] = new Array(runNames.length);
  for (let r = 0; r < runNames.length; r++) {
    let bits = 0;
    for (let i = runStarts[r]; i < runStarts[r + 1]; i++) bits |= ruleBits[i];
    const list = rulesOf(bits);
    const verdict = (bits & ~RULE_BIT['1-2s']) !== 0 ? 'reject' : bits !== 0 ? 'warn' : 'accept';
    runs[r] = { run: runNames[r], verdict, rules: list };
  }
  return { points: evaluated, runs };
}

/**
 * Relative tolerance of the limit comparison. Control values and targets are decimal numbers that
 * binary floating point cannot hold exactly: with mean 4.1 and SD 0.15, the value 4.4 lies exactly
 * at +2 SD, yet (4.4 − 4.1) / 0.15 computes to 2.0000000000000018. A value within this fraction
 * of the magnitudes involved from a limit counts as on the limit (far below any reported digit).
 */
export const MULTIRULE_LIMIT_TOLERANCE = 1e-9;

/**
 * z = (value − mean) / sd, snapped to the whole number k in −3…3 when value − mean differs from
 * k · sd by no more than the tolerance relative to max(|value|, |mean|, |k · sd|), so that a value
 * on a limit written in decimal is on it and not beyond it by rounding.
 */
function zScore(value: number, mean: number, sd: number): number {
  const difference = value - mean;
  const z = difference / sd;
  const k = Math.round(z);
  if (Math.abs(k) > 3) return z;
  const scale = Math.max(Math.abs(value), Math.abs(mean), Math.abs(k * sd));
  if (Math.abs(difference - k * sd) > MULTIRULE_LIMIT_TOLERANCE * scale) return z;
  return k === 0 ? 0 : k; // never -0
}

/** One bit per rule, in reporting order. */
const RULE_BIT: Readonly<Record<MultiruleRule, number>> = {
  '1-2s': 1,
  '1-3s': 2,
  '2-2s': 4,
  'R-4s': 8,
  '4-1s': 16,
  '10-x': 32,
};

/** The rules of a bit set, in reporting order (a new array each time: callers may change it). */
function rulesOf(bits: number): MultiruleRule[] {
  if (bits === 0) return [];
  return MULTIRULE_RULES.filter((rule) => (bits & RULE_BIT[rule]) !== 0);
}

/**
 * `{ ...point, z, rules }`. A point with just run, level and value is copied field by field, which
 * gives the same object and is many times faster than the spread of an object with a double field.
 */
function withResult(point: ControlPoint, z: number, rules: MultiruleRule[]): EvaluatedPoint {
  const keys = Object.keys(point);
  if (
    keys.length === 3 &&
    keys[0] === 'run' &&
    keys[1] === 'level' &&
    keys[2] === 'value' &&
    Object.getOwnPropertySymbols(point).length === 0
  ) {
    return { run: point.run, level: point.level, value: point.value, z, rules };
  }
  return { ...point, z, rules };
}

/** Level equality as a Map or Set sees it (NaN equals NaN). */
const sameLevel = (a: number, b: number) => a === b || (a !== a && b !== b);

/**
 * Running counts over a sequence of points (all points, or one level's): how many of the latest
 * points in a row lie beyond the same 2s limit, beyond the same 1s limit, and on the same side of
 * the mean, and the indices of the latest ten points. A rule over the last k points holds exactly
 * when its count is at least k, so each point costs O(1).
 */
class Streak {
  beyond2 = 0;
  beyond1 = 0;
  sameSide = 0;
  private above2 = 0;
  private below2 = 0;
  private above1 = 0;
  private below1 = 0;
  private above0 = 0;
  private below0 = 0;
  private readonly recent = new Int32Array(10);
  private size = 0;
  private next = 0;

  add(index: number, z: number): void {
    this.above2 = z > 2 ? this.above2 + 1 : 0;
    this.below2 = z < -2 ? this.below2 + 1 : 0;
    this.above1 = z > 1 ? this.above1 + 1 : 0;
    this.below1 = z < -1 ? this.below1 + 1 : 0;
    this.above0 = z > 0 ? this.above0 + 1 : 0;
    this.below0 = z < 0 ? this.below0 + 1 : 0;
    this.beyond2 = Math.max(this.above2, this.below2);
    this.beyond1 = Math.max(this.above1, this.below1);
    this.sameSide = Math.max(this.above0, this.below0);
    this.recent[this.next] = index;
    this.next = (this.next + 1) % 10;
    if (this.size < 10) this.size += 1;
  }

  /** Index of the point `back` places from the end (1 = the latest), or -1 when there are fewer. */
  latest(back: number): number {
    if (back > this.size) return -1;
    return this.recent[(this.next - back + 10) % 10];
  }
}
