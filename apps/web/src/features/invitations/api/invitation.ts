// A user's invitation, read by its token (GET /api/invitations/:token, public) and accepted by
// setting a password (POST /api/invitations/accept). Both need no session.
import { queryOptions, useMutation } from '@tanstack/react-query';
import { z } from 'zod';
import { invitationInfoSchema, type InvitationAccept } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

const acceptedSchema = z.object({ email: z.string() });

export function getInvitation(token: string, signal?: AbortSignal) {
  return apiRequest(`/invitations/${encodeURIComponent(token)}`, { schema: invitationInfoSchema, signal });
}

export function acceptInvitation(body: InvitationAccept) {
  return apiRequest('/invitations/accept', { method: 'POST', body, schema: acceptedSchema });
}

export const invitationKeys = {
  all: ['invitations'] as const,
  detail: (token: string) =>
    queryOptions({
      queryKey: [...invitationKeys.all, token] as const,
      queryFn: ({ signal }) => getInvitation(token, signal),
      // Used once, and a retry would not make a used or expired invitation valid.
      staleTime: Infinity,
    }),
};

export function useAcceptInvitation() {
  return useMutation({ mutationFn: acceptInvitation });
}
