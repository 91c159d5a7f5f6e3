import { screen, waitFor } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { getSession } from '../lib/session.ts';
import { buildMe, buildSession } from '../testing/data.ts';
import { mockApi } from '../testing/mock-api.ts';
import { renderApp } from '../testing/render-app.tsx';

const notAllowedHeading = { name: 'Not available for your role', level: 1 } as const;

describe('role guard', () => {
  it('when an analyst opens a supervisor-only page, then "not available for your role" shows instead', async () => {
    mockApi({ 'GET /api/me': { status: 200, body: buildMe('analyst') } });
    renderApp('/lab/procedures', { signedInAs: 'analyst' });

    expect(await screen.findByRole('heading', notAllowedHeading)).toBeTruthy();
    expect(screen.queryByRole('heading', { name: 'Procedures', level: 1 })).toBeNull();
  });

  it('when a supervisor opens the same page, then it shows', async () => {
    mockApi({ 'GET /api/me': { status: 200, body: buildMe('supervisor') } });
    renderApp('/lab/procedures', { signedInAs: 'supervisor' });

    expect(await screen.findByRole('heading', { name: 'Procedures', level: 1 })).toBeTruthy();
    expect(screen.queryByRole('heading', notAllowedHeading)).toBeNull();
  });

  it('when a coordinator opens a member-lab page, then it is not available', async () => {
    mockApi({ 'GET /api/me': { status: 200, body: buildMe('coordinator') } });
    renderApp('/lab/uploads', { signedInAs: 'coordinator' });

    expect(await screen.findByRole('heading', notAllowedHeading)).toBeTruthy();
  });

  it('when an analyst opens a network page, then it is not available', async () => {
    mockApi({ 'GET /api/me': { status: 200, body: buildMe('analyst') } });
    renderApp('/network/peer-groups', { signedInAs: 'analyst' });

    expect(await screen.findByRole('heading', notAllowedHeading)).toBeTruthy();
  });
});

describe('routes', () => {
  it.each([
    ['analyst', '/lab', 'Overview'],
    ['supervisor', '/lab', 'Overview'],
    ['coordinator', '/network', 'Network overview'],
  ] as const)('when a %s opens "/", then their home %s shows', async (role, homePath, heading) => {
    mockApi({ 'GET /api/me': { status: 200, body: buildMe(role) } });
    const { router } = renderApp('/', { signedInAs: role });

    expect(await screen.findByRole('heading', { name: heading, level: 1 })).toBeTruthy();
    expect(router.state.location.pathname).toBe(homePath);
  });

  it('when a page shows, then the tab title names it', async () => {
    mockApi({ 'GET /api/me': { status: 200, body: buildMe('coordinator') } });
    renderApp('/network/audit-log', { signedInAs: 'coordinator' });

    await screen.findByRole('heading', { name: 'Audit log', level: 1 });
    await waitFor(() => expect(document.title).toBe('Audit log · Plumbline'));
  });

  it('when the address matches no page, then "page not found" shows', async () => {
    mockApi({ 'GET /api/me': { status: 200, body: buildMe('analyst') } });
    renderApp('/lab/no-such-page', { signedInAs: 'analyst' });

    expect(await screen.findByRole('heading', { name: 'Page not found', level: 1 })).toBeTruthy();
  });

  it('when the lab overview shows, then it names the lab, its code and the role', async () => {
    mockApi({ 'GET /api/me': { status: 200, body: buildMe('supervisor') } });
    renderApp('/lab', { signedInAs: 'supervisor' });

    const facts = await screen.findByRole('region', { name: 'Your lab' });
    await waitFor(() => expect(facts.textContent).toContain('Kestrel Vale Demo Laboratory'));
    expect(facts.textContent).toContain('L07');
    expect(facts.textContent).toContain('Supervisor');
  });
});

describe('session', () => {
  it('when a signed-out user opens a page, then they sign in and come back to it', async () => {
    mockApi({
      'POST /api/auth/login': { status: 200, body: buildSession('analyst') },
      'GET /api/me': { status: 200, body: buildMe('analyst') },
    });
    const { router, user } = renderApp('/lab/peer-report');

    await screen.findByRole('heading', { name: 'Sign in', level: 1 });
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(router.state.location.search).toBe(`?redirectTo=${encodeURIComponent('/lab/peer-report')}`);

    await user.type(screen.getByLabelText('E-mail address'), 'analyst@kestrel-vale.example');
    await user.type(screen.getByLabelText('Password'), 'plumbline-demo');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));

    expect(await screen.findByRole('heading', { name: 'Peer report', level: 1 })).toBeTruthy();
    expect(router.state.location.pathname).toBe('/lab/peer-report');
  });

  it('when the return address points to another site, then sign-in goes to the role home instead', async () => {
    mockApi({
      'POST /api/auth/login': { status: 200, body: buildSession('coordinator') },
      'GET /api/me': { status: 200, body: buildMe('coordinator') },
    });
    const { router, user } = renderApp(`/sign-in?redirectTo=${encodeURIComponent('//elsewhere.example/x')}`);

    await user.type(await screen.findByLabelText('E-mail address'), 'coordinator@network.example');
    await user.type(screen.getByLabelText('Password'), 'plumbline-demo');
    await user.click(screen.getByRole('button', { name: 'Sign in' }));

    await screen.findByRole('heading', { name: 'Network overview', level: 1 });
    expect(router.state.location.pathname).toBe('/network');
  });

  it('when the API no longer accepts the token, then the session ends and sign-in explains why', async () => {
    mockApi({
      'GET /api/me': {
        status: 401,
        body: { error: { code: 'unauthenticated', message: 'The token has expired.' } },
      },
    });
    const { router } = renderApp('/lab/uploads', { signedInAs: 'analyst' });

    expect(await screen.findByText('Your session has ended. Sign in again to continue.')).toBeTruthy();
    expect(getSession()).toBeNull();
    expect(router.state.location.pathname).toBe('/sign-in');
    expect(router.state.location.search).toContain(encodeURIComponent('/lab/uploads'));
  });
});
