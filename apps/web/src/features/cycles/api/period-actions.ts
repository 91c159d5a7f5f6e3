// What the coordinator does with a period: create it (POST /api/periods), move its deadline
// (PATCH /api/periods/:period), close it and reopen it with a reason (POST …/close, …/reopen).
// Publishing lives in its own module once peer statistics can be frozen.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { periodDetailSchema, type PeriodCreate, type PeriodUpdate } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { cyclesKeys } from './cycles-keys.ts';

const periodPath = (period: string) => `/periods/${encodeURIComponent(period)}`;

export function createPeriod(body: PeriodCreate) {
  return apiRequest('/periods', { method: 'POST', body, schema: periodDetailSchema });
}

export function changeDeadline({ period, body }: { period: string; body: PeriodUpdate }) {
  return apiRequest(periodPath(period), { method: 'PATCH', body, schema: periodDetailSchema });
}

export function closePeriod({ period, reason }: { period: string; reason: string }) {
  return apiRequest(`${periodPath(period)}/close`, {
    method: 'POST',
    body: { reason: reason || undefined },
    schema: periodDetailSchema,
  });
}

export function reopenPeriod({ period, reason }: { period: string; reason: string }) {
  return apiRequest(`${periodPath(period)}/reopen`, {
    method: 'POST',
    body: { reason },
    schema: periodDetailSchema,
  });
}

function usePeriodMutation<Input, Output>(mutationFn: (input: Input) => Promise<Output>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn,
    // The participation board reads its period afresh on every visit, so only the list needs this.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: cyclesKeys.all }),
  });
}

export const useCreatePeriod = () => usePeriodMutation(createPeriod);
export const useChangeDeadline = () => usePeriodMutation(changeDeadline);
export const useClosePeriod = () => usePeriodMutation(closePeriod);
export const useReopenPeriod = () => usePeriodMutation(reopenPeriod);
