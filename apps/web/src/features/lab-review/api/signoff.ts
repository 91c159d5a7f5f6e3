// The supervisor's sign-off of a period's review (POST /api/labs/:labId/signoffs).
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { signoffSchema, type SignoffCreate } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { labReviewKeys } from './lab-review-keys.ts';

export function signPeriod({ labId, body }: { labId: string; body: SignoffCreate }) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/signoffs`, {
    method: 'POST',
    body,
    schema: signoffSchema,
  });
}

export function useSignPeriod() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signPeriod,
    onSuccess: (_signoff, { labId }) =>
      queryClient.invalidateQueries({ queryKey: labReviewKeys.signoffs(labId) }),
  });
}
