import { QueryClient, type DefaultOptions } from '@tanstack/react-query';
import { isApiError } from './api-client.ts';

/** Retry only what can succeed on a second try: network failures and 5xx, never a 4xx answer. */
export function shouldRetry(failureCount: number, error: unknown): boolean {
  if (failureCount >= 2) return false;
  if (isApiError(error) && error.status >= 400 && error.status < 500) return false;
  return true;
}

export const queryConfig = {
  queries: {
    staleTime: 60_000,
    refetchOnWindowFocus: false,
    retry: shouldRetry,
  },
  mutations: {
    retry: false,
  },
} satisfies DefaultOptions;

export function createQueryClient(options: { defaultOptions?: DefaultOptions } = {}): QueryClient {
  return new QueryClient({ defaultOptions: options.defaultOptions ?? queryConfig });
}
