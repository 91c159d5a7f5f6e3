import { describe, expect, it } from 'vitest';
import {
  peerStatistics,
  robustMeanSd,
  seededRandom,
  selectPeerTier,
  summarize,
  type LabSummary,
} from '../src/index.ts';

// Raw QC values of member labs, generated with a seeded generator so the peer figures can be
// checked against summarising the raw values directly (check by construction; no published example).
function simulatedLabs(count: number, seed: number): { id: string; raw: number[] }[] {
  const random = seededRandom(seed);
  return Array.from({ length: count }, (_, i) => {
    const labMean = random.normal(100, 1.5);
    const labSd = 1 + random.uniform();
    const n = 10 + Math.floor(20 * random.uniform());
    return { id: `lab-${i + 1}`, raw: Array.from({ length: n }, () => random.normal(labMean, labSd)) };
  });
}
const summaryOf = ({ id, raw }: { id: string; raw: number[] }): LabSummary => ({ id, ...summarize(raw) });

// Lab means equal to the ISO 13528 Annex E.3 example results. The standard prints the start values and
// iterations 1–2 only; the converged x* = 1.453333, s* = 0.496148 are computed from its algorithm,
// not read in the standard.
const isoMeans = [1.69, 0.74, 2.05, 1.14, 2.19, 1.39, 1.52, 1.5, 1.58, 0.8, 1.21, 1.63];
const isoLabs = isoMeans.map((mean, i) => ({ id: `L${i + 1}`, n: 20, mean, sd: 0.1 }));

describe('peerStatistics', () => {
  it('when no lab is excluded, then mean, SD and n equal the summary of all raw values (pooling formula, docs/methods.md §2)', () => {
    const labs = simulatedLabs(12, 7);
    const result = peerStatistics(labs.map(summaryOf));
    const direct = summarize(labs.flatMap((lab) => lab.raw));
    expect(result.excluded).toEqual([]);
    expect(result.labs).toBe(12);
    expect(result.n).toBe(direct.n);
    expect(result.mean).toBeCloseTo(direct.mean, 10);
    expect(result.sd).toBeCloseTo(direct.sd, 10);
    expect(result.cv).toBeCloseTo((100 * direct.sd) / direct.mean, 10);
  });

  it('when labs are pooled, then the within SD is the SD of residuals from each lab mean (one-way ANOVA, from raw values)', () => {
    const labs = simulatedLabs(8, 11);
    let squares = 0;
    let degrees = 0;
    for (const { raw } of labs) {
      const m = raw.reduce((a, b) => a + b, 0) / raw.length;
      for (const v of raw) squares += (v - m) ** 2;
      degrees += raw.length - 1;
    }
    const result = peerStatistics(labs.map(summaryOf));
    expect(result.withinSd).toBeCloseTo(Math.sqrt(squares / degrees), 10);
    expect(result.withinCv).toBeCloseTo((100 * result.withinSd) / result.mean, 10);
  });

  it('when the lab means are the ISO 13528 example, then robust mean and SD are the converged values computed from the published algorithm and no lab is excluded', () => {
    const result = peerStatistics(isoLabs);
    expect(result.robustMean).toBeCloseTo(1.453333, 6);
    expect(result.robustSd).toBeCloseTo(0.496148, 6);
    expect(result.excluded).toEqual([]);
  });

  it('when one lab mean lies outside x* ± 3s*, then that lab is excluded as an outlier and the rest are pooled (docs/methods.md §2)', () => {
    const labs = [...isoLabs, { id: 'far', n: 20, mean: 4.2, sd: 0.1 }];
    const robust = robustMeanSd(labs.map((lab) => lab.mean));
    expect(4.2).toBeGreaterThan(robust.mean + 3 * robust.sd); // the constructed lab is beyond the limit
    const result = peerStatistics(labs);
    expect(result.excluded).toEqual([{ id: 'far', reason: 'outlier' }]);
    expect(result.labs).toBe(12);
    expect(result.mean).toBeCloseTo(isoMeans.reduce((a, b) => a + b, 0) / 12, 12); // equal n: plain mean
    expect(result.robustMean).toBeCloseTo(robust.mean, 12);
  });

  it('when the coordinator excludes labs, then they are marked manual and left out before Algorithm A', () => {
    const result = peerStatistics(isoLabs, { excludeIds: ['L3', 'L5', 'not-a-member'] });
    expect(result.excluded).toEqual([
      { id: 'L3', reason: 'manual' },
      { id: 'L5', reason: 'manual' },
    ]);
    const remaining = isoMeans.filter((_, i) => i !== 2 && i !== 4);
    expect(result.labs).toBe(10);
    expect(result.robustMean).toBeCloseTo(robustMeanSd(remaining).mean, 12);
  });

  it('when fewer labs than minLabs remain, then sufficient is false (docs/methods.md §2: at least 3 labs)', () => {
    expect(peerStatistics(isoLabs.slice(0, 3)).sufficient).toBe(true);
    expect(peerStatistics(isoLabs.slice(0, 2)).sufficient).toBe(false);
    expect(peerStatistics(isoLabs.slice(0, 4), { minLabs: 5 }).sufficient).toBe(false);
  });

  it('when fewer labs than minLabsForScreening remain, then no lab is excluded as an outlier (documented choice)', () => {
    const far = { id: 'far', n: 20, mean: 40, sd: 0.1 };
    expect(peerStatistics([...isoLabs.slice(0, 4), far]).excluded).toEqual([
      { id: 'far', reason: 'outlier' },
    ]);
    // A lab 1.5 units away is no gross error (the 4-lab screen needs 10 scale units from the median).
    const nearish = { id: 'nearish', n: 20, mean: 3.5, sd: 0.1 };
    expect(peerStatistics([...isoLabs.slice(0, 3), nearish]).excluded).toEqual([]);
    expect(peerStatistics([...isoLabs.slice(0, 4), nearish], { minLabsForScreening: 6 }).excluded).toEqual(
      [],
    );
  });

  it('when 3 or 4 labs include an absurd mean (1e300), then it is left out as a gross error and every figure is finite', () => {
    for (const count of [2, 3]) {
      const labs = [...isoLabs.slice(0, count), { id: 'absurd', n: 20, mean: 1e300, sd: 0.1 }];
      const result = peerStatistics(labs);
      expect(result.excluded).toEqual([{ id: 'absurd', reason: 'outlier' }]);
      // The remaining labs' figures are their pooled figures (pooling formula, docs/methods.md §2).
      const { mean } = summarize(isoMeans.slice(0, count));
      expect(result.labs).toBe(count);
      for (const figure of [result.mean, result.sd, result.cv, result.robustMean, result.robustSd]) {
        expect(Number.isFinite(figure)).toBe(true);
      }
      expect(result.mean).toBeCloseTo(mean, 12); // equal n, so the n-weighted mean is the plain mean
    }
  });

  it('when 3 genuine labs have two nearly equal means, then the third is not a gross error (within-lab SD floor of the scale)', () => {
    const labs = [5.0, 5.001, 5.3].map((mean, i) => ({ id: `L${i}`, n: 20, mean, sd: 0.2 }));
    expect(peerStatistics(labs).excluded).toEqual([]);
  });

  it('when 4 labs include one far away, then Algorithm A alone breaks down (why its screen needs 5) and the gross-error screen catches the far lab first', () => {
    // With 3 close values and 1 clipped at x* + 1.5s*, the winsorised SD equals s*, so s* grows by
    // 1.134 per iteration until nothing is clipped: x* and s* end as the plain mean and 1.134 · SD
    // (derived from the ISO 13528 Annex C iteration; checked here against that closed form).
    const values = [1.69, 0.74, 2.05, 40];
    const broken = robustMeanSd(values);
    expect(broken.mean).toBeCloseTo(summarize(values).mean, 10);
    expect(broken.sd).toBeCloseTo(1.134 * summarize(values).sd, 10);
    const labs = [...isoLabs.slice(0, 3), { id: 'far', n: 20, mean: 40, sd: 0.1 }];
    expect(peerStatistics(labs, { minLabsForScreening: 4 }).excluded).toEqual([
      { id: 'far', reason: 'outlier' },
    ]);
  });

  it('when most lab means are equal (MAD = 0), then the screen still runs on the fallback scale √(π/2) · mean|x − median| (documented choice)', () => {
    const labs = [5, 5, 5, 5, 5.1, 6].map((mean, i) => ({ id: `L${i}`, n: 10, mean, sd: 0.2 }));
    const result = peerStatistics(labs);
    // Deviations from the median 5: 0, 0, 0, 0, 0.1, 1 → s* = √(π/2) · 1.1/6 ≈ 0.2298, so 6 lies
    // beyond 5 + 3s* ≈ 5.69 and 5.1 does not.
    expect(result.robustSd).toBeCloseTo(Math.sqrt(Math.PI / 2) * (1.1 / 6), 12);
    expect(result.excluded).toEqual([{ id: 'L5', reason: 'outlier' }]);
  });

  it('when most lab means are equal and two labs are absurd on either side, then both are left out and the figures are finite', () => {
    // The mean-absolute-deviation fallback alone would be inflated by the two far means
    // (√(π/2) · 2e300/5 > 1e300/3); the gross-error screen's MAD-based scale is not.
    const labs = [5, 5, 5, 1e300, -1e300].map((mean, i) => ({ id: `L${i}`, n: 10, mean, sd: 0.1 }));
    const result = peerStatistics(labs);
    expect(result.excluded).toEqual([
      { id: 'L3', reason: 'outlier' },
      { id: 'L4', reason: 'outlier' },
    ]);
    expect(result.mean).toBe(5);
    expect(Number.isFinite(result.sd)).toBe(true);
  });

  it('when two labs are too far apart to pool in double precision, then it throws naming the figure', () => {
    const labs = [
      { id: 'high', n: 10, mean: 1e200, sd: 1 },
      { id: 'low', n: 10, mean: -1e200, sd: 1 },
    ];
    expect(() => peerStatistics(labs)).toThrow(
      'peerStatistics: peer mean and SD cannot be computed: pool: pooled SD is not finite (Infinity)',
    );
  });

  it('when one lab remains, then its own figures are the peer figures and robustSd is NaN', () => {
    const result = peerStatistics([{ id: 'only', n: 20, mean: 10, sd: 0.5 }]);
    expect(result).toMatchObject({
      labs: 1,
      n: 20,
      mean: 10,
      sd: 0.5,
      withinSd: 0.5,
      robustMean: 10,
      sufficient: false,
    });
    expect(result.robustSd).toBeNaN();
  });

  it('when every lab is excluded, then the figures are NaN and sufficient is false', () => {
    const result = peerStatistics(isoLabs.slice(0, 2), { excludeIds: ['L1', 'L2'] });
    expect(result.labs).toBe(0);
    expect(result.mean).toBeNaN();
    expect(result.sufficient).toBe(false);
  });

  it('when the input is invalid, then it throws naming the function and the problem', () => {
    expect(() => peerStatistics([])).toThrow('peerStatistics: needs at least 1 lab, got 0');
    expect(() => peerStatistics([{ id: '', n: 5, mean: 1, sd: 1 }])).toThrow(
      'peerStatistics: lab 0 has no id',
    );
    expect(() => peerStatistics([isoLabs[0], isoLabs[0]])).toThrow(
      "peerStatistics: lab id 'L1' appears more than once",
    );
    expect(() => peerStatistics([{ id: 'a', n: 1, mean: 1, sd: 0 }])).toThrow(
      "peerStatistics: lab 'a' n must be an integer of at least 2, got 1",
    );
    expect(() => peerStatistics([{ id: 'a', n: 5, mean: Infinity, sd: 1 }])).toThrow(
      "peerStatistics: lab 'a' mean must be a finite number, got Infinity",
    );
    expect(() => peerStatistics([{ id: 'a', n: 5, mean: 1, sd: -0.1 }])).toThrow(
      "peerStatistics: lab 'a' sd must not be negative, got -0.1",
    );
    expect(() => peerStatistics(isoLabs, { minLabs: 0 })).toThrow(
      'peerStatistics: minLabs must be an integer of at least 1, got 0',
    );
  });
});

describe('selectPeerTier', () => {
  const instrument = isoLabs.slice(0, 2);
  const method = isoLabs.slice(0, 5);
  const analyte = isoLabs;

  it('when the narrowest tier has enough labs, then it is used (docs/methods.md §2 tier fallback)', () => {
    const choice = selectPeerTier([
      { tier: 'instrument', labs: method },
      { tier: 'method', labs: analyte },
    ]);
    expect(choice.tier).toBe('instrument');
    expect(choice.skipped).toEqual([]);
  });

  it('when the narrow tier has too few labs, then the next broader tier is used and the skipped tier reported', () => {
    const choice = selectPeerTier([
      { tier: 'instrument', labs: instrument },
      { tier: 'method', labs: method },
      { tier: 'analyte', labs: analyte },
    ]);
    expect(choice.tier).toBe('method');
    expect(choice.skipped).toEqual([{ tier: 'instrument', labs: 2 }]);
    expect(choice.statistics.labs).toBe(5);
  });

  it('when no tier has enough labs, then the broadest tier with labs is returned as insufficient', () => {
    const choice = selectPeerTier([
      { tier: 'instrument', labs: [] },
      { tier: 'method', labs: instrument.slice(0, 1) },
      { tier: 'analyte', labs: instrument },
    ]);
    expect(choice.tier).toBe('analyte');
    expect(choice.statistics.sufficient).toBe(false);
    expect(choice.skipped).toEqual([
      { tier: 'instrument', labs: 0 },
      { tier: 'method', labs: 1 },
    ]);
  });

  it('when no tier has any lab, then it throws', () => {
    expect(() => selectPeerTier([{ tier: 'instrument', labs: [] }])).toThrow(
      'selectPeerTier: needs at least 1 tier with labs',
    );
  });
});
