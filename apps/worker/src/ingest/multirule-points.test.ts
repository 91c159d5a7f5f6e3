import { describe, expect, it } from 'vitest';
import { pool } from '@plumbline/stats';
import { chooseTarget, evaluateGroup, labTargetBefore, type Target } from './multirule-points.ts';
import { ValuesBuffer } from './values-buffer.ts';

describe('labTargetBefore', () => {
  it('when the lab has earlier months, then the target is their pooled figures (docs/methods.md §1 pooling)', () => {
    const history = [
      { period: '2026-01', n: 20, mean: 5.0, sd: 0.1 },
      { period: '2026-02', n: 18, mean: 5.2, sd: 0.12 },
      { period: '2026-03', n: 22, mean: 9.9, sd: 1 },
    ];
    const target = labTargetBefore(history, '2026-03');
    const expected = pool(history.slice(0, 2));
    expect(target).toEqual({ mean: expected.mean, sd: expected.sd, source: 'lab' });
  });

  it('when the lab has no earlier month, then there is no lab target', () => {
    expect(labTargetBefore([{ period: '2026-03', n: 20, mean: 5, sd: 0.1 }], '2026-03')).toBeNull();
  });
});

describe('chooseTarget', () => {
  const lab: Target = { mean: 1, sd: 0.1, source: 'lab' };
  const peer: Target = { mean: 2, sd: 0.2, source: 'peer' };
  it('when several are available, then the lab comes before the peers, and the peers before the month itself', () => {
    const month = { period: '2026-03', n: 20, mean: 3, sd: 0.3 };
    expect(chooseTarget(lab, peer, month)).toBe(lab);
    expect(chooseTarget(null, peer, month)).toBe(peer);
    expect(chooseTarget(null, null, month)).toEqual({ mean: 3, sd: 0.3, source: 'month' });
    expect(chooseTarget(null, null, { ...month, n: 1 })).toBeNull();
  });
});

describe('evaluateGroup', () => {
  const procedure = {
    id: 'p',
    code: 'P',
    labId: 'l',
    analyteId: 'a',
    analyteName: 'A',
    analyteUnit: 'mmol/L',
    molarMass: null,
    plausibleLow: null,
    plausibleHigh: null,
    plausibilitySource: null,
    allowsNegative: false,
  };
  const lot = { id: 'lot', lotNumber: 'L', levels: [1, 2] };
  const period = { period: '2026-03', state: 'open' as const };
  const add = (b: ValuesBuffer, level: number, at: number, value: number, run: string | null = null) =>
    b.add({ procedure, lot, level, period, measuredAtMs: at, value, run, comment: null });

  it('when both levels of one run are beyond +2s, then both carry 2-2s (within a run across levels, Westgard 1981)', () => {
    const b = new ValuesBuffer();
    // Rows arrive out of order; the evaluation orders them by time.
    add(b, 2, 2000, 20.5);
    add(b, 1, 1000, 10.0);
    add(b, 1, 2000, 10.5);
    add(b, 2, 1000, 20.0);
    const targets = new Map<number, Target>([
      [1, { mean: 10, sd: 0.2, source: 'lab' }],
      [2, { mean: 20, sd: 0.2, source: 'lab' }],
    ]);
    const results = evaluateGroup(b, [0, 1, 2, 3], targets);
    expect(results.get(0)).toEqual({
      z: expect.closeTo(2.5, 12),
      rules: expect.arrayContaining(['1-2s', '2-2s']),
    });
    expect(results.get(2)).toEqual({
      z: expect.closeTo(2.5, 12),
      rules: expect.arrayContaining(['1-2s', '2-2s']),
    });
    expect(results.get(1)).toEqual({ z: 0, rules: [] });
  });

  it('when a level has no target, then its values get no result and the others are still evaluated', () => {
    const b = new ValuesBuffer();
    add(b, 1, 1000, 10.9);
    add(b, 2, 1000, 99);
    const results = evaluateGroup(b, [0, 1], new Map([[1, { mean: 10, sd: 0.2, source: 'month' as const }]]));
    expect(results.get(1)).toEqual({ z: null, rules: [] });
    expect(results.get(0)?.rules).toEqual(expect.arrayContaining(['1-3s']));
  });
});
