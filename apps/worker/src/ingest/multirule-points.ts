import {
  MULTIRULE_RULES,
  evaluateMultirule,
  pool,
  summarize,
  type ControlPoint,
  type HistoryPoint,
} from '@plumbline/stats';
import type { ValuesBuffer } from './values-buffer.ts';

/** Target mean and SD of a level, and where they come from. */
export type Target = { mean: number; sd: number; source: 'lab' | 'peer' | 'month' };

/** A month's summary of a lab series. */
export type MonthFigures = { period: string; n: number; mean: number; sd: number };

/**
 * The lab's own established figures for a lot and level before a period: its earlier monthly summaries
 * pooled (docs/methods.md §1). Null when it has none (or they give no spread).
 */
export function labTargetBefore(history: readonly MonthFigures[], period: string): Target | null {
  const earlier = history.filter((h) => h.period < period);
  if (earlier.length === 0) return null;
  const total = earlier.reduce((sum, h) => sum + h.n, 0);
  if (total < 2) return null;
  const pooled = earlier.length === 1 ? earlier[0] : pool(earlier);
  return pooled.sd > 0 ? { mean: pooled.mean, sd: pooled.sd, source: 'lab' } : null;
}

/** Lab's figures first, then the peers', then the month's own (docs/methods.md §4). */
export function chooseTarget(
  lab: Target | null,
  peer: Target | null,
  month: MonthFigures | null,
): Target | null {
  if (lab) return lab;
  if (peer) return peer;
  if (month && month.n >= 2 && month.sd > 0) return { mean: month.mean, sd: month.sd, source: 'month' };
  return null;
}

export type PointResult = { z: number | null; rules: string[] };

/** Bit of each multirule rule in GroupResults.rules (the order in which the rules are reported). */
export const RULE_BITS: ReadonlyMap<string, number> = new Map(
  MULTIRULE_RULES.map((rule, k) => [rule, 1 << k]),
);

/** The rules of a bit set, in reporting order. */
export function rulesOfBits(bits: number): string[] {
  return MULTIRULE_RULES.filter((rule) => (bits & RULE_BITS.get(rule)!) !== 0);
}

/**
 * Multirule results of a group's rows, by position in the `indices` given: z (NaN for a level without a
 * target) and the rules as RULE_BITS; `timeOrder` lists the positions by time, then level, then row.
 */
export type GroupResults = { z: Float64Array; rules: Uint8Array; timeOrder: Int32Array };

/**
 * Multirule results of the values of one procedure, control lot and period (all levels together, as the
 * across-level rules need). Points are put in chronological order of runs: a run's points stay together
 * (ordered by time, then level) and runs follow the time of their first point. A value without a run id
 * forms a run with the other levels measured at the same moment. Levels without a target get no result.
 */
export function evaluateGroup(
  buffer: ValuesBuffer,
  indices: readonly number[],
  targets: ReadonlyMap<number, Target>,
  history: readonly HistoryPoint[] = [],
): Map<number, PointResult> {
  const { z, rules } = evaluateGroupRows(buffer, indices, targets, history);
  const results = new Map<number, PointResult>();
  indices.forEach((i, k) =>
    results.set(i, Number.isNaN(z[k]) ? { z: null, rules: [] } : { z: z[k], rules: rulesOfBits(rules[k]) }),
  );
  return results;
}

/**
 * evaluateGroup with its results in typed columns (a group can hold hundreds of thousands of rows).
 * `history`: the previous month's evaluated values of the same procedure and lot (oldest first), so
 * 2-2s, 4-1s and 10-x sequences run across the month boundary (evaluateMultirule's history).
 */
export function evaluateGroupRows(
  buffer: ValuesBuffer,
  indices: ArrayLike<number>,
  targets: ReadonlyMap<number, Target>,
  history: readonly HistoryPoint[] = [],
): GroupResults {
  const count = indices.length;
  const row = Int32Array.from(indices);
  const at = new Float64Array(count);
  const level = new Float64Array(count);
  for (let k = 0; k < count; k++) {
    at[k] = buffer.measuredAt(row[k]);
    level[k] = buffer.series[buffer.seriesOf(row[k])].level;
  }

  // Each row's run: its run id, or "at:<time>" without one (a run id may be written that way too; then
  // they are one run). Runs are numbered within the group; a run starts at the time of its first point.
  const run = new Int32Array(count);
  const runKeys: string[] = [];
  const runStarts: number[] = [];
  const localRunOf = new Map<number, number>();
  const unnamed = new Map<number, number>();
  for (let k = 0; k < count; k++) {
    let id = buffer.runNumber(row[k]);
    if (id === -1) {
      const time = at[k];
      const known = unnamed.get(time);
      if (known !== undefined) id = known;
      else {
        id = buffer.numberOfRun(`at:${time}`);
        if (id === -1) id = -2 - unnamed.size; // a run of its own, outside the file's run ids
        unnamed.set(time, id);
      }
    }
    let local = localRunOf.get(id);
    if (local === undefined) {
      local = runKeys.length;
      localRunOf.set(id, local);
      runKeys.push(id >= 0 ? buffer.runName(id) : `at:${at[k]}`);
      runStarts.push(at[k]);
    } else if (at[k] < runStarts[local]) runStarts[local] = at[k];
    run[k] = local;
  }

  const byTime = (a: number, b: number) => at[a] - at[b] || level[a] - level[b] || row[a] - row[b];
  const byRun = (a: number, b: number) => {
    if (run[a] !== run[b]) {
      const sa = runStarts[run[a]];
      const sb = runStarts[run[b]];
      return sa !== sb ? sa - sb : runKeys[run[a]] < runKeys[run[b]] ? -1 : 1;
    }
    return byTime(a, b);
  };
  const timeOrder = sortedPositions(count, byTime);

  const z = new Float64Array(count).fill(Number.NaN);
  const rules = new Uint8Array(count);
  const evaluated: number[] = [];
  for (let k = 0; k < count; k++) if (targets.has(level[k])) evaluated.push(k);
  if (evaluated.length === 0) return { z, rules, timeOrder };
  if (!isSorted(evaluated, byRun)) evaluated.sort(byRun);

  const targetRecord: Record<number, { mean: number; sd: number }> = {};
  for (const [lvl, t] of targets) targetRecord[lvl] = { mean: t.mean, sd: t.sd };
  const points: ControlPoint[] = new Array(evaluated.length);
  for (let e = 0; e < evaluated.length; e++) {
    const k = evaluated[e];
    points[e] = { run: runKeys[run[k]], level: level[k], value: buffer.value(row[k]) };
  }
  const outcome = evaluateMultirule(points, targetRecord, { history });
  for (let e = 0; e < evaluated.length; e++) {
    const k = evaluated[e];
    const point = outcome.points[e];
    z[k] = point.z;
    let bits = 0;
    for (const rule of point.rules) bits |= RULE_BITS.get(rule)!;
    rules[k] = bits;
  }
  return { z, rules, timeOrder };
}

/** Positions 0…count−1 in the comparator's order (often already in order: then no sort). */
function sortedPositions(count: number, compare: (a: number, b: number) => number): Int32Array {
  const positions = new Int32Array(count);
  for (let k = 0; k < count; k++) positions[k] = k;
  let sorted = true;
  for (let k = 1; k < count && sorted; k++) if (compare(k - 1, k) > 0) sorted = false;
  if (!sorted) positions.sort(compare);
  return positions;
}

function isSorted(list: readonly number[], compare: (a: number, b: number) => number): boolean {
  for (let k = 1; k < list.length; k++) if (compare(list[k - 1], list[k]) > 0) return false;
  return true;
}

/** n, mean, SD of each series of the buffer with at least two values (rows of each series, in file order). */
export function seriesFigures(
  buffer: ValuesBuffer,
  rowsOfSeries: readonly ArrayLike<number>[],
): Map<number, MonthFigures> {
  const figures = new Map<number, MonthFigures>();
  rowsOfSeries.forEach((rows, seriesIndex) => {
    if (rows.length < 2) return;
    const s = summarize(Array.from(rows, (i) => buffer.value(i)));
    figures.set(seriesIndex, {
      period: buffer.series[seriesIndex].period.period,
      n: s.n,
      mean: s.mean,
      sd: s.sd,
    });
  });
  return figures;
}
