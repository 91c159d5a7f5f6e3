import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { buildLabUser, testLabs } from '../../../testing/network-data.ts';
import { renderApp } from '../../../testing/render-app.tsx';

const lab = testLabs[0];
const baseAnswers = {
  'GET /api/me': { status: 200, body: buildMe('coordinator') },
  'GET /api/labs': { status: 200, body: testLabs },
  [`GET /api/labs/${lab.id}/users`]: {
    status: 200,
    body: [
      buildLabUser(),
      buildLabUser({
        id: '4b3a2c1d-0e9f-4a8b-9c7d-6e5f4a3b2c02',
        email: 'new@harrow-fen.example',
        name: 'Invited Person',
        active: false,
        invitationPending: true,
      }),
    ],
  },
};

describe('labs page', () => {
  it('when the labs load, then each lab is listed with its code and state, inactive ones marked', async () => {
    mockApi(baseAnswers);
    const { user, router } = renderApp('/network/labs', { signedInAs: 'coordinator' });

    const table = await screen.findByRole('table', { name: 'Member labs' });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows.map((row) => within(row).getAllByRole('cell')[0].textContent)).toEqual(['L03', 'L07', 'L11']);
    expect(within(rows[2]).getByText('Inactive')).toBeTruthy();

    // Opening an inactive lab offers to reactivate it, not to deactivate it.
    await user.click(within(rows[2]).getByRole('button', { name: 'Open lab L11' }));
    const panel = await screen.findByRole('region', { name: testLabs[2].name });
    expect(within(panel).getByRole('button', { name: 'Reactivate L11' })).toBeTruthy();
    expect(within(panel).queryByRole('button', { name: 'Deactivate L11' })).toBeNull();
    expect(new URLSearchParams(router.state.location.search).get('lab')).toBe(testLabs[2].id);
  });

  it('when a user is invited, then the link from the API is shown with a copy button and the e-mail caveat', async () => {
    const link = 'http://plumbline.example/invitations/abc123';
    const api = mockApi({
      ...baseAnswers,
      [`POST /api/labs/${lab.id}/invitations`]: {
        status: 201,
        body: {
          invitationId: '7c6b5a4d-3e2f-4a1b-8c9d-0e1f2a3b4c5d',
          user: {
            id: '4b3a2c1d-0e9f-4a8b-9c7d-6e5f4a3b2c09',
            email: 'newcomer@harrow-fen.example',
            name: 'Newcomer',
            role: 'supervisor',
            labId: lab.id,
          },
          expiresAt: '2026-12-09T10:00:00.000Z',
          link,
        },
      },
    });
    const { user } = renderApp(`/network/labs?lab=${lab.id}`, { signedInAs: 'coordinator' });

    const panel = await screen.findByRole('region', { name: lab.name });
    expect(await within(panel).findByText('Invitation pending')).toBeTruthy();
    await user.click(within(panel).getByRole('button', { name: 'Invite a user' }));
    const dialog = await screen.findByRole('dialog', { name: `Invite a user to ${lab.code}` });
    await user.type(within(dialog).getByLabelText('Name'), 'Newcomer');
    await user.type(within(dialog).getByLabelText('E-mail address'), 'Newcomer@Harrow-Fen.example');
    await user.selectOptions(within(dialog).getByLabelText('Role'), 'supervisor');
    await user.click(within(dialog).getByRole('button', { name: 'Create invitation' }));

    const linkField = (await within(dialog).findByLabelText(/Invitation link for/)) as HTMLInputElement;
    expect(linkField.value).toBe(link);
    expect(within(dialog).getByRole('button', { name: 'Copy link' })).toBeTruthy();
    expect(within(dialog).getByText('E-mail delivery is not configured')).toBeTruthy();
    const sent = api.requests.find((r) => r.method === 'POST');
    // The contract lower-cases the address before it is sent.
    expect(sent?.body).toEqual({
      name: 'Newcomer',
      email: 'newcomer@harrow-fen.example',
      role: 'supervisor',
    });
  });

  it('when the invited address is taken, then the API’s message shows beside the e-mail field', async () => {
    mockApi({
      ...baseAnswers,
      [`POST /api/labs/${lab.id}/invitations`]: {
        status: 409,
        body: {
          error: {
            code: 'conflict',
            message: 'A user with the e-mail address x@harrow-fen.example already exists.',
            details: [{ path: 'email', message: 'this e-mail address is already in use' }],
          },
        },
      },
    });
    const { user } = renderApp(`/network/labs?lab=${lab.id}`, { signedInAs: 'coordinator' });

    await user.click(await screen.findByRole('button', { name: 'Invite a user' }));
    const dialog = await screen.findByRole('dialog', { name: `Invite a user to ${lab.code}` });
    await user.type(within(dialog).getByLabelText('Name'), 'X');
    await user.type(within(dialog).getByLabelText('E-mail address'), 'x@harrow-fen.example');
    await user.click(within(dialog).getByRole('button', { name: 'Create invitation' }));

    expect(await within(dialog).findByText('This e-mail address is already in use')).toBeTruthy();
    expect(within(dialog).getByLabelText('E-mail address').getAttribute('aria-invalid')).toBe('true');
  });

  it('when a lab is deactivated, then it is confirmed first and the reason goes with the request', async () => {
    const api = mockApi({
      ...baseAnswers,
      [`POST /api/labs/${lab.id}/deactivate`]: {
        status: 200,
        body: { ...lab, active: false, preferredUnits: 'si', createdAt: '2026-01-01T00:00:00.000Z' },
      },
    });
    const { user } = renderApp(`/network/labs?lab=${lab.id}`, { signedInAs: 'coordinator' });

    await user.click(await screen.findByRole('button', { name: `Deactivate ${lab.code}` }));
    const dialog = await screen.findByRole('dialog', { name: `Deactivate lab ${lab.code}?` });
    expect(api.requests.some((r) => r.method === 'POST')).toBe(false);
    // A destructive confirmation starts on the safe choice.
    expect(document.activeElement?.textContent).toBe('Cancel');
    await user.type(within(dialog).getByLabelText(/Reason/), 'left the network');
    await user.click(within(dialog).getByRole('button', { name: 'Deactivate lab' }));

    await waitFor(() => expect(screen.queryByRole('dialog')).toBeNull());
    const sent = api.requests.find((r) => r.path === `/api/labs/${lab.id}/deactivate`);
    expect(sent?.body).toEqual({ reason: 'left the network' });
    expect(await screen.findByText(`Lab ${lab.code} deactivated.`)).toBeTruthy();
  });

  it('when an enrolment uses a taken code, then the API’s message is shown and the dialog stays open', async () => {
    const message = 'A lab with the code "L03" already exists; lab codes must be unique.';
    mockApi({
      ...baseAnswers,
      'POST /api/labs': { status: 409, body: { error: { code: 'conflict', message } } },
    });
    const { user } = renderApp('/network/labs', { signedInAs: 'coordinator' });

    await user.click(await screen.findByRole('button', { name: 'Enrol a lab' }));
    const dialog = await screen.findByRole('dialog', { name: 'Enrol a lab' });
    await user.type(within(dialog).getByLabelText('Lab code'), 'L03');
    await user.type(within(dialog).getByLabelText('Lab name'), 'Another Demo Laboratory');
    await user.click(within(dialog).getByRole('button', { name: 'Enrol lab' }));

    expect(await within(dialog).findByText(message)).toBeTruthy();
  });
});
