// Query factory of the reference-intervals feature: studies, the lab's current intervals and its
// verifications of transferred intervals. Hooks, mutations and invalidation all use these keys.
import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import {
  analyteItemSchema,
  currentIntervalSchema,
  studyCountSchema,
  uploadDetailSchema,
  studyDetailSchema,
  studySummarySchema,
  verificationSchema,
  type StudySelection,
  type StudyStatus,
} from '@plumbline/contracts';
import { apiDownload, apiRequest, saveFile } from '../../../lib/api-client.ts';

const base = '/reference-intervals';

export const getStudies = (signal?: AbortSignal) =>
  apiRequest(`${base}/studies`, { schema: z.array(studySummarySchema), signal });
export const getStudy = (id: string, signal?: AbortSignal) =>
  apiRequest(`${base}/studies/${encodeURIComponent(id)}`, { schema: studyDetailSchema, signal });
export const getCurrentIntervals = (signal?: AbortSignal) =>
  apiRequest(`${base}/current`, { schema: z.array(currentIntervalSchema), signal });
export const getVerifications = (signal?: AbortSignal) =>
  apiRequest(`${base}/verifications`, { schema: z.array(verificationSchema), signal });
export const countMatching = (analyteId: string, selection: StudySelection, signal?: AbortSignal) =>
  apiRequest(`${base}/studies/count`, {
    method: 'POST',
    body: { analyteId, selection },
    schema: studyCountSchema,
    signal,
  });
export const getAnalytes = (signal?: AbortSignal) =>
  apiRequest('/catalogue/analytes', {
    schema: z.object({ total: z.number(), items: z.array(analyteItemSchema) }),
    query: { state: 'active', sort: 'name', order: 'asc', limit: 500 },
    signal,
  });

export async function downloadStudyCsv(studyId: string, version: number): Promise<void> {
  const { blob, filename } = await apiDownload(
    `${base}/studies/${encodeURIComponent(studyId)}/versions/${version}/export.csv`,
  );
  saveFile(blob, filename ?? `study-v${version}.csv`);
}

export async function downloadStudyPdf(studyId: string, version: number): Promise<void> {
  const { blob, filename } = await apiDownload(
    `${base}/studies/${encodeURIComponent(studyId)}/versions/${version}/export.pdf`,
  );
  saveFile(blob, filename ?? `study-v${version}.pdf`);
}

/** The worker still has the study: its status and progress change without anyone acting. */
export const isRunning = (status: StudyStatus | undefined) => status === 'queued' || status === 'running';

export const riKeys = {
  all: ['reference-intervals'] as const,
  studies: () =>
    queryOptions({
      queryKey: [...riKeys.all, 'studies'] as const,
      queryFn: ({ signal }) => getStudies(signal),
    }),
  study: (id: string) =>
    queryOptions({
      queryKey: [...riKeys.all, 'study', id] as const,
      queryFn: ({ signal }) => getStudy(id, signal),
    }),
  current: () =>
    queryOptions({
      queryKey: [...riKeys.all, 'current'] as const,
      queryFn: ({ signal }) => getCurrentIntervals(signal),
    }),
  verifications: () =>
    queryOptions({
      queryKey: [...riKeys.all, 'verifications'] as const,
      queryFn: ({ signal }) => getVerifications(signal),
    }),
  count: (analyteId: string, selection: StudySelection) =>
    queryOptions({
      queryKey: [...riKeys.all, 'count', analyteId, selection] as const,
      queryFn: ({ signal }) => countMatching(analyteId, selection, signal),
    }),
  analytes: () =>
    queryOptions({
      queryKey: [...riKeys.all, 'analytes'] as const,
      queryFn: ({ signal }) => getAnalytes(signal),
      staleTime: 5 * 60_000,
    }),
};

export const getPatientUpload = (id: string, signal?: AbortSignal) =>
  apiRequest(`/uploads/${encodeURIComponent(id)}`, { schema: uploadDetailSchema, signal });

export const riUploadKeys = {
  upload: (id: string) =>
    queryOptions({
      queryKey: [...riKeys.all, 'upload', id] as const,
      queryFn: ({ signal }) => getPatientUpload(id, signal),
    }),
};
