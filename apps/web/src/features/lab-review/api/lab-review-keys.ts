// Query factory of the lab-review feature: one report row's drill-down, the period's comments and its
// sign-off. Mutations invalidate through these keys.
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import {
  commentListSchema,
  drilldownSchema,
  periodSignoffSchema,
  signoffListSchema,
  type UnitSystem,
} from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

export type ReportRowRef = { procedureId: string; controlLotId: string; level: number };
export type DrilldownParams = ReportRowRef & {
  labId: string;
  period: string;
  target: 'lab' | 'peer';
  units?: UnitSystem;
};

export function reportRowPath(labId: string, row: ReportRowRef): string {
  return `/labs/${encodeURIComponent(labId)}/report-rows/${encodeURIComponent(row.procedureId)}/${encodeURIComponent(row.controlLotId)}/${row.level}`;
}

export function getDrilldown(params: DrilldownParams, signal?: AbortSignal) {
  return apiRequest(reportRowPath(params.labId, params), {
    schema: drilldownSchema,
    query: { period: params.period, target: params.target, units: params.units },
    signal,
  });
}

export function getComments(labId: string, period: string, signal?: AbortSignal) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/comments`, {
    schema: commentListSchema,
    query: { period },
    signal,
  });
}

export function getPeriodSignoff(labId: string, period: string, signal?: AbortSignal) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/signoffs/${encodeURIComponent(period)}`, {
    schema: periodSignoffSchema,
    signal,
  });
}

export function getSignoffs(labId: string, signal?: AbortSignal) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/signoffs`, { schema: signoffListSchema, signal });
}

export const labReviewKeys = {
  all: ['lab-review'] as const,
  drilldowns: () => [...labReviewKeys.all, 'drilldown'] as const,
  drilldown: (params: DrilldownParams) =>
    queryOptions({
      queryKey: [...labReviewKeys.drilldowns(), params] as const,
      queryFn: ({ signal }) => getDrilldown(params, signal),
      // Switching the chart's target keeps the page in place while the new figures load.
      placeholderData: keepPreviousData,
    }),
  commentLists: (labId: string) => [...labReviewKeys.all, 'comments', labId] as const,
  comments: (labId: string, period: string) =>
    queryOptions({
      queryKey: [...labReviewKeys.commentLists(labId), period] as const,
      queryFn: ({ signal }) => getComments(labId, period, signal),
    }),
  signoffs: (labId: string) => [...labReviewKeys.all, 'signoffs', labId] as const,
  signoff: (labId: string, period: string) =>
    queryOptions({
      queryKey: [...labReviewKeys.signoffs(labId), period] as const,
      queryFn: ({ signal }) => getPeriodSignoff(labId, period, signal),
    }),
  signoffList: (labId: string) =>
    queryOptions({
      queryKey: [...labReviewKeys.signoffs(labId), 'all'] as const,
      queryFn: ({ signal }) => getSignoffs(labId, signal),
    }),
};
