// Query factory of the participation feature: the board of one period.
import { queryOptions } from '@tanstack/react-query';
import { participationBoardSchema } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

export function getParticipationBoard(period: string, signal?: AbortSignal) {
  return apiRequest(`/periods/${encodeURIComponent(period)}/participation`, {
    schema: participationBoardSchema,
    signal,
  });
}

export const participationKeys = {
  all: ['participation'] as const,
  board: (period: string) =>
    queryOptions({
      queryKey: [...participationKeys.all, 'board', period] as const,
      queryFn: ({ signal }) => getParticipationBoard(period, signal),
      // Submissions arrive all the time and the period's state may just have changed: read it afresh on every visit.
      staleTime: 0,
    }),
};
