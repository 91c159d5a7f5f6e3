// POST /api/uploads: sends the file with its kind and column mapping; the API saves the mapping for
// the lab's next file and answers 202 with the new upload's id.
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { uploadCreatedSchema, type ColumnMapping, type UploadKind } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';
import { uploadKeys } from './upload-keys.ts';

export type CreateUploadInput = {
  file: File;
  kind: UploadKind;
  /** Canonical column → the file's header; columns the file does not have are left out. */
  mapping: ColumnMapping;
  labId?: string;
};

export function createUpload({ file, kind, mapping, labId }: CreateUploadInput) {
  const form = new FormData();
  // Fields first, the file last: the API can check them before the file streams in.
  form.append('kind', kind);
  if (labId) form.append('labId', labId);
  form.append('mapping', JSON.stringify(mapping));
  form.append('file', file, file.name);
  return apiRequest('/uploads', { method: 'POST', body: form, schema: uploadCreatedSchema });
}

export function useCreateUpload() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createUpload,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: uploadKeys.lists() }),
  });
}
