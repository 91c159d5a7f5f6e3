import { screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { Role } from '@plumbline/contracts';
import { buildMe } from '../../testing/data.ts';
import { mockApi } from '../../testing/mock-api.ts';
import { renderApp } from '../../testing/render-app.tsx';

const coordinatorItems = [
  'Network overview',
  'Catalogue',
  'Labs',
  'Peer groups',
  'Lot comparisons',
  'Cycles',
  'Participation',
  'Audit log',
];
const labItems = [
  'Overview',
  'Uploads',
  'Peer report',
  'QC plan',
  'Studies',
  'Current intervals',
  'Verifications',
];
const supervisorItems = ['Procedures', 'Lab administration'];

async function navigationLinkNames(role: Role, url: string): Promise<string[]> {
  mockApi({ 'GET /api/me': { status: 200, body: buildMe(role) } });
  renderApp(url, { signedInAs: role });
  const navigation = await screen.findByRole('navigation', { name: 'Main' });
  return within(navigation)
    .getAllByRole('link')
    .map((link) => link.textContent?.trim() ?? '');
}

describe('app layout navigation', () => {
  it('when a coordinator is signed in, then the navigation lists the network areas and no lab pages', async () => {
    const names = await navigationLinkNames('coordinator', '/network');
    expect(names).toEqual(expect.arrayContaining(coordinatorItems));
    for (const item of [...labItems, ...supervisorItems]) expect(names).not.toContain(item);
  });

  it('when an analyst is signed in, then the navigation lists the lab pages and none of the coordinator or supervisor pages', async () => {
    const names = await navigationLinkNames('analyst', '/lab');
    expect(names).toEqual(labItems);
    for (const item of [...coordinatorItems, ...supervisorItems]) expect(names).not.toContain(item);
  });

  it('when a supervisor is signed in, then the navigation adds procedures and lab administration', async () => {
    const names = await navigationLinkNames('supervisor', '/lab');
    expect(names).toEqual([...labItems, ...supervisorItems]);
  });

  it('when the user is known, then the header names the lab and the footer carries the caution', async () => {
    mockApi({ 'GET /api/me': { status: 200, body: buildMe('analyst') } });
    renderApp('/lab', { signedInAs: 'analyst' });

    const banner = await screen.findByRole('banner');
    expect(await within(banner).findByText('Kestrel Vale Demo Laboratory')).toBeTruthy();
    const footer = screen.getByRole('contentinfo');
    expect(footer.textContent).toMatch(/do not\s+replace, the laboratory director.s judgement/);
    expect(footer.textContent).toMatch(/reviewed before clinical\s+use/);
  });

  it('when the user signs out, then the API is told and the sign-in page shows', async () => {
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      'POST /api/auth/logout': { status: 204 },
    });
    const { user, router } = renderApp('/lab', { signedInAs: 'analyst' });

    await user.click(await screen.findByRole('button', { name: 'Sign out' }));

    expect(await screen.findByRole('heading', { name: 'Sign in', level: 1 })).toBeTruthy();
    expect(router.state.location.pathname).toBe('/sign-in');
    const logout = api.requests.find((request) => request.path === '/api/auth/logout');
    expect(logout?.credentials).toBe('same-origin');
  });
});
