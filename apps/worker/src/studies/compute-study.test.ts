import { describe, expect, it } from 'vitest';
import { nonparametricInterval, seededRandom } from '@plumbline/stats';
import { computePartition, histogram, partitionAdvice } from './compute-study.ts';
import { studyPartitions } from './study.job.ts';

const key = { sex: 'all' as const, ageLow: 18, ageHigh: 120 };

describe('a study partition', () => {
  it('when there are fewer than 120 values for the nonparametric method, then there are no limits and the note offers the robust method', () => {
    const values = Array.from({ length: 60 }, (_, i) => 130 + i / 3);
    const { result } = computePartition(key, 'All', values, 'nonparametric', 'none');
    expect(result.lower).toBeNull();
    // CLSI EP28-A3c: at least 120 reference individuals per partition for nonparametric limits.
    expect(result.note).toMatch(/at least 120.*robust/);
  });

  it('when there are enough values and no screening, then the limits are nonparametricInterval of the values', () => {
    const random = seededRandom(11);
    const values = Array.from({ length: 400 }, () => random.normal(140, 2));
    const { result } = computePartition(key, 'All', values, 'nonparametric', 'none');
    const expected = nonparametricInterval(values);
    expect(result.lower).toEqual(expected.lower);
    expect(result.upper).toEqual(expected.upper);
    expect(result.histogram.reduce((n, b) => n + b.count, 0)).toBe(400);
  });

  it('when Tukey screening cannot run (a value ≤ 0), then all values are kept and the note says why', () => {
    const values = [0, ...Array.from({ length: 200 }, (_, i) => 1 + i)];
    const { result } = computePartition(key, 'All', values, 'nonparametric', 'tukey');
    expect(result.excludedCount).toBe(0);
    expect(result.note).toMatch(/not applied/);
  });
});

describe('partitions and advice', () => {
  it('when a study splits by sex and two age bands, then it has four partitions within the selection', () => {
    const keys = studyPartitions(
      { ageLow: 18, ageHigh: 90, sex: 'all' },
      {
        bySex: true,
        ageBands: [
          { low: 0, high: 49 },
          { low: 50, high: 120 },
        ],
      },
    );
    expect(keys).toEqual([
      { sex: 'female', ageLow: 18, ageHigh: 49 },
      { sex: 'female', ageLow: 50, ageHigh: 90 },
      { sex: 'male', ageLow: 18, ageHigh: 49 },
      { sex: 'male', ageLow: 50, ageHigh: 90 },
    ]);
  });

  it('when the sexes differ clearly, then the advice keeps separate intervals (Harris & Boyd)', () => {
    const random = seededRandom(5);
    const women = Array.from({ length: 300 }, () => random.normal(60, 8));
    const men = Array.from({ length: 300 }, () => random.normal(80, 8));
    const advice = partitionAdvice([
      { key: { sex: 'female', ageLow: 18, ageHigh: 120 }, label: 'Women', kept: women },
      { key: { sex: 'male', ageLow: 18, ageHigh: 120 }, label: 'Men', kept: men },
    ]);
    expect(advice).toHaveLength(1);
    expect(advice[0].partition).toBe(true);
    expect(advice[0].advice).toMatch(/^Keep separate intervals for Women and Men/);
  });

  it('when all values are equal, then the histogram is one bin', () => {
    expect(histogram([5, 5, 5], 30)).toEqual([{ from: 5, to: 5, count: 3 }]);
  });
});
