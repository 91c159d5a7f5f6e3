// POST /api/uploads/preview: the API reads the first lines of a file and suggests a column mapping.
import { useMutation } from '@tanstack/react-query';
import { uploadPreviewSchema, type UploadKind } from '@plumbline/contracts';
import { apiRequest } from '../../../lib/api-client.ts';

/** The API reads at most this much of a file for a preview; sending more only costs time. */
export const PREVIEW_BYTES = 64 * 1024;

/** The start of the file, cut after its last complete line so the preview never sees half a row. */
export async function previewPart(file: Blob): Promise<Blob> {
  if (file.size <= PREVIEW_BYTES) return file;
  const bytes = new Uint8Array(await file.slice(0, PREVIEW_BYTES).arrayBuffer());
  const lastLineBreak = bytes.lastIndexOf(0x0a); // a byte of a multi-byte UTF-8 character is never 0x0A
  return lastLineBreak > 0 ? new Blob([bytes.subarray(0, lastLineBreak + 1)]) : new Blob([bytes]);
}

export type PreviewUploadInput = { file: File; kind: UploadKind; labId?: string };

export async function previewUpload({ file, kind, labId }: PreviewUploadInput) {
  const form = new FormData();
  form.append('kind', kind);
  if (labId) form.append('labId', labId);
  form.append('file', await previewPart(file), file.name);
  return apiRequest('/uploads/preview', { method: 'POST', body: form, schema: uploadPreviewSchema });
}

export function usePreviewUpload() {
  return useMutation({ mutationFn: previewUpload });
}
