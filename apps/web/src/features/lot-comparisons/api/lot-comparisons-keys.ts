// Query factory of the lot-comparisons feature: the analytes to choose from and the lot-to-lot
// comparisons of one analyte and month.
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { analyteItemSchema, lotComparisonsSchema, type LotComparisonsQuery } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

export function getAnalytes(signal?: AbortSignal) {
  return apiRequest('/catalogue/analytes', {
    schema: z.object({ total: z.number(), items: z.array(analyteItemSchema) }),
    query: { state: 'active', sort: 'name', order: 'asc', limit: 500 },
    signal,
  });
}

export function getLotComparisons(query: LotComparisonsQuery, signal?: AbortSignal) {
  return apiRequest('/lot-comparisons', { query, schema: lotComparisonsSchema, signal });
}

export const lotComparisonsKeys = {
  all: ['lot-comparisons'] as const,
  analytes: () =>
    queryOptions({
      queryKey: [...lotComparisonsKeys.all, 'analytes'] as const,
      queryFn: ({ signal }) => getAnalytes(signal),
    }),
  comparisons: (query: LotComparisonsQuery) =>
    queryOptions({
      queryKey: [...lotComparisonsKeys.all, 'comparisons', query] as const,
      queryFn: ({ signal }) => getLotComparisons(query, signal),
      // Uploads change the monthly figures at any time.
      staleTime: 0,
    }),
};
