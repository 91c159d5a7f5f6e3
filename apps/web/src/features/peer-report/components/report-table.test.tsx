import { screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { PeerReportRow } from '@plumbline/contracts';
import { renderComponent } from '../../../testing/render-component.tsx';
import { buildLabReport } from '../../../testing/lab-workspace-data.ts';
import { keyOfRow } from '../utils/report-rows.ts';
import { ReportTable } from './report-table.tsx';

const ZERO_SD_REASON = 'The peer SD is 0, so the SDI would divide by zero.';

/** The invented three-row report with its second row's comparison not computable (a peer SD of 0). */
function rowsWithOneNotComputable(): PeerReportRow[] {
  const rows = buildLabReport().rows;
  rows[1] = {
    ...rows[1],
    peer: { ...rows[1].peer!, sd: 0 },
    sdi: null,
    cvr: null,
    biasPct: null,
    sigma: null,
    flags: [],
    notComputable: { reason: ZERO_SD_REASON },
  };
  return rows;
}

describe('report table', () => {
  it('when a row cannot be computed, then it says so with the reason and the other rows keep their figures', () => {
    const rows = rowsWithOneNotComputable();
    const { container } = renderComponent(
      <ReportTable rows={rows} caption="Peer report" detailHref={() => '/detail'} emptyMessage="No rows" />,
    );
    const table = screen.getByRole('table', { name: 'Peer report' });
    const notes = container.querySelectorAll('tr[data-not-computable]');
    expect(notes).toHaveLength(1);
    expect(notes[0].textContent).toContain('Comparison cannot be computed:');
    expect(notes[0].textContent).toContain(ZERO_SD_REASON);

    // The line follows the row it explains, whose SDI cell says it cannot be computed.
    const broken = container.querySelector(`tr[data-row-key="${keyOfRow(rows[1])}"]`)!;
    expect(broken.nextElementSibling).toBe(notes[0]);
    expect(within(broken as HTMLElement).getByText('cannot be computed')).toBeTruthy();

    // The other rows still show their SDI (+4.50 and the glucose row's).
    const first = container.querySelector(`tr[data-row-key="${keyOfRow(rows[0])}"]`) as HTMLElement;
    expect(within(first).getByText('+4.50')).toBeTruthy();
    expect(within(first).queryByText('cannot be computed')).toBeNull();
    expect(within(table).getAllByText('cannot be computed')).toHaveLength(1);
  });

  it('when every row is computed, then no row says it cannot be computed', () => {
    const { container } = renderComponent(
      <ReportTable
        rows={buildLabReport().rows}
        caption="Peer report"
        detailHref={() => '/detail'}
        emptyMessage="No rows"
      />,
    );
    expect(container.querySelectorAll('tr[data-not-computable]')).toHaveLength(0);
    expect(screen.queryByText('cannot be computed')).toBeNull();
  });
});
