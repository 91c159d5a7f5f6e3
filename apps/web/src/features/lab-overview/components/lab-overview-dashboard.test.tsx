import { screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { labOverviewSchema } from '@plumbline/contracts';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderApp } from '../../../testing/render-app.tsx';
import { buildUploadSummary } from '../../../testing/upload-data.ts';
import { testLabId } from '../../../testing/lab-workspace-data.ts';

function overview(late: boolean) {
  return labOverviewSchema.parse({
    lab: { ...buildMe('analyst').lab, preferredUnits: 'si' },
    currentPeriod: {
      period: '2026-11',
      state: 'open',
      deadline: '2026-12-10T23:59:00.000Z',
      submitted: !late,
      late,
      daysToDeadline: late ? -2 : 9,
      signoff: null,
    },
    flags: {
      period: '2026-11',
      published: false,
      rows: 24,
      rowsBySeverity: { fine: 12, acceptable: 9, warning: 2, action: 1 },
      rowsNotComputable: 0,
      bySeverity: { fine: 36, acceptable: 9, warning: 2, action: 2 },
    },
    recentUploads: [buildUploadSummary({ status: 'stored', rowsTotal: 24, rowsAccepted: 24 })],
    attention: [
      {
        kind: 'action-flags',
        severity: 'action',
        message: '1 report row of 2026-11 has an action flag: investigate and comment.',
        period: '2026-11',
        uploadId: null,
        count: 1,
      },
      {
        kind: 'unsigned-period',
        severity: 'warning',
        message: '5 periods are not signed off yet (latest 2026-10).',
        period: '2026-10',
        uploadId: null,
        count: 5,
      },
    ],
  });
}

describe('lab overview', () => {
  it('when the lab has flagged results, then the period, the counts by worst flag and what to do next show, each with its way there', async () => {
    mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      [`GET /api/labs/${testLabId}/overview`]: { status: 200, body: overview(false) },
    });
    renderApp('/lab', { signedInAs: 'analyst' });

    const period = await screen.findByRole('region', { name: 'This period' });
    expect(period.textContent).toContain('November 2026');
    expect(period.textContent).toContain('Submitted');
    expect(period.textContent).toContain('9 days left');
    expect(within(period).queryByText('Late')).toBeNull();

    const flags = screen.getByRole('region', { name: 'Flags in November 2026' });
    const counts = Object.fromEntries(
      within(flags)
        .getAllByRole('term')
        .map((term) => [term.textContent, term.nextElementSibling?.textContent]),
    );
    expect(counts).toEqual({ Action: '1', Warning: '2', Acceptable: '9', Fine: '12' });
    expect(
      within(flags).getByRole('link', { name: 'Review the 3 flagged results' }).getAttribute('href'),
    ).toBe('/lab/peer-report?period=2026-11&flagged=1');

    const todo = within(screen.getByRole('region', { name: 'Needs attention' })).getAllByRole('listitem');
    expect(todo[0].textContent).toContain('Action: 1 report row of 2026-11 has an action flag');
    expect(within(todo[1]).getByRole('link', { name: 'Open the report' }).getAttribute('href')).toBe(
      '/lab/peer-report?period=2026-10',
    );
    expect(
      within(screen.getByRole('table', { name: "The lab's latest uploads" })).getByText(
        'november-summary.csv',
      ),
    ).toBeTruthy();
  });

  it('when the deadline has passed without data, then the period says late and points to the uploads', async () => {
    mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      [`GET /api/labs/${testLabId}/overview`]: { status: 200, body: overview(true) },
    });
    renderApp('/lab', { signedInAs: 'analyst' });
    const period = await screen.findByRole('region', { name: 'This period' });
    expect(within(period).getByText('Late')).toBeTruthy();
    expect(period.textContent).toContain('2 days past the deadline');
    expect(within(period).getByRole('link', { name: 'Upload the control data' }).getAttribute('href')).toBe(
      '/lab/uploads',
    );
  });
});
