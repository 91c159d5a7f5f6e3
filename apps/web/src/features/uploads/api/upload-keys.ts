// Query factory of the uploads feature. Hooks, mutations and invalidation all use these keys.
import { queryOptions } from '@tanstack/react-query';
import { uploadDetailSchema, uploadListSchema, type UploadStatus } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

export function getUploadList(labId: string, signal?: AbortSignal) {
  return apiRequest('/uploads', { schema: uploadListSchema, query: { labId }, signal });
}

export function getUpload(id: string, signal?: AbortSignal) {
  return apiRequest(`/uploads/${encodeURIComponent(id)}`, { schema: uploadDetailSchema, signal });
}

/** The worker still has the file: its status and progress will change without anyone acting. */
export function isWorking(status: UploadStatus | undefined): boolean {
  return status === 'queued' || status === 'processing';
}

export const uploadKeys = {
  all: ['uploads'] as const,
  lists: () => [...uploadKeys.all, 'list'] as const,
  list: (labId: string) =>
    queryOptions({
      queryKey: [...uploadKeys.lists(), { labId }] as const,
      queryFn: ({ signal }) => getUploadList(labId, signal),
    }),
  details: () => [...uploadKeys.all, 'detail'] as const,
  detail: (id: string) =>
    queryOptions({
      queryKey: [...uploadKeys.details(), id] as const,
      queryFn: ({ signal }) => getUpload(id, signal),
    }),
};
