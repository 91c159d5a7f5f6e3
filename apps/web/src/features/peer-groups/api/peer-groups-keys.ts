// Query factory of the peer-groups feature: control lots, the analytes with data on a lot, the peer
// groups of a lot, analyte, level and period, previews of adjustments, and the adjustment history.
// Every adjustment invalidates `peerGroupsKeys.all`.
import { queryOptions } from '@tanstack/react-query';
import {
  adjustmentPreviewSchema,
  controlLotSummaryListSchema,
  peerGroupAdjustmentListSchema,
  peerGroupAnalyteListSchema,
  peerGroupsViewSchema,
  peerStatisticsFailureListSchema,
  type AdjustmentKind,
  type PeerGroupsQuery,
} from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

/** Where each adjustment is applied; its preview is the same path with `/preview`. */
export const adjustmentPaths: Record<AdjustmentKind, string> = {
  merge: '/peer-groups/merge',
  split: '/peer-groups/split',
  move: '/peer-groups/move',
  exclude: '/peer-groups/exclusions',
};

export function getControlLots(signal?: AbortSignal) {
  return apiRequest('/control-lots', { schema: controlLotSummaryListSchema, signal });
}

export function getLotAnalytes(controlLotId: string, signal?: AbortSignal) {
  return apiRequest('/peer-groups/analytes', {
    query: { controlLotId },
    schema: peerGroupAnalyteListSchema,
    signal,
  });
}

export function getPeerGroups(query: PeerGroupsQuery, signal?: AbortSignal) {
  return apiRequest('/peer-groups', { query, schema: peerGroupsViewSchema, signal });
}

export function getAdjustments(filter: { controlLotId: string; analyteId: string }, signal?: AbortSignal) {
  return apiRequest('/peer-groups/adjustments', {
    query: filter,
    schema: peerGroupAdjustmentListSchema,
    signal,
  });
}

/** Peer groups the last recompute could not compute (all periods, or one). */
export function getRecomputeFailures(period: string | undefined, signal?: AbortSignal) {
  return apiRequest('/peer-groups/failures', {
    query: period ? { period } : {},
    schema: peerStatisticsFailureListSchema,
    signal,
  });
}

/** A preview writes nothing, so it is read like any other query (and refetched when its input changes). */
export function previewAdjustment(kind: AdjustmentKind, body: object, signal?: AbortSignal) {
  return apiRequest(`${adjustmentPaths[kind]}/preview`, {
    method: 'POST',
    body,
    schema: adjustmentPreviewSchema,
    signal,
  });
}

export const peerGroupsKeys = {
  all: ['peer-groups'] as const,
  controlLots: () =>
    queryOptions({
      queryKey: [...peerGroupsKeys.all, 'control-lots'] as const,
      queryFn: ({ signal }) => getControlLots(signal),
    }),
  analytes: (controlLotId: string) =>
    queryOptions({
      queryKey: [...peerGroupsKeys.all, 'analytes', controlLotId] as const,
      queryFn: ({ signal }) => getLotAnalytes(controlLotId, signal),
    }),
  view: (query: PeerGroupsQuery) =>
    queryOptions({
      queryKey: [...peerGroupsKeys.all, 'view', query] as const,
      queryFn: ({ signal }) => getPeerGroups(query, signal),
      // Uploads change the provisional figures at any time.
      staleTime: 0,
    }),
  adjustments: (filter: { controlLotId: string; analyteId: string }) =>
    queryOptions({
      queryKey: [...peerGroupsKeys.all, 'adjustments', filter] as const,
      queryFn: ({ signal }) => getAdjustments(filter, signal),
      staleTime: 0,
    }),
  failures: (period?: string) =>
    queryOptions({
      queryKey: [...peerGroupsKeys.all, 'failures', period ?? 'all'] as const,
      queryFn: ({ signal }) => getRecomputeFailures(period, signal),
      // A recompute may run at any time.
      staleTime: 0,
    }),
  preview: (kind: AdjustmentKind, body: object) =>
    queryOptions({
      queryKey: [...peerGroupsKeys.all, 'preview', kind, body] as const,
      queryFn: ({ signal }) => previewAdjustment(kind, body, signal),
      staleTime: 0,
      gcTime: 0,
    }),
};
