// Query factory of the cycles feature: the monthly periods. Changes to a period invalidate these keys.
import { queryOptions } from '@tanstack/react-query';
import { periodListSchema } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

export function getPeriods(signal?: AbortSignal) {
  return apiRequest('/periods', { schema: periodListSchema, signal });
}

export const cyclesKeys = {
  all: ['cycles'] as const,
  periods: () =>
    queryOptions({
      queryKey: [...cyclesKeys.all, 'periods'] as const,
      queryFn: ({ signal }) => getPeriods(signal),
    }),
};
