import { useEffect, useId, useRef } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { formatDateTime, formatFileSize } from '../../../utils/format.ts';
import { useUpload } from '../hooks/use-uploads.ts';
import { uploadKindLabels } from './upload-kind-choice.tsx';
import { UploadStatusBadge } from './upload-status-badge.tsx';
import { UploadStatusView } from './upload-status-view.tsx';

/** One upload from the history: what was sent, when and by whom, and where it stands. */
export function UploadDetails({
  uploadId,
  onClose,
  onStored,
}: {
  uploadId: string;
  onClose: () => void;
  onStored?: () => void;
}) {
  const headingId = useId();
  const heading = useRef<HTMLHeadingElement>(null);
  const upload = useUpload(uploadId);
  const data = upload.data;

  // Keyboard and screen-reader users land on the details they asked for.
  useEffect(() => {
    heading.current?.focus();
  }, [uploadId]);

  return (
    <section
      aria-labelledby={headingId}
      className="rounded-lg border border-slate-200 bg-white p-5 shadow-xs md:p-6"
    >
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-xs font-semibold tracking-[0.12em] text-slate-500 uppercase">Upload details</p>
          <h2
            id={headingId}
            ref={heading}
            tabIndex={-1}
            className="mt-1 text-base font-semibold text-plumb-950"
          >
            {data?.filename ?? 'Upload'}
          </h2>
        </div>
        <Button variant="secondary" size="sm" onClick={onClose}>
          Close
        </Button>
      </div>
      {data ? (
        <dl className="mt-3 grid gap-x-6 gap-y-2 text-sm sm:grid-cols-3">
          <div>
            <dt className="text-xs text-slate-500">Kind</dt>
            <dd>{uploadKindLabels[data.kind]}</dd>
          </div>
          <div>
            <dt className="text-xs text-slate-500">Received</dt>
            <dd>
              <time dateTime={data.createdAt}>{formatDateTime(data.createdAt)}</time>
            </dd>
          </div>
          <div>
            <dt className="text-xs text-slate-500">Status</dt>
            <dd>
              <UploadStatusBadge status={data.status} />
            </dd>
          </div>
          <div>
            <dt className="text-xs text-slate-500">Sent by</dt>
            <dd>{data.via === 'api-token' ? 'Lab API token' : (data.uploadedBy?.name ?? '—')}</dd>
          </div>
          <div>
            <dt className="text-xs text-slate-500">Size</dt>
            <dd>{formatFileSize(data.size)}</dd>
          </div>
          <div>
            <dt className="text-xs text-slate-500">Fingerprint (SHA-256)</dt>
            <dd>
              <code className="font-mono text-xs text-slate-700" title={data.sha256}>
                {data.sha256.slice(0, 16)}…
              </code>
            </dd>
          </div>
        </dl>
      ) : null}
      <div className="mt-4">
        <UploadStatusView key={uploadId} uploadId={uploadId} onStored={onStored} />
      </div>
    </section>
  );
}
