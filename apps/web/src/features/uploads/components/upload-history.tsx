import { useId } from 'react';
import type { UploadSummary } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { formatCount, formatDateTime } from '../../../utils/format.ts';
import { isWorking } from '../api/upload-keys.ts';
import { useUploadList } from '../hooks/use-uploads.ts';
import { uploadKindLabels } from './upload-kind-choice.tsx';
import { UploadStatusBadge } from './upload-status-badge.tsx';

function sender(upload: UploadSummary): string {
  if (upload.via === 'api-token') return 'Lab API token';
  return upload.uploadedBy?.name || '—';
}

/** Counts are final only once the worker has read the whole file; a discarded file's are shown muted. */
function RowCount({ upload, value }: { upload: UploadSummary; value: number }) {
  if (isWorking(upload.status) || (upload.status === 'failed' && upload.rowsTotal === 0)) {
    return <span className="text-slate-400">—</span>;
  }
  if (upload.status === 'cancelled') return <span className="text-slate-400">{formatCount(value)}</span>;
  return <>{formatCount(value)}</>;
}

/** The lab's uploads, most recent first; choosing one shows its details. */
export function UploadHistory({
  labId,
  selectedId,
  onSelect,
}: {
  labId: string;
  selectedId: string | null;
  onSelect: (uploadId: string) => void;
}) {
  const headingId = useId();
  const uploads = useUploadList(labId);

  return (
    <section aria-labelledby={headingId}>
      <h2 id={headingId} className="text-base font-semibold text-plumb-950">
        Your lab’s uploads
      </h2>
      <p className="mt-1 text-sm text-slate-600">
        Files sent from this page or by your lab’s systems with an API token. Choose a file to see its
        details.
      </p>
      <div className="mt-3">
        {uploads.isPending ? (
          <Spinner label="Loading your lab’s uploads" />
        ) : uploads.isError ? (
          <Alert tone="error" title="The uploads could not be loaded">
            {uploads.error.message}
          </Alert>
        ) : uploads.data.length === 0 ? (
          <p className="rounded-lg border border-dashed border-plumb-300 bg-white px-5 py-6 text-sm text-slate-700">
            No file has been uploaded for your lab yet.
          </p>
        ) : (
          <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white">
            <table aria-labelledby={headingId} className="w-full text-left text-sm">
              <thead className="bg-slate-50 text-xs text-slate-600">
                <tr>
                  <th scope="col" className="px-4 py-2 font-medium">
                    File
                  </th>
                  <th scope="col" className="px-4 py-2 font-medium">
                    Kind
                  </th>
                  <th scope="col" className="px-4 py-2 font-medium">
                    Received
                  </th>
                  <th scope="col" className="px-4 py-2 font-medium">
                    Sent by
                  </th>
                  <th scope="col" className="px-4 py-2 font-medium">
                    Status
                  </th>
                  <th scope="col" className="px-4 py-2 text-right font-medium">
                    Rows accepted
                  </th>
                  <th scope="col" className="px-4 py-2 text-right font-medium">
                    Rows rejected
                  </th>
                </tr>
              </thead>
              <tbody>
                {uploads.data.map((upload) => {
                  const selected = upload.id === selectedId;
                  return (
                    <tr
                      key={upload.id}
                      className={`border-t border-slate-100 ${selected ? 'bg-plumb-50' : 'hover:bg-slate-50'}`}
                    >
                      <th scope="row" className="px-4 py-2 font-normal">
                        <button
                          type="button"
                          onClick={() => onSelect(upload.id)}
                          aria-pressed={selected}
                          className="max-w-[18rem] truncate text-left font-medium text-plumb-800 underline decoration-plumb-300 underline-offset-2 hover:text-plumb-950"
                        >
                          {upload.filename}
                        </button>
                      </th>
                      <td className="px-4 py-2 whitespace-nowrap">{uploadKindLabels[upload.kind]}</td>
                      <td className="px-4 py-2 whitespace-nowrap">
                        <time dateTime={upload.createdAt}>{formatDateTime(upload.createdAt)}</time>
                      </td>
                      <td className="px-4 py-2 whitespace-nowrap">{sender(upload)}</td>
                      <td className="px-4 py-2">
                        <UploadStatusBadge status={upload.status} />
                      </td>
                      <td className="px-4 py-2 text-right">
                        <RowCount upload={upload} value={upload.rowsAccepted} />
                      </td>
                      <td className="px-4 py-2 text-right">
                        <RowCount upload={upload} value={upload.rowsRejected} />
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
        )}
      </div>
    </section>
  );
}
