import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderComponent } from '../../../testing/render-component.tsx';
import { PeriodPublishing } from './period-publishing.tsx';

const result = (state: string, version: number, reason: string | null) => ({
  status: 201,
  body: {
    period: {
      period: '2026-11',
      state,
      deadline: '2026-12-10T22:59:00.000Z',
      closedAt: null,
      publishedAt: '2026-12-13T14:00:00.000Z',
    },
    publication: {
      period: '2026-11',
      version,
      reason,
      publishedAt: '2026-12-13T14:00:00.000Z',
      publishedBy: null,
      statistics: 12,
    },
  },
});

describe('publishing a period', () => {
  it('when an open period is shown, then it cannot be published yet', () => {
    mockApi({});
    renderComponent(
      <PeriodPublishing
        period={{ period: '2026-11', state: 'open', deadline: '2026-12-10T22:59:00.000Z' }}
      />,
    );
    expect(screen.getByText('Close the period first')).toBeTruthy();
    expect(screen.queryByRole('button')).toBeNull();
  });

  it('when a closed period is published, then the publish request is sent after a confirmation', async () => {
    const api = mockApi({ 'POST /api/periods/2026-11/publish': result('published', 1, null) });
    const { user } = renderComponent(
      <PeriodPublishing
        period={{ period: '2026-11', state: 'closed', deadline: '2026-12-10T22:59:00.000Z' }}
      />,
    );
    await user.click(screen.getByRole('button', { name: /^Publish / }));
    const dialog = await screen.findByRole('dialog', { name: /^Publish / });
    await user.click(within(dialog).getByRole('button', { name: 'Publish' }));
    await waitFor(() => expect(screen.queryByRole('dialog')).toBeNull());
    expect(api.requests.find((r) => r.method === 'POST')).toMatchObject({
      path: '/api/periods/2026-11/publish',
      body: {},
    });
  });

  it('when a published period is republished, then a reason is required and sent', async () => {
    const api = mockApi({
      'GET /api/periods/2026-11/publications': {
        status: 200,
        body: [result('published', 1, null).body.publication],
      },
      'POST /api/periods/2026-11/republish': result('published', 2, 'late data'),
    });
    const { user } = renderComponent(
      <PeriodPublishing
        period={{ period: '2026-11', state: 'published', deadline: '2026-12-10T22:59:00.000Z' }}
      />,
    );
    expect(await screen.findByText('Version 1')).toBeTruthy();
    await user.click(screen.getByRole('button', { name: /^Republish / }));
    const dialog = await screen.findByRole('dialog', { name: /^Republish / });
    await user.click(within(dialog).getByRole('button', { name: 'Publish a new version' }));
    expect(await within(dialog).findByText(/Say why/)).toBeTruthy();
    expect(api.requests.some((r) => r.method === 'POST')).toBe(false);
    await user.type(within(dialog).getByLabelText(/Why is the period published again/), 'late data');
    await user.click(within(dialog).getByRole('button', { name: 'Publish a new version' }));
    await waitFor(() =>
      expect(api.requests.find((r) => r.method === 'POST')?.body).toEqual({ reason: 'late data' }),
    );
  });
});
