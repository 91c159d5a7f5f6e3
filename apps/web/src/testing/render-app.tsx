// Renders the real route tree at a URL, in memory, optionally signed in as a role.
import { render } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import type { Role } from '@plumbline/contracts';
import { AppProvider } from '../app/provider.tsx';
import { createAppRoutes } from '../app/router.tsx';
import { createQueryClient } from '../lib/query-client.ts';
import { startSession } from '../lib/session.ts';
import { buildSession } from './data.ts';

export function createTestQueryClient() {
  return createQueryClient({ defaultOptions: { queries: { retry: false }, mutations: { retry: false } } });
}

export function renderApp(url: string, options: { signedInAs?: Role } = {}) {
  if (options.signedInAs) startSession(buildSession(options.signedInAs));
  const queryClient = createTestQueryClient();
  const router = createMemoryRouter(createAppRoutes(queryClient), { initialEntries: [url] });
  const user = userEvent.setup();
  const result = render(
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>,
  );
  return { ...result, router, user, queryClient };
}
