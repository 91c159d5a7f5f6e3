import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { labApiTokenSchema, type LabApiToken } from '@plumbline/contracts';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { buildLabUser } from '../../../testing/network-data.ts';
import { renderApp } from '../../../testing/render-app.tsx';
import { testLabId } from '../../../testing/lab-workspace-data.ts';

const me = buildMe('supervisor');
const analyst = buildLabUser({
  id: '4b3a2c1d-0e9f-4a8b-9c7d-6e5f4a3b2c09',
  name: 'Demo Analyst',
  email: 'analyst@kestrel-vale.example',
});
const self = buildLabUser({ id: me.id, name: me.name, email: me.email, role: 'supervisor' });
const SECRET = 'plb_invented-secret-for-the-test-0001';

function token(overrides: Partial<LabApiToken> = {}): LabApiToken {
  return labApiTokenSchema.parse({
    id: '6c5b4a39-0000-4000-8000-000000000001',
    labId: testLabId,
    name: 'Analyser middleware',
    prefix: 'plb_inve',
    createdAt: '2026-12-01T10:00:00.000Z',
    lastUsedAt: null,
    revokedAt: null,
    ...overrides,
  });
}

describe('lab administration page', () => {
  it('when the supervisor creates a token, then its secret is shown once with a copy button and a warning, and the list shows only its start', async () => {
    const tokens: LabApiToken[] = [];
    const api = mockApi({
      'GET /api/me': { status: 200, body: me },
      [`GET /api/labs/${testLabId}/users`]: { status: 200, body: [self, analyst] },
      [`GET /api/labs/${testLabId}/api-tokens`]: () => ({ status: 200, body: tokens }),
      [`POST /api/labs/${testLabId}/api-tokens`]: (request) => {
        const created = token({ name: (request.body as { name: string }).name });
        tokens.push(created);
        return { status: 201, body: { ...created, token: SECRET } };
      },
    });
    const { user } = renderApp('/lab/administration', { signedInAs: 'supervisor' });
    await screen.findByText(/No token yet/);

    await user.click(screen.getByRole('button', { name: 'Create a token' }));
    const dialog = await screen.findByRole('dialog', { name: 'Create an API token' });
    await user.type(within(dialog).getByLabelText('Name'), 'Analyser middleware');
    await user.click(within(dialog).getByRole('button', { name: 'Create token' }));

    const shown = await screen.findByRole('dialog', { name: 'Copy the new token now' });
    expect((within(shown).getByLabelText('Token “Analyser middleware”') as HTMLInputElement).value).toBe(
      SECRET,
    );
    expect(within(shown).getByText('This is the only time the token is shown')).toBeTruthy();
    expect(within(shown).getByRole('button', { name: 'Copy token' })).toBeTruthy();
    expect(api.requests.find((r) => r.method === 'POST')?.body).toEqual({ name: 'Analyser middleware' });

    await user.click(within(shown).getByRole('button', { name: 'I have copied it' }));
    const table = await screen.findByRole('table', { name: 'API tokens of your lab' });
    await waitFor(() => expect(within(table).getByText('plb_inve…')).toBeTruthy());
    // Once the dialog is closed, the secret is nowhere on the page.
    expect(document.body.textContent).not.toContain(SECRET);
  });

  it('when the supervisor revokes a token, then the API is asked to and the token shows as revoked', async () => {
    let revoked = false;
    const api = mockApi({
      'GET /api/me': { status: 200, body: me },
      [`GET /api/labs/${testLabId}/users`]: { status: 200, body: [self] },
      [`GET /api/labs/${testLabId}/api-tokens`]: () => ({
        status: 200,
        body: [token(revoked ? { revokedAt: '2026-12-02T10:00:00.000Z' } : {})],
      }),
      [`DELETE /api/labs/${testLabId}/api-tokens/6c5b4a39-0000-4000-8000-000000000001`]: () => {
        revoked = true;
        return { status: 204 };
      },
    });
    const { user } = renderApp('/lab/administration', { signedInAs: 'supervisor' });
    await user.click(await screen.findByRole('button', { name: 'Revoke Analyser middleware' }));
    await user.click(
      within(await screen.findByRole('dialog', { name: 'Revoke Analyser middleware?' })).getByRole('button', {
        name: 'Revoke token',
      }),
    );
    await screen.findByText(/^Revoked /);
    expect(api.requests.some((r) => r.method === 'DELETE')).toBe(true);
    expect(screen.queryByRole('button', { name: 'Revoke Analyser middleware' })).toBeNull();
  });

  it('when the supervisor invites someone, then the link to pass on is shown; and a role change is sent for that user only', async () => {
    const api = mockApi({
      'GET /api/me': { status: 200, body: me },
      [`GET /api/labs/${testLabId}/users`]: { status: 200, body: [self, analyst] },
      [`GET /api/labs/${testLabId}/api-tokens`]: { status: 200, body: [] },
      [`POST /api/labs/${testLabId}/invitations`]: {
        status: 201,
        body: {
          invitationId: '7d6c5b4a-0000-4000-8000-000000000001',
          user: {
            id: '7d6c5b4a-0000-4000-8000-000000000002',
            email: 'new.analyst@kestrel-vale.example',
            name: 'New Analyst',
            role: 'analyst',
            labId: testLabId,
          },
          expiresAt: '2026-12-09T10:00:00.000Z',
          link: 'http://localhost/invitations/invented-token',
        },
      },
      [`PATCH /api/labs/${testLabId}/users/${analyst.id}`]: {
        status: 200,
        body: { ...analyst, role: 'supervisor' },
      },
    });
    const { user } = renderApp('/lab/administration', { signedInAs: 'supervisor' });
    const users = await screen.findByRole('table', { name: 'Users of your lab' });
    // Nobody changes their own account.
    const ownRow = (await within(users).findByText(me.name)).closest('tr')!;
    expect(within(ownRow).queryByRole('button')).toBeNull();

    await user.click(screen.getByRole('button', { name: 'Invite a user' }));
    const dialog = await screen.findByRole('dialog', { name: 'Invite a user to your lab' });
    await user.type(within(dialog).getByLabelText('Name'), 'New Analyst');
    await user.type(within(dialog).getByLabelText('E-mail address'), 'new.analyst@kestrel-vale.example');
    await user.click(within(dialog).getByRole('button', { name: 'Create invitation' }));
    expect(((await within(dialog).findByLabelText(/Invitation link for/)) as HTMLInputElement).value).toBe(
      'http://localhost/invitations/invented-token',
    );
    await user.click(within(dialog).getByRole('button', { name: 'Done' }));

    await user.click(within(users).getByRole('button', { name: 'Make supervisor' }));
    await user.click(
      within(await screen.findByRole('dialog', { name: 'Make Demo Analyst supervisor?' })).getByRole(
        'button',
        { name: 'Change role' },
      ),
    );
    await waitFor(() => expect(api.requests.some((r) => r.method === 'PATCH')).toBe(true));
    const patch = api.requests.find((r) => r.method === 'PATCH')!;
    expect(patch.path).toBe(`/api/labs/${testLabId}/users/${analyst.id}`);
    expect(patch.body).toEqual({ role: 'supervisor' });
  });
});
