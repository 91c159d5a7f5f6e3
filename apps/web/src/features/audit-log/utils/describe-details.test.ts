import { describe, expect, it } from 'vitest';
import { describeDetails } from './describe-details.ts';

describe('audit details summary', () => {
  it('when an edit recorded field changes and a reason, then each change reads "from → to" and the reason comes last', () => {
    expect(
      describeDetails({
        changes: {
          name: { from: 'North site', to: 'North and East sites' },
          active: { from: true, to: false },
        },
        reason: 'sites merged',
      }),
    ).toEqual(['name: North site → North and East sites', 'active: true → false', 'reason: sites merged']);
  });

  it('when a state change was recorded as from and to, then it reads as one transition before the reason', () => {
    expect(describeDetails({ to: 'open', from: 'closed', reason: 'corrected data' })).toEqual([
      'closed → open',
      'reason: corrected data',
    ]);
  });

  it('when a value was cleared, then it shows as a dash rather than "null"', () => {
    expect(describeDetails({ changes: { loinc: { from: '2345-7', to: null } } })).toEqual([
      'loinc: 2345-7 → —',
    ]);
  });

  it('when the details are plain values, then they are listed and nested objects are left to the full view', () => {
    expect(
      describeDetails({ email: 'new@lab.example', role: 'analyst', values: { code: 'X' }, reason: null }),
    ).toEqual(['email: new@lab.example', 'role: analyst']);
  });
});
