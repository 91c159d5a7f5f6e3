// Query factory of the lab-admin feature: the lab's users and its API tokens.
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { labApiTokenListSchema, labUserSchema } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

export function getUsers(labId: string, signal?: AbortSignal) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/users`, { schema: z.array(labUserSchema), signal });
}

export function getTokens(labId: string, signal?: AbortSignal) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/api-tokens`, {
    schema: labApiTokenListSchema,
    signal,
  });
}

export const labAdminKeys = {
  all: ['lab-admin'] as const,
  users: (labId: string) =>
    queryOptions({
      queryKey: [...labAdminKeys.all, 'users', labId] as const,
      queryFn: ({ signal }) => getUsers(labId, signal),
    }),
  tokens: (labId: string) =>
    queryOptions({
      queryKey: [...labAdminKeys.all, 'tokens', labId] as const,
      queryFn: ({ signal }) => getTokens(labId, signal),
    }),
};
