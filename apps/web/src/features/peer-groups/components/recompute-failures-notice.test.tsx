import { screen, waitFor } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { PeerStatisticsFailure } from '@plumbline/contracts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderComponent } from '../../../testing/render-component.tsx';
import { ids } from '../utils/test-data.ts';
import { RecomputeFailuresNotice } from './recompute-failures-notice.tsx';

// Invented group, lot and analyte.
const failure: PeerStatisticsFailure = {
  peerGroupId: ids.groupA,
  tier: 'instrument',
  groupLabel: 'Testline X1 · enzymatic · kit R',
  controlLot: { id: ids.lot, lotNumber: 'QC-7781' },
  analyte: { id: ids.analyte, code: 'GLU', name: 'Glucose' },
  level: 2,
  period: '2026-11',
  scope: 'period',
  reason: 'the peer SD is not a finite number (Infinity)',
  failedAt: '2026-12-02T08:15:00.000Z',
};

describe('recompute failures notice', () => {
  it('when a group could not be computed, then the coordinator sees which group, period and why', async () => {
    const api = mockApi({ 'GET /api/peer-groups/failures': { status: 200, body: [failure] } });
    renderComponent(<RecomputeFailuresNotice period="2026-11" />);
    const heading = await screen.findByRole('heading', {
      name: 'The figures of 1 peer group could not be computed',
    });
    const notice = heading.closest('section')!;
    expect(notice.textContent).toContain('Glucose, lot QC-7781, level 2, 2026-11');
    expect(notice.textContent).toContain('the peer SD is not a finite number (Infinity)');
    expect(notice.textContent).toContain('Testline X1 · enzymatic · kit R');
    expect(api.requests[0].query.get('period')).toBe('2026-11');
  });

  it('when every group was computed, then nothing is shown', async () => {
    const api = mockApi({ 'GET /api/peer-groups/failures': { status: 200, body: [] } });
    const { container } = renderComponent(<RecomputeFailuresNotice />);
    await waitFor(() => expect(api.requests).toHaveLength(1));
    expect(container.querySelector('[data-recompute-failures]')).toBeNull();
  });
});
