import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderApp } from '../../../testing/render-app.tsx';

const periods = [
  { period: '2026-12', state: 'open', deadline: '2027-01-10T22:59:00.000Z' },
  { period: '2026-11', state: 'closed', deadline: '2026-12-10T22:59:00.000Z' },
  { period: '2026-10', state: 'published', deadline: '2026-11-10T22:59:00.000Z' },
];
const me = { 'GET /api/me': { status: 200, body: buildMe('coordinator') } };
const detail = (period: string, state: string, deadline: string) => ({
  status: 200,
  body: { period, state, deadline, closedAt: null, publishedAt: null },
});

describe('cycles page', () => {
  it('when periods are listed, then each offers only the actions its state allows', async () => {
    mockApi({ ...me, 'GET /api/periods': { status: 200, body: periods } });
    renderApp('/network/cycles', { signedInAs: 'coordinator' });

    const table = await screen.findByRole('table', { name: 'Monthly periods' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(3);
    const [open, closed, published] = rows;
    expect(within(open).getByRole('button', { name: /^Close / })).toBeTruthy();
    expect(within(open).queryByRole('button', { name: /^Reopen / })).toBeNull();
    expect(within(closed).getByRole('button', { name: /^Reopen / })).toBeTruthy();
    expect(within(closed).getByRole('button', { name: /^Publish / })).toBeTruthy();
    expect(within(open).queryByRole('button', { name: /^Publish / })).toBeNull();
    // A published period can only be republished (with a reason).
    expect(
      within(published)
        .getAllByRole('button')
        .map((b) => b.textContent),
    ).toEqual(['Republish']);
    expect(within(published).getByText('Published')).toBeTruthy();
  });

  it('when a period is created, then the deadline typed in local time is sent as an ISO instant', async () => {
    const api = mockApi({
      ...me,
      'GET /api/periods': { status: 200, body: periods },
      'POST /api/periods': (request) => {
        const body = request.body as { period: string; deadline: string };
        return detail(body.period, 'open', body.deadline);
      },
    });
    const { user } = renderApp('/network/cycles', { signedInAs: 'coordinator' });

    await screen.findByRole('table', { name: 'Monthly periods' });
    await user.click(screen.getByRole('button', { name: 'Create a period' }));
    const dialog = await screen.findByRole('dialog', { name: 'Create a period' });
    // The month after the latest, with the usual deadline (10th of the next month, 23:59).
    expect((within(dialog).getByLabelText('Month') as HTMLInputElement).value).toBe('2027-01');
    expect((within(dialog).getByLabelText(/Submission deadline/) as HTMLInputElement).value).toBe(
      '2027-02-10T23:59',
    );
    await user.click(within(dialog).getByRole('button', { name: 'Create period' }));

    await waitFor(() => expect(screen.queryByRole('dialog')).toBeNull());
    const sent = api.requests.find((r) => r.method === 'POST');
    expect(sent?.body).toMatchObject({
      period: '2027-01',
      deadline: new Date(2027, 1, 10, 23, 59).toISOString(),
    });
  });

  it('when the API refuses the deadline, then its message shows beside the deadline field', async () => {
    mockApi({
      ...me,
      'GET /api/periods': { status: 200, body: periods },
      'PATCH /api/periods/2026-12': {
        status: 400,
        body: {
          error: {
            code: 'bad_request',
            message: 'Invalid body: deadline: must fall after 2026-12 has ended',
            details: [
              {
                path: 'deadline',
                message: 'must fall after the period has ended (after 2027-01-01T00:00:00.000Z)',
              },
            ],
          },
        },
      },
    });
    const { user } = renderApp('/network/cycles', { signedInAs: 'coordinator' });

    await user.click(await screen.findByRole('button', { name: 'Change the deadline of December 2026' }));
    const dialog = await screen.findByRole('dialog', { name: /Deadline of December 2026/ });
    await user.click(within(dialog).getByRole('button', { name: 'Save deadline' }));

    expect(await within(dialog).findByText(/Must fall after the period has ended/)).toBeTruthy();
    expect(
      within(dialog)
        .getByLabelText(/Submission deadline/)
        .getAttribute('aria-invalid'),
    ).toBe('true');
  });

  it('when a closed period is reopened, then a reason is required before anything is sent', async () => {
    const api = mockApi({
      ...me,
      'GET /api/periods': { status: 200, body: periods },
      'POST /api/periods/2026-11/reopen': detail('2026-11', 'open', periods[1].deadline),
    });
    const { user } = renderApp('/network/cycles', { signedInAs: 'coordinator' });

    await user.click(await screen.findByRole('button', { name: 'Reopen November 2026' }));
    const dialog = await screen.findByRole('dialog', { name: 'Reopen November 2026?' });
    await user.click(within(dialog).getByRole('button', { name: 'Reopen period' }));
    expect(await within(dialog).findByText(/Say why/)).toBeTruthy();
    expect(api.requests.some((r) => r.method === 'POST')).toBe(false);

    await user.type(within(dialog).getByLabelText(/Why is the period reopened/), 'a lab sent corrected data');
    await user.click(within(dialog).getByRole('button', { name: 'Reopen period' }));
    await waitFor(() => expect(screen.queryByRole('dialog')).toBeNull());
    expect(api.requests.find((r) => r.method === 'POST')?.body).toEqual({
      reason: 'a lab sent corrected data',
    });
  });
});
