import { describe, expect, it } from 'vitest';
import { measurementUncertainty, peerMeanUncertaintyPct, robustMeanSd } from '../src/index.ts';

// Nordtest TR 537 (ed. 4) formulas, from memory of the handbook; no worked example was re-read for this
// test, so the expected values are computed by hand from the formulas (check by construction).
describe('measurementUncertainty (Nordtest TR 537)', () => {
  it('when given a CV and peer comparisons, then u(Rw), RMS bias, u(Cref), u(bias), uc and U = 2·uc follow the formulas', () => {
    const result = measurementUncertainty({
      cvPct: 3,
      comparisons: [
        { biasPct: 4, uRefPct: 0 },
        { biasPct: -2, uRefPct: 1 },
      ],
    });
    // RMS = √((16 + 4)/2) = √10; u(Cref) = (0 + 1)/2 = 0.5; u(bias) = √(10 + 0.25); uc = √(9 + 10.25).
    expect(result.uRw).toBe(3);
    expect(result.rmsBias).toBeCloseTo(Math.sqrt(10), 14);
    expect(result.uRef).toBe(0.5);
    expect(result.uBias).toBeCloseTo(Math.sqrt(10.25), 14);
    expect(result.uc).toBeCloseTo(Math.sqrt(19.25), 14);
    expect(result.U).toBeCloseTo(2 * Math.sqrt(19.25), 14);
  });

  it('when a coverage factor is given, then U = k · uc', () => {
    const result = measurementUncertainty({
      cvPct: 2,
      comparisons: [{ biasPct: 0, uRefPct: 0 }],
      coverageFactor: 3,
    });
    expect(result.U).toBeCloseTo(6, 14);
  });

  it('when the lab means spread with SD 0.2 around a peer mean of 5 over 16 labs, then u(Cref) = 100 · 0.2/(5 · √16) = 1 % (TR 537: s_R/√m, memory)', () => {
    expect(peerMeanUncertaintyPct(0.2, 5, 16)).toBe(1);
    expect(peerMeanUncertaintyPct(0.2, -5, 16)).toBe(1); // relative to |mean|
  });

  it('when the lab means are the ISO 13528 Annex E.3 example, then u(Cref) uses their robust s* = 0.496148 (converged, computed) and √12', () => {
    // Published example results as lab means, equal n, so the peer mean is their plain mean 17.44/12.
    const means = [1.69, 0.74, 2.05, 1.14, 2.19, 1.39, 1.52, 1.5, 1.58, 0.8, 1.21, 1.63];
    const { sd } = robustMeanSd(means);
    expect(sd).toBeCloseTo(0.496148, 6);
    expect(peerMeanUncertaintyPct(sd, 17.44 / 12, 12)).toBeCloseTo(
      (100 * 0.496148) / ((17.44 / 12) * Math.sqrt(12)),
      4,
    );
  });

  it('when the input is invalid, then it throws naming the function and the problem', () => {
    expect(() => measurementUncertainty({ cvPct: 0, comparisons: [{ biasPct: 1, uRefPct: 0 }] })).toThrow(
      'measurementUncertainty: cvPct must be greater than 0, got 0',
    );
    expect(() => measurementUncertainty({ cvPct: 2, comparisons: [] })).toThrow(
      'measurementUncertainty: needs at least 1 peer comparison, got 0',
    );
    expect(() => measurementUncertainty({ cvPct: 2, comparisons: [{ biasPct: 1, uRefPct: -1 }] })).toThrow(
      'measurementUncertainty: comparison 0 uRefPct must not be negative, got -1',
    );
    expect(() => peerMeanUncertaintyPct(0.2, 0, 4)).toThrow('peerMeanUncertaintyPct: peerMean is 0');
    expect(() => peerMeanUncertaintyPct(-0.2, 5, 4)).toThrow(
      'peerMeanUncertaintyPct: betweenLabSd must not be negative, got -0.2',
    );
    expect(() => peerMeanUncertaintyPct(4, 5, 0)).toThrow(
      'peerMeanUncertaintyPct: labs must be an integer of at least 1, got 0',
    );
  });
});
