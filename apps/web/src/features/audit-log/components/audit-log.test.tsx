import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { buildMe } from '../../../testing/data.ts';
import { mockApi, type RecordedRequest } from '../../../testing/mock-api.ts';
import { buildAuditEvent, buildLabUser, testLabs } from '../../../testing/network-data.ts';
import { renderApp } from '../../../testing/render-app.tsx';

const lab = testLabs[0];
const labUser = buildLabUser();

function auditApi() {
  return mockApi({
    'GET /api/me': { status: 200, body: buildMe('coordinator') },
    'GET /api/labs': { status: 200, body: testLabs },
    [`GET /api/labs/${lab.id}/users`]: { status: 200, body: [labUser] },
    'GET /api/audit-events': { status: 200, body: { total: 1, items: [buildAuditEvent()] } },
    'GET /api/audit-events.csv': { status: 200, body: 'at,actor\n' },
  });
}

const lastEventsQuery = (requests: RecordedRequest[]) =>
  Object.fromEntries(requests.filter((r) => r.path === '/api/audit-events').at(-1)!.query);

describe('audit log', () => {
  it('when no filter is set, then the first page is asked for without empty parameters', async () => {
    const api = auditApi();
    renderApp('/network/audit-log', { signedInAs: 'coordinator' });

    const table = await screen.findByRole('table', { name: /Audit events/ });
    await within(table).findByText('lab.update');
    expect(lastEventsQuery(api.requests)).toEqual({ limit: '50', offset: '0' });
    // The change is summarised as "from → to".
    expect(within(table).getByText(`name: Old name → ${lab.name}`)).toBeTruthy();
  });

  it('when lab, person, kind and dates are chosen, then the API gets exactly those filters', async () => {
    const api = auditApi();
    const { user, router } = renderApp('/network/audit-log', { signedInAs: 'coordinator' });

    await screen.findByRole('option', { name: `${lab.code} · ${lab.name}` });
    await user.selectOptions(screen.getByLabelText('Lab'), lab.id);
    // The people of the chosen lab become choices.
    const person = await screen.findByRole('option', { name: `${labUser.name} (${labUser.email})` });
    await user.selectOptions(screen.getByLabelText('Who'), person);
    await user.type(screen.getByLabelText('Kind'), 'upload.stored');
    fireEvent.change(screen.getByLabelText('From'), { target: { value: '2026-11-01' } });
    fireEvent.change(screen.getByLabelText('To (inclusive)'), { target: { value: '2026-11-30' } });

    await waitFor(() =>
      expect(lastEventsQuery(api.requests)).toEqual({
        labId: lab.id,
        actorId: labUser.id,
        kind: 'upload.stored',
        from: '2026-11-01',
        to: '2026-11-30',
        limit: '50',
        offset: '0',
      }),
    );
    // The filters are in the address, so the view can be reloaded or shared.
    expect(new URLSearchParams(router.state.location.search).get('kind')).toBe('upload.stored');
  });

  it('when the page opens with filters in the address, then the first request already carries them', async () => {
    const api = auditApi();
    renderApp(`/network/audit-log?lab=${lab.id}&from=2026-10-01&offset=50`, { signedInAs: 'coordinator' });

    await screen.findByRole('table', { name: /Audit events/ });
    await waitFor(() => expect(api.requests.some((r) => r.path === '/api/audit-events')).toBe(true));
    expect(lastEventsQuery(api.requests)).toEqual({
      labId: lab.id,
      from: '2026-10-01',
      limit: '50',
      offset: '50',
    });
  });

  it('when the CSV is exported, then the file is fetched with the session cookie and the same filters and saved', async () => {
    const api = auditApi();
    const createObjectURL = vi.spyOn(URL, 'createObjectURL').mockReturnValue('blob:audit');
    vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => {});
    const click = vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(() => {});
    const { user } = renderApp(`/network/audit-log?lab=${lab.id}&kind=lab.update`, {
      signedInAs: 'coordinator',
    });

    await user.click(await screen.findByRole('button', { name: 'Export CSV' }));

    await waitFor(() => expect(click).toHaveBeenCalledTimes(1));
    const download = api.requests.find((r) => r.path === '/api/audit-events.csv');
    expect(download?.credentials).toBe('same-origin');
    expect(Object.fromEntries(download!.query)).toEqual({ labId: lab.id, kind: 'lab.update' });
    expect(createObjectURL).toHaveBeenCalledWith(expect.any(Blob));
    const anchor = click.mock.contexts[0] as HTMLAnchorElement;
    expect(anchor.download).toMatch(/^audit-log_\d{4}-\d{2}-\d{2}\.csv$/);
  });
});
