import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { evaluateMultirule, type ControlPoint } from '../src/index.ts';
import { evaluateMultiruleReference } from './helpers/multirule-reference.ts';

// evaluateMultirule keeps running counts instead of re-reading the last 2, 4 and 10 points of each
// sequence. The rules themselves are checked against their definitions (Westgard et al., Clin Chem
// 1981;27:493–501) in multirule.test.ts; here random sequences must give exactly what the first,
// direct implementation (test/helpers/multirule-reference.ts) gives: points, rules, verdicts, errors.

type Outcome = { result: unknown } | { error: string };
const outcomeOf = (run: () => unknown): Outcome => {
  try {
    return { result: run() };
  } catch (error) {
    return { error: (error as Error).message };
  }
};

const targets = { 1: { mean: 100, sd: 2 }, 2: { mean: 200, sd: 4 }, 3: { mean: 5, sd: 0.25 } };
type Level = keyof typeof targets;

// z-scores that sit on and around the rule limits (0, 1, 2, 3 SD), so boundaries are exercised often.
const zScore = fc.oneof(
  fc.constantFrom(0, 1, -1, 2, -2, 3, -3, 0.5, -0.5, 1.5, -1.5, 2.5, -2.5, 3.5, -3.5),
  fc.double({ min: -4.5, max: 4.5, noNaN: true }),
);
// Series that drift to one side of the mean (most points share a sign), so the 4-1s and 10-x windows
// fill often; and series without drift.
const series = (runs: { minLength: number; maxLength: number }, perRun: number) =>
  fc.constantFrom(1, -1, 0).chain((drift) =>
    fc.array(
      fc.array(
        fc.record({
          level: fc.constantFrom<Level>(1, 2, 3),
          z: fc
            .tuple(zScore, fc.integer({ min: 0, max: 99 }))
            .map(([z, chance]) => (drift !== 0 && chance < 85 ? drift * Math.abs(z) : z)),
        }),
        { minLength: 1, maxLength: perRun, size: 'max' },
      ),
      { ...runs, size: 'max' },
    ),
  );
const runs = series({ minLength: 0, maxLength: 40 }, 4);

const toPoints = (series: { level: Level; z: number }[][]): ControlPoint[] =>
  series.flatMap((run, r) =>
    run.map((p) => ({
      run: `r${r}`,
      level: p.level,
      value: targets[p.level].mean + p.z * targets[p.level].sd,
    })),
  );

describe('evaluateMultirule equals the reference implementation', () => {
  it('on random chronological series of one to three levels', () => {
    fc.assert(
      fc.property(runs, (series) => {
        const points = toPoints(series);
        expect(evaluateMultirule(points, targets)).toStrictEqual(evaluateMultiruleReference(points, targets));
      }),
      { numRuns: 2000 },
    );
  });

  it('on long series of a single level and of two levels per run (the 10-x and 4-1s windows)', () => {
    const long = series({ minLength: 30, maxLength: 120 }, 2);
    fc.assert(
      fc.property(long, (series) => {
        const points = toPoints(series);
        expect(evaluateMultirule(points, targets)).toStrictEqual(evaluateMultiruleReference(points, targets));
      }),
      { numRuns: 300 },
    );
  });

  it('on points carrying extra fields, symbol keys or another key order (all kept as given)', () => {
    const tag = Symbol('tag');
    fc.assert(
      fc.property(runs, (series) => {
        const points = toPoints(series).map((p, i) =>
          i % 3 === 0
            ? { ...p, note: `n${i}` }
            : i % 3 === 1
              ? { value: p.value, run: p.run, level: p.level }
              : { ...p, [tag]: i },
        );
        const result = evaluateMultirule(points, targets);
        const reference = evaluateMultiruleReference(points, targets);
        expect(result).toStrictEqual(reference);
        // Same key order too.
        expect(JSON.stringify(result)).toBe(JSON.stringify(reference));
      }),
      { numRuns: 200 },
    );
  });

  it('on faulty input: the same error, or the same result', () => {
    // Runs that reappear, empty run names, missing levels, non-finite values and bad targets.
    const faulty = fc.array(
      fc.record({
        run: fc.constantFrom('a', 'b', 'c', ''),
        level: fc.constantFrom(1, 2, 3, 4),
        value: fc.oneof(fc.double({ min: 0, max: 300, noNaN: true }), fc.constantFrom(NaN, Infinity)),
      }),
      { maxLength: 12 },
    );
    const faultyTargets = fc.constantFrom<Record<number, { mean: number; sd: number }>>(
      targets,
      { 1: { mean: 100, sd: 0 }, 2: { mean: 200, sd: 4 } },
      { 1: { mean: NaN, sd: 2 }, 2: { mean: 200, sd: 4 }, 3: { mean: 5, sd: -1 } },
    );
    fc.assert(
      fc.property(faulty, faultyTargets, (points, t) => {
        expect(outcomeOf(() => evaluateMultirule(points, t))).toStrictEqual(
          outcomeOf(() => evaluateMultiruleReference(points, t)),
        );
      }),
      { numRuns: 2000 },
    );
  });

  it('returns a fresh rules array for every point and run', () => {
    const points = toPoints([[{ level: 1, z: 2.5 }], [{ level: 1, z: 2.5 }]]);
    const result = evaluateMultirule(points, targets);
    expect(result.points[0].rules).not.toBe(result.points[1].rules);
    result.points[0].rules.push('10-x');
    expect(result.points[1].rules).toEqual(['1-2s', '2-2s']);
  });
});
