// Query factory of the QC insight feature: procedure events, detected shifts, the lab's QC plans.
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import {
  procedureEventSchema,
  procedureShiftsSchema,
  qcPlanPageSchema,
  type ProcedureEventCreate,
  type QcPlanInput,
} from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

const lab = (labId: string) => `/labs/${encodeURIComponent(labId)}`;
const procedure = (labId: string, procedureId: string) =>
  `${lab(labId)}/procedures/${encodeURIComponent(procedureId)}`;

export function recordProcedureEvent(labId: string, procedureId: string, body: ProcedureEventCreate) {
  return apiRequest(`${procedure(labId, procedureId)}/events`, {
    method: 'POST',
    body,
    schema: procedureEventSchema,
  });
}

export function saveQcPlan(labId: string, procedureId: string, level: number, body: QcPlanInput) {
  return apiRequest(`${lab(labId)}/qc-plan/${encodeURIComponent(procedureId)}/${level}`, {
    method: 'PUT',
    body,
  });
}

export const qcInsightKeys = {
  all: ['qc-insight'] as const,
  events: (labId: string, procedureId: string) =>
    queryOptions({
      queryKey: [...qcInsightKeys.all, 'events', labId, procedureId] as const,
      queryFn: ({ signal }) =>
        apiRequest(`${procedure(labId, procedureId)}/events`, {
          schema: z.array(procedureEventSchema),
          signal,
        }),
    }),
  /** Shifts of one control lot and level of the procedure. */
  shifts: (labId: string, procedureId: string, controlLotId: string, level: number) =>
    queryOptions({
      queryKey: [...qcInsightKeys.all, 'shifts', labId, procedureId, controlLotId, level] as const,
      queryFn: ({ signal }) =>
        apiRequest(`${procedure(labId, procedureId)}/shifts`, {
          schema: procedureShiftsSchema,
          query: { controlLotId, level },
          signal,
        }),
    }),
  qcPlan: (labId: string) =>
    queryOptions({
      queryKey: [...qcInsightKeys.all, 'qc-plan', labId] as const,
      queryFn: ({ signal }) => apiRequest(`${lab(labId)}/qc-plan`, { schema: qcPlanPageSchema, signal }),
    }),
};
