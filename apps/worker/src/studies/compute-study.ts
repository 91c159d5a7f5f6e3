import {
  harrisBoyd,
  indirectInterval,
  nonparametricInterval,
  nonparametricIntervalOfSorted,
  robustInterval,
  screenOutliersKeepingSorted,
} from '@plumbline/stats';
import type {
  OutlierScreening,
  PartitionAdvice,
  PartitionKey,
  PartitionResult,
  StudyMethod,
} from '@plumbline/contracts';

type Limits = Pick<PartitionResult, 'lower' | 'upper' | 'note'>;

/**
 * The methods a study can use, one function each, so another method (a reworked indirect method, a
 * network-harmonised interval) is one more entry. Each gets the screened values and says why it gives
 * no limits or no confidence intervals. `sorted`, when given, holds the same values sorted ascending.
 */
export const studyMethodImplementations: Record<
  StudyMethod,
  (values: number[], sorted?: Float64Array) => Limits
> = {
  nonparametric(values, sorted) {
    if (values.length < 120)
      return {
        lower: null,
        upper: null,
        note:
          `Only ${values.length} values: the nonparametric method needs at least 120 per partition ` +
          `(CLSI EP28-A3c). Use the robust method (Horn & Pesce) for 20 to 119 values.`,
      };
    const r = sorted ? nonparametricIntervalOfSorted(sorted) : nonparametricInterval(values);
    return { lower: r.lower, upper: r.upper, note: null };
  },
  robust(values) {
    if (values.length < 20)
      return {
        lower: null,
        upper: null,
        note: `Only ${values.length} values: the robust method needs at least 20.`,
      };
    const r = robustInterval(values);
    return {
      lower: { value: r.lower, ci: null },
      upper: { value: r.upper, ci: null },
      note: 'The robust method (Horn & Pesce) gives the limits without confidence intervals here.',
    };
  },
  indirect(values) {
    if (values.length < 1000)
      return {
        lower: null,
        upper: null,
        note: `Only ${values.length} values: the indirect method needs at least 1000 routine results.`,
      };
    const r = indirectInterval(values);
    const fit = r.diagnostics.fitAccepted
      ? ''
      : ' No truncation interval passed the fit test; the best fit was used.';
    return {
      lower: { value: r.lower, ci: null },
      upper: { value: r.upper, ci: null },
      note: `Indirect estimate from routine results (${r.method}); no confidence intervals.${fit}`,
    };
  },
};

export const MAX_LISTED_EXCLUDED = 5000;

/** Screens, computes and bins one partition's values. */
export function computePartition(
  key: PartitionKey,
  label: string,
  values: number[],
  method: StudyMethod,
  screening: OutlierScreening,
): { result: Omit<PartitionResult, 'current'>; kept: number[] } {
  let kept = values;
  let keptSorted: Float64Array | undefined;
  let removed: number[] = [];
  let screeningNote: string | null = null;
  if (screening !== 'none' && values.length >= 4) {
    try {
      ({ kept, removed, keptSorted } = screenOutliersKeepingSorted(values, screening));
    } catch (error) {
      screeningNote = `Outlier screening was not applied: ${(error as Error).message}.`;
    }
  }
  let limits: Limits;
  try {
    limits = studyMethodImplementations[method](kept, keptSorted);
  } catch (error) {
    limits = { lower: null, upper: null, note: `No limits: ${(error as Error).message}.` };
  }
  const note = [limits.note, screeningNote].filter(Boolean).join(' ') || null;
  return {
    result: {
      key,
      label,
      n: values.length,
      excluded: removed.slice(0, MAX_LISTED_EXCLUDED),
      excludedCount: removed.length,
      method,
      lower: limits.lower,
      upper: limits.upper,
      note,
      histogram: histogram(values, 30),
    },
    kept,
  };
}

/** Equal-width bins over the values' range. */
export function histogram(values: number[], bins: number): { from: number; to: number; count: number }[] {
  if (values.length === 0) return [];
  let min = Infinity;
  let max = -Infinity;
  for (const v of values) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  if (min === max) return [{ from: min, to: max, count: values.length }];
  const width = (max - min) / bins;
  const counts = new Array<number>(bins).fill(0);
  for (const v of values) counts[Math.min(bins - 1, Math.floor((v - min) / width))] += 1;
  return counts.map((count, i) => ({ from: min + i * width, to: min + (i + 1) * width, count }));
}

/**
 * Harris & Boyd between the sexes (same age band) and between adjacent age bands (same sex), with the
 * decision in words.
 */
export function partitionAdvice(
  parts: { key: PartitionKey; label: string; kept: number[] }[],
): PartitionAdvice[] {
  const advice: PartitionAdvice[] = [];
  const compare = (a: (typeof parts)[number], b: (typeof parts)[number]) => {
    if (a.kept.length < 2 || b.kept.length < 2) return;
    try {
      const r = harrisBoyd(a.kept, b.kept);
      const reason =
        r.z > r.zCritical
          ? `the means differ (z = ${r.z.toFixed(2)} > z* = ${r.zCritical.toFixed(2)})`
          : r.sdRatio > 1.5
            ? `the SDs differ (ratio ${r.sdRatio.toFixed(2)} > 1.5)`
            : `z = ${r.z.toFixed(2)} ≤ z* = ${r.zCritical.toFixed(2)} and SD ratio ${r.sdRatio.toFixed(2)} ≤ 1.5`;
      advice.push({
        between: [a.label, b.label],
        z: r.z,
        zCritical: r.zCritical,
        sdRatio: r.sdRatio,
        partition: r.partition,
        advice: r.partition
          ? `Keep separate intervals for ${a.label} and ${b.label}: ${reason} (Harris & Boyd).`
          : `${a.label} and ${b.label} can share one interval: ${reason} (Harris & Boyd).`,
      });
    } catch {
      // Both SDs 0: nothing to advise.
    }
  };
  for (const a of parts)
    for (const b of parts) {
      if (a === b) continue;
      const sameBand = a.key.ageLow === b.key.ageLow && a.key.ageHigh === b.key.ageHigh;
      if (sameBand && a.key.sex === 'female' && b.key.sex === 'male') compare(a, b);
      if (a.key.sex === b.key.sex && a.key.ageHigh + 1 === b.key.ageLow) compare(a, b);
    }
  return advice;
}
