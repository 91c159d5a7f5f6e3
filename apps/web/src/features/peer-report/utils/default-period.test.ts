import { describe, expect, it } from 'vitest';
import { buildPeriods } from '../../../testing/upload-data.ts';
import { defaultReportPeriod } from './default-period.ts';

describe('default report period', () => {
  it('when two periods are open, then the one due first (and not yet past its deadline) is chosen', () => {
    expect(defaultReportPeriod(buildPeriods(), new Date('2026-12-01T12:00:00Z'))).toBe('2026-11');
  });

  it('when the first deadline has passed, then the next open period is chosen', () => {
    expect(defaultReportPeriod(buildPeriods(), new Date('2026-12-11T00:00:00Z'))).toBe('2026-12');
  });

  it('when every deadline has passed, then the latest period is chosen', () => {
    expect(defaultReportPeriod(buildPeriods(), new Date('2027-03-01T00:00:00Z'))).toBe('2026-12');
  });

  it('when there are no periods, then there is none to choose', () => {
    expect(defaultReportPeriod([])).toBeNull();
  });
});
