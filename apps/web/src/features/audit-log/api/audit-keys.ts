// Query factory of the audit-log feature: one page of events for a set of filters, newest first.
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { auditPageSchema, type AuditQuery } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

export type AuditFilters = Partial<Pick<AuditQuery, 'actorId' | 'labId' | 'kind' | 'from' | 'to'>>;
export type AuditPageParams = AuditFilters & { limit: number; offset: number };

export const AUDIT_PAGE_SIZE = 50;

/** The query string of a filter set: empty filters are left out rather than sent blank. */
export function auditQuery(filters: AuditFilters): Record<string, string | undefined> {
  return {
    actorId: filters.actorId || undefined,
    labId: filters.labId || undefined,
    kind: filters.kind?.trim() || undefined,
    from: filters.from || undefined,
    to: filters.to || undefined,
  };
}

export function getAuditEvents(params: AuditPageParams, signal?: AbortSignal) {
  return apiRequest('/audit-events', {
    schema: auditPageSchema,
    query: { ...auditQuery(params), limit: params.limit, offset: params.offset },
    signal,
  });
}

export const auditKeys = {
  all: ['audit-log'] as const,
  pages: () => [...auditKeys.all, 'page'] as const,
  page: (params: AuditPageParams) =>
    queryOptions({
      queryKey: [...auditKeys.pages(), params] as const,
      queryFn: ({ signal }) => getAuditEvents(params, signal),
      placeholderData: keepPreviousData,
      // The log grows with every action anywhere in the network.
      staleTime: 0,
    }),
};
