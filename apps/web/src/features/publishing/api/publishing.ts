// Publishing a period (POST /api/periods/:period/publish), republishing it with a reason
// (…/republish) and its versions so far (GET …/publications). Publishing changes the period's state,
// what every lab's report shows and the peer-group page's published figures, so those are refetched.
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { publicationListSchema, publishResultSchema } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { cyclesKeys } from '../../cycles/api/cycles-keys.ts';
import { peerGroupsKeys } from '../../peer-groups/api/peer-groups-keys.ts';
import { peerReportKeys } from '../../peer-report/api/peer-report-keys.ts';

const periodPath = (period: string) => `/periods/${encodeURIComponent(period)}`;

export function getPublications(period: string, signal?: AbortSignal) {
  return apiRequest(`${periodPath(period)}/publications`, { schema: publicationListSchema, signal });
}

export const publishingKeys = {
  all: ['publishing'] as const,
  publications: (period: string) =>
    queryOptions({
      queryKey: [...publishingKeys.all, 'publications', period] as const,
      queryFn: ({ signal }) => getPublications(period, signal),
    }),
};

export function publishPeriod({ period, reason, again }: { period: string; reason: string; again: boolean }) {
  return apiRequest(`${periodPath(period)}/${again ? 'republish' : 'publish'}`, {
    method: 'POST',
    body: { reason: reason || undefined },
    schema: publishResultSchema,
  });
}

export function usePublishPeriod() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: publishPeriod,
    // Not awaited: the dialog closes and confirms at once while the lists refresh behind it.
    onSuccess: () => {
      void queryClient.invalidateQueries({ queryKey: publishingKeys.all });
      void queryClient.invalidateQueries({ queryKey: cyclesKeys.all });
      void queryClient.invalidateQueries({ queryKey: peerGroupsKeys.all });
      void queryClient.invalidateQueries({ queryKey: peerReportKeys.all });
    },
  });
}
