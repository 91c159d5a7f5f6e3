// The lab's API tokens: create one (its secret is in the answer, and only there) and revoke one.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { labApiTokenCreatedSchema, type LabApiTokenCreate } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { labAdminKeys } from './lab-admin-keys.ts';

export function createToken({ labId, body }: { labId: string; body: LabApiTokenCreate }) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/api-tokens`, {
    method: 'POST',
    body,
    schema: labApiTokenCreatedSchema,
  });
}

export function revokeToken({ labId, tokenId }: { labId: string; tokenId: string }) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/api-tokens/${encodeURIComponent(tokenId)}`, {
    method: 'DELETE',
  });
}

export function useCreateToken() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createToken,
    onSuccess: (_t, { labId }) =>
      queryClient.invalidateQueries({ queryKey: labAdminKeys.tokens(labId).queryKey }),
  });
}

export function useRevokeToken() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeToken,
    onSuccess: (_r, { labId }) =>
      queryClient.invalidateQueries({ queryKey: labAdminKeys.tokens(labId).queryKey }),
  });
}
