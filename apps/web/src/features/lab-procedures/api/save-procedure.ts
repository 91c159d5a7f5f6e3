// Registering, editing, retiring and restoring one of the lab's measurement procedures.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { testMenuItemSchema, type ProcedureCreate, type ProcedureUpdate } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { testMenuKeys } from './test-menu-keys.ts';

const base = (labId: string) => `/labs/${encodeURIComponent(labId)}/procedures`;

export function registerProcedure({ labId, body }: { labId: string; body: ProcedureCreate }) {
  return apiRequest(base(labId), { method: 'POST', body, schema: testMenuItemSchema });
}

export function editProcedure({
  labId,
  procedureId,
  body,
}: {
  labId: string;
  procedureId: string;
  body: ProcedureUpdate;
}) {
  return apiRequest(`${base(labId)}/${encodeURIComponent(procedureId)}`, {
    method: 'PATCH',
    body,
    schema: testMenuItemSchema,
  });
}

export function changeProcedureState({
  labId,
  procedureId,
  action,
  reason,
}: {
  labId: string;
  procedureId: string;
  action: 'retire' | 'restore';
  reason?: string;
}) {
  return apiRequest(`${base(labId)}/${encodeURIComponent(procedureId)}/${action}`, {
    method: 'POST',
    body: { reason: reason || undefined },
  });
}

function useInvalidateMenu() {
  const queryClient = useQueryClient();
  return (labId: string) => queryClient.invalidateQueries({ queryKey: testMenuKeys.menu(labId).queryKey });
}

export function useRegisterProcedure() {
  const invalidate = useInvalidateMenu();
  return useMutation({ mutationFn: registerProcedure, onSuccess: (_p, { labId }) => invalidate(labId) });
}

export function useEditProcedure() {
  const invalidate = useInvalidateMenu();
  return useMutation({ mutationFn: editProcedure, onSuccess: (_p, { labId }) => invalidate(labId) });
}

export function useChangeProcedureState() {
  const invalidate = useInvalidateMenu();
  return useMutation({ mutationFn: changeProcedureState, onSuccess: (_r, { labId }) => invalidate(labId) });
}
