import { evaluateMultirule, pool, summarize } from '@plumbline/stats';
import type { ValuesBuffer } from './values-buffer.ts';

/** Target mean and SD of a level, and where they come from. */
export type Target = { mean: number; sd: number; source: 'lab' | 'peer' | 'month' };

/** A month's summary of a lab series. */
export type MonthFigures = { period: string; n: number; mean: number; sd: number };

/**
 * The lab's own established figures for a lot and level before a period: its earlier monthly summaries
 * pooled (METHODS.md §1). Null when it has none (or they give no spread).
 */
export function labTargetBefore(history: readonly MonthFigures[], period: string): Target | null {
  const earlier = history.filter((h) => h.period < period);
  if (earlier.length === 0) return null;
  const total = earlier.reduce((sum, h) => sum + h.n, 0);
  if (total < 2) return null;
  const pooled = earlier.length === 1 ? earlier[0] : pool(earlier);
  return pooled.sd > 0 ? { mean: pooled.mean, sd: pooled.sd, source: 'lab' } : null;
}

/** Lab's figures first, then the peers', then the month's own (METHODS.md §4 and issue 4). */
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
): Map<number, PointResult> {
  const results = new Map<number, PointResult>();
  // Each row's run key, computed once (the sort below compares them many times).
  const runKey = new Map<number, string>();
  const runStart = new Map<string, number>();
  for (const i of indices) {
    const run = buffer.run(i) ?? `at:${buffer.measuredAt(i)}`;
    runKey.set(i, run);
    const start = runStart.get(run);
    if (start === undefined || buffer.measuredAt(i) < start) runStart.set(run, buffer.measuredAt(i));
  }
  const runOf = (i: number) => runKey.get(i)!;
  const levelOf = (i: number) => buffer.series[buffer.seriesOf(i)].level;
  const evaluated = indices.filter((i) => targets.has(levelOf(i)));
  for (const i of indices) if (!targets.has(levelOf(i))) results.set(i, { z: null, rules: [] });
  if (evaluated.length === 0) return results;

  const ordered = [...evaluated].sort((a, b) => {
    const ra = runOf(a);
    const rb = runOf(b);
    if (ra !== rb) {
      const sa = runStart.get(ra)!;
      const sb = runStart.get(rb)!;
      return sa !== sb ? sa - sb : ra < rb ? -1 : 1;
    }
    return buffer.measuredAt(a) - buffer.measuredAt(b) || levelOf(a) - levelOf(b) || a - b;
  });
  const targetRecord: Record<number, { mean: number; sd: number }> = {};
  for (const [level, t] of targets) targetRecord[level] = { mean: t.mean, sd: t.sd };
  const outcome = evaluateMultirule(
    ordered.map((i) => ({ run: runOf(i), level: levelOf(i), value: buffer.value(i) })),
    targetRecord,
  );
  outcome.points.forEach((point, k) => results.set(ordered[k], { z: point.z, rules: [...point.rules] }));
  return results;
}

/** n, mean, SD of each series of the buffer with at least two values (indices grouped by series). */
export function seriesFigures(
  buffer: ValuesBuffer,
  indicesBySeries: ReadonlyMap<number, number[]>,
): Map<number, MonthFigures> {
  const figures = new Map<number, MonthFigures>();
  for (const [seriesIndex, indices] of indicesBySeries) {
    if (indices.length < 2) continue;
    const s = summarize(indices.map((i) => buffer.value(i)));
    figures.set(seriesIndex, {
      period: buffer.series[seriesIndex].period.period,
      n: s.n,
      mean: s.mean,
      sd: s.sd,
    });
  }
  return figures;
}
