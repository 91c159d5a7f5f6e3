import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { pairedMeanDifference, welchMeanDifference } from '../src/index.ts';

// Expected t quantiles come from jStat (a general-purpose reference library) called here directly;
// the rest of each expected value is worked by hand from Welch (1947) / Student's paired t interval.
describe('welchMeanDifference (Welch 1947, Satterthwaite 1946)', () => {
  it('when two lots have 5 labs each, then se, ν and the interval follow the hand-worked formulas', () => {
    const result = welchMeanDifference({ mean: 100, sd: 2, labs: 5 }, { mean: 103, sd: 3, labs: 5 });
    // se² = 4/5 + 9/5 = 2.6; ν = 2.6² / (0.8²/4 + 1.8²/4) = 6.76 / 0.97 (hand-worked).
    const dof = 6.76 / 0.97;
    const t = jStat.studentt.inv(0.975, dof);
    expect(result.difference).toBe(3);
    expect(result.se).toBeCloseTo(Math.sqrt(2.6), 12);
    expect(result.dof).toBeCloseTo(dof, 12);
    expect(result.low).toBeCloseTo(3 - t * Math.sqrt(2.6), 10);
    expect(result.high).toBeCloseTo(3 + t * Math.sqrt(2.6), 10);
  });

  it('when the SDs and lab counts are equal, then ν = 2(n − 1) (pooled t, handbook identity from memory)', () => {
    const result = welchMeanDifference({ mean: 10, sd: 1, labs: 8 }, { mean: 9, sd: 1, labs: 8 });
    expect(result.dof).toBeCloseTo(14, 12);
    const t = jStat.studentt.inv(0.975, 14);
    expect(result.high - result.low).toBeCloseTo(2 * t * Math.sqrt(2 / 8), 10);
    expect(result.difference).toBe(-1);
  });

  it('when both SDs are 0 or a lot has one lab, then it refuses with a reason', () => {
    expect(() => welchMeanDifference({ mean: 1, sd: 0, labs: 3 }, { mean: 2, sd: 0, labs: 3 })).toThrow(
      /both SDs are 0/,
    );
    expect(() => welchMeanDifference({ mean: 1, sd: 1, labs: 1 }, { mean: 2, sd: 1, labs: 3 })).toThrow(
      /first labs/,
    );
  });
});

describe('pairedMeanDifference (Student paired t interval)', () => {
  it('when the differences are 1..5, then mean 3, sd √2.5 and 3 ± t(0.975, 4)·√0.5', () => {
    const result = pairedMeanDifference([1, 2, 3, 4, 5]);
    const t = jStat.studentt.inv(0.975, 4);
    // Printed t tables give t(0.975, 4) = 2.776 (from memory): a check on the reference itself.
    expect(t).toBeCloseTo(2.776, 3);
    expect(result.n).toBe(5);
    expect(result.difference).toBe(3);
    expect(result.sd).toBeCloseTo(Math.sqrt(2.5), 12);
    expect(result.low).toBeCloseTo(3 - t * Math.sqrt(0.5), 10);
    expect(result.high).toBeCloseTo(3 + t * Math.sqrt(0.5), 10);
  });

  it('when labs differ widely but all move by about the same amount, then pairing gives a narrower interval than Welch', () => {
    const before = [90, 100, 110, 120, 130];
    const shift = [2.1, 1.9, 2.0, 2.2, 1.8];
    const after = before.map((b, i) => b + shift[i]!);
    const paired = pairedMeanDifference(after.map((a, i) => a - before[i]!));
    const mean = (xs: number[]) => xs.reduce((s, x) => s + x, 0) / xs.length;
    const sd = (xs: number[]) => Math.sqrt(xs.reduce((s, x) => s + (x - mean(xs)) ** 2, 0) / (xs.length - 1));
    const welch = welchMeanDifference(
      { mean: mean(before), sd: sd(before), labs: 5 },
      { mean: mean(after), sd: sd(after), labs: 5 },
    );
    expect(paired.difference).toBeCloseTo(welch.difference, 12);
    expect(paired.low).toBeGreaterThan(0);
    expect(welch.low).toBeLessThan(0);
  });

  it('when fewer than 2 differences are given, then it refuses', () => {
    expect(() => pairedMeanDifference([1])).toThrow(/at least 2 differences/);
  });
});
