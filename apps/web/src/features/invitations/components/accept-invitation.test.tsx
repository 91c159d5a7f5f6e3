import { screen, waitFor } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { getSession } from '../../../lib/session.ts';
import { buildMe, buildSession } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderApp } from '../../../testing/render-app.tsx';

const token = 'Zk3v9QeX1b7Lr2TnWc5Ya8Hp0Jd4Ms6U';
const invitation = {
  email: 'analyst@kestrel-vale.example',
  name: 'Demo Analyst',
  labName: 'Kestrel Vale Demo Laboratory',
  expiresAt: '2027-01-08T10:00:00.000Z',
};

describe('accepting an invitation', () => {
  it('when the invited user sets a password, then it is accepted with the token and they are signed in', async () => {
    const api = mockApi({
      [`GET /api/invitations/${token}`]: { status: 200, body: invitation },
      'POST /api/invitations/accept': { status: 200, body: { email: invitation.email } },
      'POST /api/auth/login': { status: 200, body: buildSession('analyst') },
      'GET /api/me': { status: 200, body: buildMe('analyst') },
    });
    const { user, router } = renderApp(`/invitations/${token}`);

    expect(await screen.findByText('Kestrel Vale Demo Laboratory')).toBeTruthy();
    await user.type(screen.getByLabelText('New password'), 'quiet harbour lantern');
    await user.type(screen.getByLabelText('Repeat the password'), 'quiet harbour lantern');
    await user.click(screen.getByRole('button', { name: 'Set password and sign in' }));

    await waitFor(() => expect(router.state.location.pathname).toBe('/lab'));
    const accept = api.requests.find((r) => r.path === '/api/invitations/accept');
    expect(accept?.body).toEqual({ token, password: 'quiet harbour lantern' });
    const login = api.requests.find((r) => r.path === '/api/auth/login');
    expect(login?.body).toEqual({ email: invitation.email, password: 'quiet harbour lantern' });
    expect(getSession()?.user.role).toBe('analyst');
  });

  it('when the password is too short or not repeated the same, then nothing is sent', async () => {
    const api = mockApi({ [`GET /api/invitations/${token}`]: { status: 200, body: invitation } });
    const { user } = renderApp(`/invitations/${token}`);

    await user.type(await screen.findByLabelText('New password'), 'short');
    await user.type(screen.getByLabelText('Repeat the password'), 'shorter');
    await user.click(screen.getByRole('button', { name: 'Set password and sign in' }));

    expect(await screen.findByText(/use at least 12 characters/i)).toBeTruthy();
    expect(await screen.findByText(/the two passwords are not the same/i)).toBeTruthy();
    expect(api.requests.filter((r) => r.method === 'POST')).toHaveLength(0);
  });

  it('when the invitation has been used, then the page says so and offers sign-in instead of a form', async () => {
    mockApi({
      [`GET /api/invitations/${token}`]: {
        status: 410,
        body: { error: { code: 'gone', message: 'This invitation has already been used. Sign in instead.' } },
      },
    });
    renderApp(`/invitations/${token}`);

    expect(await screen.findByText('This invitation can no longer be used')).toBeTruthy();
    expect(screen.getByText('This invitation has already been used. Sign in instead.')).toBeTruthy();
    expect(screen.getByRole('link', { name: 'Go to sign-in' })).toBeTruthy();
    expect(screen.queryByLabelText('New password')).toBeNull();
  });
});
