import { describe, expect, it } from 'vitest';
import { parseThresholds } from './thresholds.ts';

describe('parseThresholds', () => {
  it('when nothing is set, then the documented defaults apply (docs/methods.md §2: 3 labs; 50 % CV and n 10,000, common practice)', () => {
    expect(parseThresholds({})).toEqual({
      peerMinLabs: 3,
      maxCvPct: 50,
      maxN: 10_000,
      maxRowErrors: 1000,
      qcPlanMinPed: 0.9,
      qcPlanMaxPfr: 0.05,
    });
  });

  it('when values are set (an empty one meaning unset), then they are read as numbers', () => {
    expect(
      parseThresholds({
        PEER_MIN_LABS: '5',
        INGEST_MAX_CV_PCT: '30',
        INGEST_MAX_N: '',
        INGEST_MAX_ROW_ERRORS: '10',
      }),
    ).toEqual({
      peerMinLabs: 5,
      maxCvPct: 30,
      maxN: 10_000,
      maxRowErrors: 10,
      qcPlanMinPed: 0.9,
      qcPlanMaxPfr: 0.05,
    });
  });

  it('when a value is not a valid number, then the error names the variable', () => {
    expect(() => parseThresholds({ PEER_MIN_LABS: 'three', INGEST_MAX_N: '1' })).toThrow(
      /PEER_MIN_LABS[\s\S]*INGEST_MAX_N/,
    );
  });
});
