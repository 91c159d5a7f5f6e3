import { describe, expect, it } from 'vitest';
import { defaultControlLot, defaultPeerGroupPeriod } from './defaults.ts';

const period = (p: string, state: 'open' | 'closed' | 'published') => ({
  period: p,
  state,
  deadline: `${p}-28T00:00:00Z`,
});
const lot = (lotNumber: string, expiresOn: string) => ({
  id: '9a1b2c3d-4e5f-4a6b-8c7d-0e1f2a3b4c51',
  lotNumber,
  material: { id: '9a1b2c3d-4e5f-4a6b-8c7d-0e1f2a3b4c41', name: 'Control' },
  levels: [1, 2],
  expiresOn,
});

describe('default choices of the peer-group page', () => {
  it('when some periods are not published, then the oldest of them is chosen; else the latest', () => {
    expect(
      defaultPeerGroupPeriod([
        period('2026-12', 'open'),
        period('2026-10', 'published'),
        period('2026-11', 'closed'),
      ]),
    ).toBe('2026-11');
    expect(defaultPeerGroupPeriod([period('2026-09', 'published'), period('2026-10', 'published')])).toBe(
      '2026-10',
    );
    expect(defaultPeerGroupPeriod([])).toBeNull();
  });

  it('when lots are listed, then the one that expires last is chosen', () => {
    expect(defaultControlLot([lot('A', '2027-01-31'), lot('B', '2027-06-30')])?.lotNumber).toBe('B');
    expect(defaultControlLot([])).toBeNull();
  });
});
