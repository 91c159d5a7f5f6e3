// Query factory of the network-labs feature: member labs, one lab's details and users, and the
// procedures registered across the network. Mutations invalidate through these keys.
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import {
  labDetailSchema,
  labListSchema,
  labUserSchema,
  networkProceduresPageSchema,
  type NetworkProceduresQuery,
} from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

/** GET /api/labs/:labId answers the lab without its enrolment date. */
export const labSettingsSchema = labDetailSchema.omit({ createdAt: true });
export type LabSettings = z.infer<typeof labSettingsSchema>;

export type NetworkProceduresParams = Partial<
  Pick<
    NetworkProceduresQuery,
    'analyteId' | 'instrumentModelId' | 'methodId' | 'labId' | 'unpeerable' | 'minLabs' | 'limit' | 'offset'
  >
>;

export const PROCEDURES_PAGE_SIZE = 50;

export function getLabs(signal?: AbortSignal) {
  return apiRequest('/labs', { schema: labListSchema, signal });
}

export function getLabSettings(labId: string, signal?: AbortSignal) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}`, { schema: labSettingsSchema, signal });
}

export function getLabUsers(labId: string, signal?: AbortSignal) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/users`, { schema: z.array(labUserSchema), signal });
}

export function getNetworkProcedures(params: NetworkProceduresParams, signal?: AbortSignal) {
  return apiRequest('/network/procedures', { schema: networkProceduresPageSchema, query: params, signal });
}

export const networkLabsKeys = {
  all: ['network-labs'] as const,
  labs: () =>
    queryOptions({
      queryKey: [...networkLabsKeys.all, 'labs'] as const,
      queryFn: ({ signal }) => getLabs(signal),
    }),
  labDetails: () => [...networkLabsKeys.all, 'lab'] as const,
  lab: (labId: string) =>
    queryOptions({
      queryKey: [...networkLabsKeys.labDetails(), labId] as const,
      queryFn: ({ signal }) => getLabSettings(labId, signal),
    }),
  userLists: () => [...networkLabsKeys.all, 'users'] as const,
  users: (labId: string) =>
    queryOptions({
      queryKey: [...networkLabsKeys.userLists(), labId] as const,
      queryFn: ({ signal }) => getLabUsers(labId, signal),
    }),
  procedureLists: () => [...networkLabsKeys.all, 'procedures'] as const,
  procedures: (params: NetworkProceduresParams) =>
    queryOptions({
      queryKey: [...networkLabsKeys.procedureLists(), params] as const,
      queryFn: ({ signal }) => getNetworkProcedures(params, signal),
      placeholderData: keepPreviousData,
    }),
};
