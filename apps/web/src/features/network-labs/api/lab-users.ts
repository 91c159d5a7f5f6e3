// A lab's users: inviting someone (POST /api/labs/:labId/invitations, answering the link to pass on)
// and changing a user's role or active flag (PATCH /api/labs/:labId/users/:userId).
import { useMutation, useQueryClient } from '@tanstack/react-query';
import {
  invitationCreatedSchema,
  labUserSchema,
  type InvitationCreate,
  type LabUserUpdate,
} from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { networkLabsKeys } from './network-labs-keys.ts';

export function inviteLabUser({ labId, body }: { labId: string; body: InvitationCreate }) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/invitations`, {
    method: 'POST',
    body,
    schema: invitationCreatedSchema,
  });
}

export function updateLabUser({
  labId,
  userId,
  body,
}: {
  labId: string;
  userId: string;
  body: LabUserUpdate;
}) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/users/${encodeURIComponent(userId)}`, {
    method: 'PATCH',
    body,
    schema: labUserSchema,
  });
}

export function useInviteLabUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: inviteLabUser,
    onSuccess: (_created, { labId }) =>
      queryClient.invalidateQueries({ queryKey: networkLabsKeys.users(labId).queryKey }),
  });
}

export function useUpdateLabUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateLabUser,
    onSuccess: (_user, { labId }) =>
      queryClient.invalidateQueries({ queryKey: networkLabsKeys.users(labId).queryKey }),
  });
}
