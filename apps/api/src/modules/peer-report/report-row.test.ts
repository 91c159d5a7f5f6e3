import { describe, expect, it } from 'vitest';
import { standing } from '@plumbline/stats';
import type { PeerFigures, PeerReportRow } from '@plumbline/contracts';
import { compare, figuresOf, finiteRow, notComputableRow, type RowIdentity } from './report-row.ts';

// Invented figures in mmol/L; the expected standing comes from @plumbline/stats (whose own tests check
// it against docs/methods.md §3), so these tests are about which rows can be compared, not the arithmetic.
const lab = figuresOf({ n: 20, mean: 5.6, sd: 0.12 });
const peer: PeerFigures = { tier: 'instrument', labs: 6, n: 120, mean: 5.5, sd: 0.1, cv: 1.8, withinCv: 1.9 };

const identity: RowIdentity = {
  procedure: { id: '7e1f0c2a-5b3d-4e8f-9a1b-2c3d4e5f6001', code: 'GLU1' },
  analyte: {
    code: 'GLU',
    name: 'Glucose',
    unit: 'mmol/L',
    decimals: 2,
    teaPct: null,
    teaAbsolute: null,
    teaSource: null,
  },
  controlLot: { id: '7e1f0c2a-5b3d-4e8f-9a1b-2c3d4e5f6002', lotNumber: 'LOT-1' },
  level: 1,
  unit: 'mmol/L',
  canonicalUnit: 'mmol/L',
  decimals: 2,
  source: 'summary',
  late: false,
};

function computedRow(overrides: Partial<PeerReportRow> = {}): PeerReportRow {
  const s = standing(lab, { mean: peer.mean, sd: peer.sd, withinCv: peer.withinCv! });
  return {
    ...identity,
    lab: { n: lab.n, mean: lab.mean, sd: lab.sd, cv: lab.cv },
    peer,
    peerNote: 'Compared with 6 labs.',
    sdi: s.sdi,
    cvr: s.cvr,
    biasPct: s.biasPct,
    sigma: null,
    tea: null,
    cumulative: { lab: null, peer: null, sdi: null, cvr: null, notComputable: null },
    excluded: null,
    flags: [],
    notComputable: null,
    ...overrides,
  };
}

describe('comparing a row with its peers', () => {
  it('when the figures are usable, then the standing is that of @plumbline/stats', () => {
    const result = compare(lab, peer);
    expect(result.problem).toBeNull();
    expect(result.standing).toEqual(standing(lab, { mean: 5.5, sd: 0.1, withinCv: 1.9 }));
  });

  it('when the peer SD is 0, then the row cannot be computed and the reason names the peer SD', () => {
    const result = compare(lab, { ...peer, sd: 0 });
    expect(result.standing).toBeNull();
    expect(result.problem).toBe('The peer SD is 0, so the SDI would divide by zero.');
  });

  it('when the peers’ within-lab CV is 0 or unknown, then the reason names the CVR', () => {
    expect(compare(lab, { ...peer, withinCv: 0 }).problem).toContain('CVR would divide by zero');
    expect(compare(lab, { ...peer, withinCv: null }).problem).toContain('within-lab CV is unknown');
  });

  it('when a figure is not finite, then the reason names it', () => {
    expect(compare(figuresOf({ n: 20, mean: Infinity, sd: 0.1 }), peer).problem).toBe(
      'Your mean is not a finite number (Infinity).',
    );
    expect(compare(lab, { ...peer, mean: Number.NaN }).problem).toBe('The peer mean is not a number.');
    expect(compare(lab, { ...peer, sd: -Infinity }).problem).toBe(
      'The peer SD is not a finite number (-Infinity).',
    );
  });

  it('when the standing overflows (finite inputs, infinite SDI), then the row cannot be computed', () => {
    // 1e308 / 1e-10 exceeds the largest double (about 1.8e308, IEEE 754 binary64): the SDI is Infinity.
    const huge = figuresOf({ n: 20, mean: 1e308, sd: 1 });
    const result = compare(huge, { ...peer, sd: 1e-10 });
    expect(result.standing).toBeNull();
    // The statistics package refuses the non-finite SDI itself and names it (standing checks its outputs).
    expect(result.problem).toMatch(/SDI is not (a )?finite/);
    expect(result.problem).toContain('Infinity');
  });
});

describe('a row as the report sends it', () => {
  it('when a computed row holds a non-finite figure, then it is dropped, scores are removed and the reason given', () => {
    const row = finiteRow(computedRow({ peer: { ...peer, mean: Infinity } }));
    expect(row.peer).toBeNull();
    expect(row.sdi).toBeNull();
    expect(row.flags).toEqual([]);
    expect(row.notComputable?.reason).toBe('The peer figures are not finite numbers in the units shown.');
    expect(JSON.parse(JSON.stringify(row)).lab.mean).toBe(5.6);
  });

  it('when every figure is finite, then the row is left as it is', () => {
    const row = computedRow();
    expect(finiteRow(row)).toBe(row);
  });

  it('when building a row threw, then the fallback row keeps the identity and only the finite lab figures', () => {
    const row = notComputableRow(identity, figuresOf({ n: 20, mean: Infinity, sd: 0.1 }), {
      reason: 'boom',
    });
    expect(row.procedure.code).toBe('GLU1');
    expect(row.lab).toEqual({ n: 20, mean: null, sd: 0.1, cv: null });
    expect(row.notComputable).toEqual({ reason: 'boom' });
    expect(row.peer).toBeNull();
  });
});
