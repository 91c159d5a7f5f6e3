// Applying an adjustment (after its preview was seen) and undoing one. Both change the figures of
// the whole lot and analyte, and the participation board's flags, so every peer-group query is refetched.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { peerGroupAdjustmentSchema, type AdjustmentKind } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { adjustmentPaths, peerGroupsKeys } from './peer-groups-keys.ts';

export function applyAdjustment({ kind, body }: { kind: AdjustmentKind; body: object }) {
  return apiRequest(adjustmentPaths[kind], { method: 'POST', body, schema: peerGroupAdjustmentSchema });
}

export function undoAdjustment({ id, reason }: { id: number; reason: string }) {
  return apiRequest(`/peer-groups/adjustments/${id}/undo`, {
    method: 'POST',
    body: { reason: reason || undefined },
    schema: peerGroupAdjustmentSchema,
  });
}

function useAdjustmentMutation<Input>(mutationFn: (input: Input) => ReturnType<typeof applyAdjustment>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: peerGroupsKeys.all }),
  });
}

export const useApplyAdjustment = () => useAdjustmentMutation(applyAdjustment);
export const useUndoAdjustment = () => useAdjustmentMutation(undoAdjustment);
