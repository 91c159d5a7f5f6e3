// Enrolling (POST /api/labs), editing (PATCH /api/labs/:labId), deactivating
// (POST /api/labs/:labId/deactivate) and reactivating (PATCH with active: true) a member lab.
import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { labDetailSchema, type LabCreate, type LabUpdate } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { networkLabsKeys } from './network-labs-keys.ts';

export function enrolLab(body: LabCreate) {
  return apiRequest('/labs', { method: 'POST', body, schema: labDetailSchema });
}

export function editLab({ labId, body }: { labId: string; body: LabUpdate }) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}`, { method: 'PATCH', body, schema: labDetailSchema });
}

export function deactivateLab({ labId, reason }: { labId: string; reason: string }) {
  return apiRequest(`/labs/${encodeURIComponent(labId)}/deactivate`, {
    method: 'POST',
    body: { reason: reason || undefined },
    schema: labDetailSchema,
  });
}

/** A lab's code, name or state shows in every list of labs and procedures. */
function invalidateLabs(queryClient: QueryClient) {
  return Promise.all([
    queryClient.invalidateQueries({ queryKey: networkLabsKeys.labs().queryKey }),
    queryClient.invalidateQueries({ queryKey: networkLabsKeys.labDetails() }),
    queryClient.invalidateQueries({ queryKey: networkLabsKeys.procedureLists() }),
  ]);
}

export function useEnrolLab() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: enrolLab, onSuccess: () => invalidateLabs(queryClient) });
}

export function useEditLab() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: editLab, onSuccess: () => invalidateLabs(queryClient) });
}

export function useDeactivateLab() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: deactivateLab, onSuccess: () => invalidateLabs(queryClient) });
}
