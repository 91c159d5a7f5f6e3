import { describe, expect, it } from 'vitest';
import { evaluateMultirule, type ControlPoint } from '../src/index.ts';

// Westgard JO, Barry PL, Hunt MR, Groth T. Clin Chem 1981;27:493–501 published the rule definitions
// but no numeric example, so every sequence here is built from the definitions.
const targets = { 1: { mean: 100, sd: 2 }, 2: { mean: 200, sd: 4 } };
const valueAt = (level: 1 | 2, z: number) => targets[level].mean + z * targets[level].sd;

/** Runs given as z-scores per level, e.g. [[2.1, 0], [0, 0]] = two runs with levels 1 and 2. */
function runsOf(zs: number[][]): ControlPoint[] {
  return zs.flatMap((run, r) =>
    run.map((z, l) => ({ run: `run-${r + 1}`, level: l + 1, value: valueAt((l + 1) as 1 | 2, z) })),
  );
}
const verdicts = (zs: number[][]) =>
  evaluateMultirule(runsOf(zs), targets).runs.map((r) => `${r.verdict}:${r.rules.join(',')}`);

describe('evaluateMultirule', () => {
  it('when values are within 2s, then every run is accepted and z = (value − mean)/SD', () => {
    const result = evaluateMultirule(runsOf([[0.5, -1.5]]), targets);
    expect(result.points.map((p) => p.z)).toEqual([0.5, -1.5]);
    expect(result.runs).toEqual([{ run: 'run-1', verdict: 'accept', rules: [] }]);
  });

  it('when one value is beyond 2s, then 1-2s warns; exactly at 2s does not (strict "beyond")', () => {
    expect(verdicts([[2.5, 0]])).toEqual(['warn:1-2s']);
    expect(verdicts([[2, 0]])).toEqual(['accept:']);
    expect(verdicts([[0, -2.25]])).toEqual(['warn:1-2s']);
  });

  it('when one value is beyond 3s, then 1-3s rejects; exactly at 3s only warns', () => {
    expect(verdicts([[3.5, 0]])).toEqual(['reject:1-2s,1-3s']);
    expect(verdicts([[3, 0]])).toEqual(['warn:1-2s']);
  });

  it('when both levels of a run are beyond the same 2s limit, then 2-2s rejects (within run, across levels)', () => {
    expect(verdicts([[2.25, 2.5]])).toEqual(['reject:1-2s,2-2s']);
    expect(verdicts([[-2.25, -2.5]])).toEqual(['reject:1-2s,2-2s']);
  });

  it('when one level is beyond the same 2s limit in two consecutive runs, then the second run is rejected by 2-2s (across runs, within level)', () => {
    expect(
      verdicts([
        [2.25, 0],
        [2.5, 0],
      ]),
    ).toEqual(['warn:1-2s', 'reject:1-2s,2-2s']);
    // Opposite limits or different levels in consecutive runs are not 2-2s.
    expect(
      verdicts([
        [2.25, 0],
        [-2.5, 0],
      ]),
    ).toEqual(['warn:1-2s', 'warn:1-2s']);
    expect(
      verdicts([
        [2.25, 0],
        [0, 2.5],
      ]),
    ).toEqual(['warn:1-2s', 'warn:1-2s']);
  });

  it('when in one run one value is beyond +2s and another beyond −2s, then R-4s rejects; not across runs', () => {
    expect(verdicts([[2.25, -2.25]])).toEqual(['reject:1-2s,R-4s']);
    expect(
      verdicts([
        [2.25, 0],
        [0, -2.25],
      ]),
    ).toEqual(['warn:1-2s', 'warn:1-2s']);
  });

  it('when four consecutive values of one level are beyond the same 1s limit, then 4-1s rejects the run completing them', () => {
    expect(
      verdicts([
        [1.5, 0],
        [1.5, 0],
        [1.5, 0],
        [1.5, 0],
      ]),
    ).toEqual(['accept:', 'accept:', 'accept:', 'reject:4-1s']);
    expect(
      verdicts([
        [-1.25, 0],
        [-1.5, 0],
        [-1.75, 0],
        [-1.25, 0],
      ]),
    ).toEqual(['accept:', 'accept:', 'accept:', 'reject:4-1s']);
    // Exactly at 1s breaks the sequence.
    expect(
      verdicts([
        [1.5, 0],
        [1, 0],
        [1.5, 0],
        [1.5, 0],
      ]),
    ).toEqual(['accept:', 'accept:', 'accept:', 'accept:']);
  });

  it('when four consecutive values across levels are beyond the same 1s limit, then 4-1s rejects (across levels)', () => {
    expect(
      verdicts([
        [1.25, 1.5],
        [1.5, 1.25],
      ]),
    ).toEqual(['accept:', 'reject:4-1s']);
    const points = evaluateMultirule(
      runsOf([
        [1.25, 1.5],
        [1.5, 1.25],
      ]),
      targets,
    ).points;
    expect(points.map((p) => p.rules)).toEqual([[], [], ['4-1s'], ['4-1s']]); // earlier runs keep their verdict
  });

  it('when ten consecutive values of one level are on the same side of the mean, then 10-x rejects the tenth run', () => {
    const zs = Array.from({ length: 10 }, () => [0.5, 0]);
    const result = verdicts(zs);
    expect(result.slice(0, 9).every((v) => v === 'accept:')).toBe(true);
    expect(result[9]).toBe('reject:10-x');
    // A value exactly at the mean breaks the sequence.
    const broken = Array.from({ length: 10 }, (_, i) => [i === 4 ? 0 : 0.5, 0]);
    expect(verdicts(broken)[9]).toBe('accept:');
  });

  it('when ten consecutive values across levels are on the same side of the mean, then 10-x rejects (across levels, 5 runs × 2 levels)', () => {
    const zs = Array.from({ length: 5 }, () => [-0.25, -0.5]);
    expect(verdicts(zs)).toEqual(['accept:', 'accept:', 'accept:', 'accept:', 'reject:10-x']);
  });

  it('when several rules are violated, then they are listed in the fixed order 1-2s, 1-3s, 2-2s, R-4s, 4-1s, 10-x', () => {
    expect(verdicts([[3.5, -2.5]])).toEqual(['reject:1-2s,1-3s,R-4s']);
  });

  it('when a level has no target, then it throws naming the level, point and run', () => {
    expect(() => evaluateMultirule([{ run: 'a', level: 3, value: 1 }], targets)).toThrow(
      "evaluateMultirule: no target for level 3 (point 0, run 'a')",
    );
  });

  it('when a target SD is not positive or a value not finite, then it throws', () => {
    expect(() => evaluateMultirule([{ run: 'a', level: 1, value: 1 }], { 1: { mean: 1, sd: 0 } })).toThrow(
      'evaluateMultirule: target sd of level 1 must be greater than 0, got 0',
    );
    expect(() => evaluateMultirule([{ run: 'a', level: 1, value: Number.NaN }], targets)).toThrow(
      "evaluateMultirule: point 0 (run 'a') value is not a finite number",
    );
  });

  it('when a run reappears after another run, then it throws (input must be chronological)', () => {
    const points = [
      { run: 'a', level: 1, value: 100 },
      { run: 'b', level: 1, value: 100 },
      { run: 'a', level: 2, value: 200 },
    ];
    expect(() => evaluateMultirule(points, targets)).toThrow(
      "evaluateMultirule: run 'a' appears again at point 2",
    );
  });

  describe('limits written in decimal (values and targets as laboratories report them)', () => {
    // Definitions of Westgard et al. 1981 ("beyond" a limit is strict); the decimal figures are
    // invented. In binary floating point (4.4 − 4.1) / 0.15 = 2.0000000000000018 and
    // (4.25 − 4.1) / 0.15 = 1.0000000000000024, so these values sit exactly on the limit only
    // when the comparison allows for rounding.
    const decimalTargets = { 1: { mean: 4.1, sd: 0.15 } };
    const run = (values: number[]) =>
      evaluateMultirule(
        values.map((value, i) => ({ run: `r${i + 1}`, level: 1, value })),
        decimalTargets,
      );

    it('when a value is exactly +2 SD or −2 SD in decimal (mean 4.1, SD 0.15, value 4.4 or 3.8), then it is on the limit: z = ±2 and no 1-2s', () => {
      const result = run([4.4, 3.8]);
      expect(result.points.map((p) => p.z)).toEqual([2, -2]);
      expect(result.runs.map((r) => r.verdict)).toEqual(['accept', 'accept']);
    });

    it('when a value is exactly +3 SD in decimal (4.55), then 1-3s does not reject', () => {
      expect(run([4.55]).runs[0].rules).not.toContain('1-3s');
    });

    it('when four consecutive values are exactly +1 SD in decimal (4.25), then 4-1s is not violated', () => {
      expect(run([4.25, 4.25, 4.25, 4.25]).runs.map((r) => r.verdict)).toEqual([
        'accept',
        'accept',
        'accept',
        'accept',
      ]);
    });

    it('when a value lies just beyond a limit (4.4001, i.e. one more reported digit), then it still violates', () => {
      expect(run([4.4001]).runs[0]).toMatchObject({ verdict: 'warn', rules: ['1-2s'] });
      expect(run([4.2501, 4.2501, 4.2501, 4.2501]).runs[3].rules).toEqual(['4-1s']);
    });
  });

  describe('sequences that span a month boundary (earlier values given as history)', () => {
    // Definitions of Westgard et al. 1981: 4-1s, 10-x and 2-2s across runs are sequences of
    // consecutive values, so they do not stop at the end of a calendar month. Sequences built from
    // the definitions (no published example).
    const month = (zs: number[]) =>
      zs.map((z, i) => ({ run: `feb-${i + 1}`, level: 1, value: valueAt(1, z) }));
    const earlier = (zs: number[], level = 1) => zs.map((z) => ({ level, z }));

    it('when three values beyond +1s end the previous month and the first new one is beyond +1s too, then 4-1s rejects the new run', () => {
      const result = evaluateMultirule(month([1.5, 0]), targets, { history: earlier([1.5, 1.5, 1.5]) });
      expect(result.runs.map((r) => `${r.verdict}:${r.rules.join(',')}`)).toEqual(['reject:4-1s', 'accept:']);
      // Only the new point carries the rule; without the history the run is accepted.
      expect(result.points[0].rules).toEqual(['4-1s']);
      expect(evaluateMultirule(month([1.5, 0]), targets).runs[0].verdict).toBe('accept');
    });

    it('when nine values above the mean end the previous month across two levels, then the tenth (new) one completes 10-x', () => {
      const history = [0.5, 0.4, 0.3, 0.6, 0.5, 0.2, 0.7, 0.5, 0.1].map((z, i) => ({
        level: 1 + (i % 2),
        z,
      }));
      const result = evaluateMultirule(month([0.3]), targets, { history });
      expect(result.runs[0]).toMatchObject({ verdict: 'reject', rules: ['10-x'] });
    });

    it('when a level was beyond +2s at the end of the previous month and is again in the first new run, then 2-2s rejects (across runs, within level)', () => {
      const result = evaluateMultirule(month([2.5]), targets, { history: earlier([0.3, 2.25]) });
      expect(result.runs[0]).toMatchObject({ verdict: 'reject', rules: ['1-2s', '2-2s'] });
    });

    it('when the previous month already ended on a 4-1s (rejected then), then a new value that does not continue it is no new violation', () => {
      const history = earlier([1.5, 1.5, 1.5, 1.5]);
      expect(evaluateMultirule(month([0.5]), targets, { history }).runs[0].verdict).toBe('accept');
      expect(evaluateMultirule(month([-1.5]), targets, { history }).runs[0].verdict).toBe('accept');
    });

    it('when a history value is not finite, then it throws naming it', () => {
      expect(() =>
        evaluateMultirule(month([0]), targets, { history: [{ level: 1, z: Number.NaN }] }),
      ).toThrow('evaluateMultirule: history point 0 z is not a finite number');
    });
  });
});
