// Changes in the reference-intervals feature; each invalidates what it changed.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import {
  currentIntervalSchema,
  studyResultSchema,
  studySummarySchema,
  verificationSchema,
  uploadCreatedSchema,
  uploadSummarySchema,
  type CurrentIntervalInput,
  type PatientUploadKind,
  type StudyInput,
} from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { riKeys } from './ri-keys.ts';

const base = '/reference-intervals';

function useRiMutation<I, O>(fn: (input: I) => Promise<O>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: fn,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: riKeys.all }),
  });
}

export const useCreateStudy = () =>
  useRiMutation((input: StudyInput) =>
    apiRequest(`${base}/studies`, { method: 'POST', body: input, schema: studySummarySchema }),
  );

export const useRunStudy = () =>
  useRiMutation((studyId: string) =>
    apiRequest(`${base}/studies/${encodeURIComponent(studyId)}/run`, {
      method: 'POST',
      schema: studySummarySchema,
    }),
  );

export const useApproveStudy = () =>
  useRiMutation((input: { studyId: string; version: number; statement: string }) =>
    apiRequest(`${base}/studies/${encodeURIComponent(input.studyId)}/versions/${input.version}/approve`, {
      method: 'POST',
      body: { statement: input.statement },
      schema: studyResultSchema,
    }),
  );

export const useAdoptInterval = () =>
  useRiMutation((input: { resultId: string; partition: string }) =>
    apiRequest(`${base}/current/adopt`, { method: 'POST', body: input, schema: currentIntervalSchema }),
  );

export const useSaveCurrentInterval = () =>
  useRiMutation((input: CurrentIntervalInput) =>
    apiRequest(`${base}/current`, { method: 'PUT', body: input, schema: currentIntervalSchema }),
  );

export const useCreateVerification = () =>
  useRiMutation((input: { currentIntervalId: string; values: number[] }) =>
    apiRequest(`${base}/verifications`, { method: 'POST', body: input, schema: verificationSchema }),
  );

export const useAddVerificationRound = () =>
  useRiMutation((input: { id: string; values: number[] }) =>
    apiRequest(`${base}/verifications/${encodeURIComponent(input.id)}/rounds`, {
      method: 'POST',
      body: { values: input.values },
      schema: verificationSchema,
    }),
  );

export const useApproveVerification = () =>
  useRiMutation((input: { id: string; statement: string }) =>
    apiRequest(`${base}/verifications/${encodeURIComponent(input.id)}/approve`, {
      method: 'POST',
      body: { statement: input.statement },
      schema: verificationSchema,
    }),
  );

/** POST /api/uploads with a patient file: the same pipeline as QC files, kind patient-results or fhir-bundle. */
export const useUploadPatientFile = () =>
  useRiMutation((input: { file: File; kind: PatientUploadKind }) => {
    const form = new FormData();
    form.append('kind', input.kind);
    form.append('file', input.file, input.file.name);
    return apiRequest('/uploads', { method: 'POST', body: form, schema: uploadCreatedSchema });
  });

export const useDecidePatientUpload = () =>
  useRiMutation((input: { id: string; decision: 'confirm' | 'cancel' }) =>
    apiRequest(`/uploads/${encodeURIComponent(input.id)}/${input.decision}`, {
      method: 'POST',
      schema: uploadSummarySchema,
    }),
  );
