// Where an upload stands: a live progress bar while the worker has it, then the outcome: stored,
// waiting for the user's decision (with the rejected rows), unreadable, or discarded.
import type { ReactNode } from 'react';
import type { UploadDetail, UploadStatus } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ProgressBar } from '../../../components/ui/progress-bar.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { formatCount } from '../../../utils/format.ts';
import { isWorking } from '../api/upload-keys.ts';
import { useCancelUpload, useConfirmUpload } from '../api/decide-upload.ts';
import { useUpload, useUploadStatusChange } from '../hooks/use-uploads.ts';
import { RowErrorsTable } from './row-errors-table.tsx';

function rows(count: number): string {
  return `${formatCount(count)} ${count === 1 ? 'row' : 'rows'}`;
}

const outcomeTones = {
  stored: 'border-plumb-600',
  review: 'border-brass-500',
  failed: 'border-alarm-700',
  cancelled: 'border-slate-400',
} as const;

function Outcome({
  tone,
  title,
  children,
}: {
  tone: keyof typeof outcomeTones;
  title: string;
  children?: ReactNode;
}) {
  return (
    <div className={`rounded-md border border-l-4 border-slate-200 bg-white px-4 py-3 ${outcomeTones[tone]}`}>
      <p className="text-[0.95rem] font-semibold text-slate-900">{title}</p>
      {children ? (
        <div className="mt-1 space-y-2 text-sm leading-relaxed text-slate-700">{children}</div>
      ) : null}
    </div>
  );
}

function Working({ upload }: { upload: UploadDetail }) {
  const storing = upload.confirmedAt !== null;
  const label = storing ? 'Storing the valid rows' : `Checking ${upload.filename}`;
  const checked = upload.rowsAccepted + upload.rowsRejected;
  const percent = Math.round(upload.progress * 100);
  const waiting = upload.status === 'queued';
  return (
    <div className="rounded-md border border-plumb-200 bg-plumb-50/60 px-4 py-4">
      <div className="flex items-baseline justify-between gap-3">
        <p className="text-sm font-semibold text-plumb-900">{label}</p>
        <p className="figures text-sm text-plumb-800">{waiting ? 'waiting to start' : `${percent}%`}</p>
      </div>
      <div className="mt-2">
        <ProgressBar
          label={label}
          value={upload.progress}
          valueText={waiting ? 'Waiting to start' : `${percent}%`}
        />
      </div>
      <p className="mt-2 text-xs text-slate-600">
        {waiting
          ? 'The file is in the queue; checking starts in a moment.'
          : checked > 0
            ? `${rows(checked)} checked so far. You can leave this page; the upload carries on.`
            : 'You can leave this page; the upload carries on.'}
      </p>
    </div>
  );
}

function Decision({ upload }: { upload: UploadDetail }) {
  const confirm = useConfirmUpload();
  const cancel = useCancelUpload();
  const busy = confirm.isPending || cancel.isPending;
  const failure = confirm.error ?? cancel.error;
  const nothingValid = upload.rowsAccepted === 0;
  return (
    <Outcome
      tone="review"
      title={`${rows(upload.rowsRejected)} of ${formatCount(upload.rowsTotal)} rejected: nothing is stored until you decide`}
    >
      {nothingValid ? (
        <p>
          No row of this file passed the checks, so there is nothing to store. Correct the file, upload it
          again, and discard this upload.
        </p>
      ) : (
        <p>
          {rows(upload.rowsAccepted)} passed the checks. Either correct the rejected rows in your file and
          upload it again (then discard this upload), or store the {rows(upload.rowsAccepted)} that passed now
          and leave the rejected ones out.
        </p>
      )}
      {failure ? <Alert tone="error">{failure.message}</Alert> : null}
      <div className="flex flex-wrap gap-3 pt-1">
        {nothingValid ? null : (
          <Button onClick={() => confirm.mutate(upload.id)} isLoading={confirm.isPending} disabled={busy}>
            Store the valid rows
          </Button>
        )}
        <Button
          variant="secondary"
          onClick={() => cancel.mutate(upload.id)}
          isLoading={cancel.isPending}
          disabled={busy}
        >
          Discard this upload
        </Button>
      </div>
    </Outcome>
  );
}

function Result({ upload, storedNote }: { upload: UploadDetail; storedNote?: string }) {
  switch (upload.status) {
    case 'stored':
      return (
        <Outcome tone="stored" title={`Stored: ${rows(upload.rowsAccepted)} accepted`}>
          <p>
            {upload.rowsRejected > 0
              ? `${rows(upload.rowsRejected)} rejected were left out, as you chose.`
              : 'Every row passed the checks.'}
            {storedNote ? ` ${storedNote}` : null}
          </p>
        </Outcome>
      );
    case 'needs-review':
      return <Decision upload={upload} />;
    case 'failed':
      return (
        <Outcome tone="failed" title="This file could not be read">
          <p>{upload.failureMessage ?? 'The worker stopped on this file without saying why.'}</p>
          <p>Nothing from it was stored. Correct the file and upload it again.</p>
        </Outcome>
      );
    case 'cancelled':
      return (
        <Outcome tone="cancelled" title="Discarded">
          <p>Nothing from this file was stored.</p>
        </Outcome>
      );
    default:
      return null;
  }
}

/**
 * The live state of one upload. `onStored` runs once when the upload becomes stored while shown;
 * `initialStatus` is what the API said when the file was sent (see useUploadStatusChange).
 */
export function UploadStatusView({
  uploadId,
  initialStatus,
  duplicateNotice,
  storedNote,
  onStored,
}: {
  uploadId: string;
  initialStatus?: UploadStatus;
  duplicateNotice?: string | null;
  /** One more sentence for a stored upload, e.g. which report now includes it. */
  storedNote?: string;
  onStored?: () => void;
}) {
  const upload = useUpload(uploadId);
  useUploadStatusChange(upload.data?.status, { initialStatus, onStored });

  if (upload.isPending) return <Spinner label="Loading the upload" />;
  if (upload.isError) {
    return (
      <Alert tone="error" title="The upload could not be loaded">
        {upload.error.message}
      </Alert>
    );
  }
  const data = upload.data;
  const notice =
    duplicateNotice ??
    (data.duplicateOf ? 'This file is byte-for-byte the same as an earlier upload of your lab.' : null);
  const showErrors =
    data.errors.length > 0 &&
    (data.status === 'needs-review' || data.status === 'failed' || data.status === 'stored');

  return (
    <div className="space-y-4">
      {notice ? (
        <Alert tone="info" title="Your lab has sent this same file before">
          {notice}
        </Alert>
      ) : null}
      {isWorking(data.status) ? <Working upload={data} /> : null}
      <div aria-live="polite">
        <Result upload={data} storedNote={storedNote} />
      </div>
      {showErrors ? (
        <RowErrorsTable errors={data.errors} filename={data.filename} totalRejected={data.rowsRejected} />
      ) : null}
    </div>
  );
}
