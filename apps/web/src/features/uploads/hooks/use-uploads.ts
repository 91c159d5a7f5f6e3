import { useEffect, useRef } from 'react';
import { useQuery, useQueryClient } from '@tanstack/react-query';
import type { UploadStatus } from '@plumbline/contracts';
import { isWorking, uploadKeys } from '../api/upload-keys.ts';

/** How often an upload the worker still has is asked for again. */
export const POLL_INTERVAL_MS = 1000;

/** One upload with its row errors; polled while the worker has it. */
export function useUpload(id: string) {
  return useQuery({
    ...uploadKeys.detail(id),
    refetchInterval: (query) => (isWorking(query.state.data?.status) ? POLL_INTERVAL_MS : false),
  });
}

/** The lab's uploads, most recent first; polled while any of them is with the worker. */
export function useUploadList(labId: string) {
  return useQuery({
    ...uploadKeys.list(labId),
    refetchInterval: (query) =>
      query.state.data?.some((upload) => isWorking(upload.status)) ? POLL_INTERVAL_MS * 2 : false,
  });
}

/**
 * Reacts to an upload's status changing while it is shown: the history is reloaded, and `onStored`
 * runs once when the upload becomes stored. `initialStatus` is the status known before the first
 * answer (e.g. 'queued' right after sending); without it, an upload opened already stored does not
 * count as "became stored".
 */
export function useUploadStatusChange(
  status: UploadStatus | undefined,
  options: { initialStatus?: UploadStatus; onStored?: () => void },
) {
  const queryClient = useQueryClient();
  const lastStatus = useRef<UploadStatus | undefined>(options.initialStatus);
  const onStored = useRef(options.onStored);
  useEffect(() => {
    onStored.current = options.onStored;
  }, [options.onStored]);

  useEffect(() => {
    if (status === undefined || status === lastStatus.current) return;
    const previous = lastStatus.current;
    lastStatus.current = status;
    if (previous === undefined) return;
    void queryClient.invalidateQueries({ queryKey: uploadKeys.lists() });
    if (status === 'stored') onStored.current?.();
  }, [status, queryClient]);
}
