import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { participationBoardSchema } from '@plumbline/contracts';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { testLabs } from '../../../testing/network-data.ts';
import { renderApp } from '../../../testing/render-app.tsx';

const periods = [
  { period: '2026-11', state: 'closed', deadline: '2026-12-10T22:59:00.000Z' },
  { period: '2026-10', state: 'published', deadline: '2026-11-10T22:59:00.000Z' },
];

const board = participationBoardSchema.parse({
  period: {
    period: '2026-10',
    state: 'published',
    deadline: periods[1].deadline,
    closedAt: null,
    publishedAt: null,
  },
  totals: { labs: 3, complete: 1, partial: 1, none: 1, late: 1 },
  labs: [
    {
      lab: testLabs[0],
      proceduresRegistered: 4,
      proceduresWithData: 4,
      lateCount: 0,
      status: 'complete',
      missing: [],
      flags: [],
    },
    {
      lab: testLabs[1],
      proceduresRegistered: 4,
      proceduresWithData: 3,
      lateCount: 2,
      status: 'partial',
      missing: [
        {
          procedureId: '8d7c6b5a-4e3f-4a2b-9c1d-0e9f8a7b6c01',
          code: 'NA-1',
          analyte: { code: 'NA', name: 'Sodium' },
        },
      ],
      flags: [],
    },
    {
      lab: testLabs[2],
      proceduresRegistered: 2,
      proceduresWithData: 0,
      lateCount: 0,
      status: 'none',
      missing: [],
      flags: [],
    },
  ],
});

describe('participation board', () => {
  it('when a period is chosen in the address, then its board shows totals and one row per lab; details list what is missing', async () => {
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('coordinator') },
      'GET /api/periods': { status: 200, body: periods },
      'GET /api/periods/2026-10/participation': { status: 200, body: board },
    });
    const { user } = renderApp('/network/participation?period=2026-10', { signedInAs: 'coordinator' });

    const table = await screen.findByRole('table', { name: 'Participation of each lab' });
    expect(api.requests.some((r) => r.path === '/api/periods/2026-11/participation')).toBe(false);
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(3);
    expect(rows[1].textContent).toContain('3 / 4');
    expect(within(rows[1]).getByText('Partial')).toBeTruthy();

    await user.click(within(rows[1]).getByRole('button', { name: /Details/ }));
    expect(await within(table).findByText('NA-1')).toBeTruthy();
  });

  it('when sorted by late data and filtered to labs with nothing, then the rows follow', async () => {
    mockApi({
      'GET /api/me': { status: 200, body: buildMe('coordinator') },
      'GET /api/periods': { status: 200, body: periods },
      'GET /api/periods/2026-10/participation': { status: 200, body: board },
    });
    const { user } = renderApp('/network/participation?period=2026-10', { signedInAs: 'coordinator' });

    const table = await screen.findByRole('table', { name: 'Participation of each lab' });
    await within(table).findByText('L03');
    const firstCodes = () =>
      within(table)
        .getAllByRole('row')
        .slice(1)
        .map((row) => within(row).getAllByRole('cell')[0].textContent?.slice(0, 3));
    // Counts sort largest first on the first click.
    await user.click(within(table).getByRole('button', { name: /Late/ }));
    expect(within(table).getByRole('columnheader', { name: /Late/ }).getAttribute('aria-sort')).toBe(
      'descending',
    );
    expect(firstCodes()[0]).toBe('L07');

    await user.selectOptions(screen.getByLabelText('Status'), 'none');
    await waitFor(() => expect(firstCodes()).toEqual(['L11']));
  });
});
