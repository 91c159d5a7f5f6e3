// The user's decision on an upload waiting for review: POST /api/uploads/:id/confirm stores the valid
// rows, POST /api/uploads/:id/cancel drops the upload. Both answer with the upload's summary.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { uploadSummarySchema, type UploadDetail, type UploadSummary } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { uploadKeys } from './upload-keys.ts';

export function confirmUpload(id: string) {
  return apiRequest(`/uploads/${encodeURIComponent(id)}/confirm`, {
    method: 'POST',
    schema: uploadSummarySchema,
  });
}

export function cancelUpload(id: string) {
  return apiRequest(`/uploads/${encodeURIComponent(id)}/cancel`, {
    method: 'POST',
    schema: uploadSummarySchema,
  });
}

function useUploadDecision(decide: (id: string) => Promise<UploadSummary>) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: decide,
    onSuccess: async (summary) => {
      // Show the new status at once (it starts polling again after a confirm), then reload the rest.
      queryClient.setQueryData(uploadKeys.detail(summary.id).queryKey, (old: UploadDetail | undefined) =>
        old ? { ...old, ...summary } : old,
      );
      await Promise.all([
        queryClient.invalidateQueries({ queryKey: uploadKeys.detail(summary.id).queryKey }),
        queryClient.invalidateQueries({ queryKey: uploadKeys.lists() }),
      ]);
    },
  });
}

export function useConfirmUpload() {
  return useUploadDecision(confirmUpload);
}

export function useCancelUpload() {
  return useUploadDecision(cancelUpload);
}
