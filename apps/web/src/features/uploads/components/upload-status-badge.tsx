import type { UploadStatus } from '@plumbline/contracts';

export const uploadStatusLabels: Record<UploadStatus, string> = {
  queued: 'Waiting to be checked',
  processing: 'Being checked',
  'needs-review': 'Waiting for your decision',
  stored: 'Stored',
  failed: 'Could not be read',
  cancelled: 'Discarded',
};

const tones: Record<UploadStatus, string> = {
  queued: 'bg-white text-plumb-800 ring-plumb-300',
  processing: 'bg-plumb-50 text-plumb-800 ring-plumb-300',
  'needs-review': 'bg-brass-100 text-brass-700 ring-brass-300',
  stored: 'bg-plumb-700 text-white ring-plumb-700',
  failed: 'bg-alarm-50 text-alarm-800 ring-alarm-200',
  cancelled: 'bg-slate-100 text-slate-600 ring-slate-200',
};

export function UploadStatusBadge({ status }: { status: UploadStatus }) {
  return (
    <span
      className={`inline-flex items-center gap-1.5 rounded-full px-2 py-0.5 text-xs font-medium whitespace-nowrap ring-1 ring-inset ${tones[status]}`}
    >
      {status === 'queued' || status === 'processing' ? (
        <span aria-hidden="true" className="size-1.5 animate-pulse rounded-full bg-plumb-500" />
      ) : null}
      {uploadStatusLabels[status]}
    </span>
  );
}
