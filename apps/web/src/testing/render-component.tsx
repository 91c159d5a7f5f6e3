// Renders one component with a fresh QueryClient and an in-memory router (for links), without the
// app's route tree.
import type { ReactNode } from 'react';
import { render } from '@testing-library/react';
import userEvent from '@testing-library/user-event';
import { QueryClientProvider } from '@tanstack/react-query';
import { MemoryRouter } from 'react-router-dom';
import { createTestQueryClient } from './render-app.tsx';

export function renderComponent(ui: ReactNode) {
  const queryClient = createTestQueryClient();
  const user = userEvent.setup();
  const result = render(
    <QueryClientProvider client={queryClient}>
      <MemoryRouter>{ui}</MemoryRouter>
    </QueryClientProvider>,
  );
  return { ...result, user, queryClient };
}
