// The supervisor's changes to the lab's users: invite (POST /api/labs/:labId/invitations, answering the
// link to pass on) and change a role or deactivate (PATCH /api/labs/:labId/users/:userId).
import { useMutation, useQueryClient } from '@tanstack/react-query';
import {
  invitationCreatedSchema,
  labUserSchema,
  type InvitationCreate,
  type LabUserUpdate,
} from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { labAdminKeys } from './lab-admin-keys.ts';

export function inviteUser({ labId, body }: { labId: string; body: InvitationCreate }) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/invitations`, {
    method: 'POST',
    body,
    schema: invitationCreatedSchema,
  });
}

export function updateUser({ labId, userId, body }: { labId: string; userId: string; body: LabUserUpdate }) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/users/${encodeURIComponent(userId)}`, {
    method: 'PATCH',
    body,
    schema: labUserSchema,
  });
}

export function useInviteUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: inviteUser,
    onSuccess: (_i, { labId }) =>
      queryClient.invalidateQueries({ queryKey: labAdminKeys.users(labId).queryKey }),
  });
}

export function useUpdateUser() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateUser,
    onSuccess: (_u, { labId }) =>
      queryClient.invalidateQueries({ queryKey: labAdminKeys.users(labId).queryKey }),
  });
}
