// Query factory of the peer-report feature: the monthly periods and a lab's report for one period.
// Every query and every invalidation of peer reports goes through these keys.
import { queryOptions } from '@tanstack/react-query';
import { peerReportSchema, periodListSchema, type UnitSystem } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

export type PeerReportParams = {
  labId: string;
  period: string;
  /** Left out: the lab's preferred units. */
  units?: UnitSystem;
};

export function getPeerReport({ labId, period, units }: PeerReportParams, signal?: AbortSignal) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/peer-report`, {
    schema: peerReportSchema,
    query: { period, units },
    signal,
  });
}

export function getPeriods(signal?: AbortSignal) {
  return apiRequest('/periods', { schema: periodListSchema, signal });
}

export const peerReportKeys = {
  all: ['peer-reports'] as const,
  /** Every lab report of every period: invalidate this when new QC data is stored. */
  details: () => [...peerReportKeys.all, 'detail'] as const,
  detail: (params: PeerReportParams) =>
    queryOptions({
      queryKey: [...peerReportKeys.details(), params] as const,
      queryFn: ({ signal }) => getPeerReport(params, signal),
    }),
  periods: () =>
    queryOptions({
      queryKey: [...peerReportKeys.all, 'periods'] as const,
      queryFn: ({ signal }) => getPeriods(signal),
    }),
};
