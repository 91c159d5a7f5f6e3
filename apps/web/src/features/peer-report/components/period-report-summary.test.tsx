import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import type { PeerReport } from '@plumbline/contracts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderComponent } from '../../../testing/render-component.tsx';
import { buildPeerReport, buildPeriods, testLabId } from '../../../testing/upload-data.ts';
import { PeriodReportSummary } from './period-report-summary.tsx';

const reportPath = `GET /api/labs/${testLabId}/peer-report`;

/** Two results: the first compared with an instrument-tier peer group and flagged, the second without peers. */
function reportWithPeers(statisticsPending: boolean): PeerReport {
  const report = buildPeerReport('2026-11', [
    { code: 'K1', level: 1, mean: 4.12 },
    { code: 'K1', level: 2, mean: 6.48 },
  ]);
  report.statisticsPending = statisticsPending;
  report.rows[0] = {
    ...report.rows[0],
    peer: { tier: 'instrument', labs: 6, n: 180, mean: 4.02, sd: 0.04, cv: 1.0, withinCv: 1.1 },
    sdi: 2.5,
    flags: [{ kind: 'sdi', severity: 'warning', message: 'SDI beyond 2' }],
  };
  return report;
}

describe('period report summary', () => {
  it('when a period is chosen, then its results, peer comparisons and flags are counted and the first rows listed', async () => {
    const api = mockApi({
      'GET /api/periods': { status: 200, body: buildPeriods() },
      [reportPath]: { status: 200, body: reportWithPeers(false) },
    });
    renderComponent(<PeriodReportSummary labId={testLabId} period="2026-11" onPeriodChange={vi.fn()} />);

    const figures = await screen.findByText('results stored');
    const list = figures.closest('dl')!;
    expect(
      within(list)
        .getAllByRole('definition')
        .map((d) => d.textContent),
    ).toEqual(['2', '1', '1']);
    expect(screen.getByText('+2.50')).toBeTruthy();
    expect(api.requests.find((r) => r.path.endsWith('/peer-report'))?.query.get('period')).toBe('2026-11');
  });

  it('when peer figures are still being recomputed, then the panel says so and asks again until they are ready', async () => {
    let calls = 0;
    mockApi({
      'GET /api/periods': { status: 200, body: buildPeriods() },
      [reportPath]: () => ({ status: 200, body: reportWithPeers(++calls === 1) }),
    });
    renderComponent(<PeriodReportSummary labId={testLabId} period="2026-11" onPeriodChange={vi.fn()} />);

    expect(await screen.findByText('Peer figures are being recomputed with the new data.')).toBeTruthy();
    await waitFor(
      () => expect(screen.queryByText('Peer figures are being recomputed with the new data.')).toBeNull(),
      {
        timeout: 4000,
      },
    );
    expect(calls).toBe(2);
  });

  it('when another period is picked, then the choice is handed up', async () => {
    mockApi({
      'GET /api/periods': { status: 200, body: buildPeriods() },
      [reportPath]: { status: 200, body: buildPeerReport('2026-11', []) },
    });
    const onPeriodChange = vi.fn();
    const { user } = renderComponent(
      <PeriodReportSummary labId={testLabId} period="2026-11" onPeriodChange={onPeriodChange} />,
    );
    await screen.findByText(/No results of your lab are stored for November 2026 yet/);

    await user.selectOptions(screen.getByLabelText('Period'), '2026-10');

    expect(onPeriodChange).toHaveBeenCalledWith('2026-10');
  });
});
