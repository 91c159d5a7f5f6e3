// Sending one file: choose its kind and the file (drop or picker), match its columns, then follow the
// upload until it is stored, waits for a decision, or fails.
import { useState } from 'react';
import type { UploadKind, UploadStatus } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { formatFileSize, formatPeriod } from '../../../utils/format.ts';
import { useCreateUpload } from '../api/create-upload.ts';
import { usePreviewUpload } from '../api/preview-upload.ts';
import { samplePeriods, toColumnMapping, type MappingDraft } from '../utils/column-mapping.ts';
import { ColumnMappingStep } from './column-mapping-step.tsx';
import { FileDropZone } from './file-drop-zone.tsx';
import { UploadKindChoice, uploadKindLabels } from './upload-kind-choice.tsx';
import { UploadStatusView } from './upload-status-view.tsx';

type SentUpload = {
  id: string;
  filename: string;
  kind: UploadKind;
  size: number;
  status: UploadStatus;
  duplicateNotice: string | null;
  /** Months found in the file's first rows. */
  periods: string[];
};

const steps = ['Choose the file', 'Match the columns', 'Check and store'] as const;

function StepIndicator({ current }: { current: number }) {
  return (
    <ol className="flex flex-wrap gap-x-6 gap-y-2 text-sm" aria-label="Steps">
      {steps.map((step, index) => {
        const state = index < current ? 'done' : index === current ? 'current' : 'next';
        return (
          <li
            key={step}
            aria-current={state === 'current' ? 'step' : undefined}
            className={`flex items-center gap-2 ${state === 'next' ? 'text-slate-500' : 'text-plumb-900'}`}
          >
            <span
              aria-hidden="true"
              className={`flex size-6 items-center justify-center rounded-full text-xs font-semibold ${
                state === 'current'
                  ? 'bg-plumb-700 text-white'
                  : state === 'done'
                    ? 'bg-plumb-100 text-plumb-800'
                    : 'bg-slate-100 text-slate-500'
              }`}
            >
              {state === 'done' ? '✓' : index + 1}
            </span>
            <span className={state === 'current' ? 'font-semibold' : undefined}>{step}</span>
          </li>
        );
      })}
    </ol>
  );
}

export function UploadJourney({ onStored }: { onStored: (periods: string[]) => void }) {
  const [kind, setKind] = useState<UploadKind>('qc-summary');
  const [file, setFile] = useState<File | null>(null);
  const [draft, setDraft] = useState<MappingDraft>({});
  const [sent, setSent] = useState<SentUpload | null>(null);
  const preview = usePreviewUpload();
  const create = useCreateUpload();

  const readFile = (nextFile: File, nextKind: UploadKind) => {
    setFile(nextFile);
    create.reset();
    // Only the latest call's callback runs, so a slower earlier preview cannot overwrite this one.
    preview.mutate(
      { file: nextFile, kind: nextKind },
      { onSuccess: (result) => setDraft({ ...result.suggestedMapping }) },
    );
  };

  const chooseKind = (nextKind: UploadKind) => {
    setKind(nextKind);
    if (file) readFile(file, nextKind);
  };

  const startOver = () => {
    setFile(null);
    setDraft({});
    setSent(null);
    preview.reset();
    create.reset();
  };

  const upload = () => {
    if (!file || !preview.data) return;
    const periods = samplePeriods(kind, preview.data, draft);
    create.mutate(
      { file, kind, mapping: toColumnMapping(draft) },
      {
        onSuccess: (created) =>
          setSent({
            id: created.id,
            filename: file.name,
            kind,
            size: file.size,
            status: created.status,
            duplicateNotice: created.duplicateOf
              ? (created.message ?? 'Your lab has uploaded a file with exactly this content before.')
              : null,
            periods,
          }),
      },
    );
  };

  const mapping = file && preview.data && preview.data.kind === kind ? preview.data : null;
  const currentStep = sent ? 2 : mapping ? 1 : 0;

  return (
    <section
      aria-label="Send a file"
      className="self-start rounded-lg border border-slate-200 bg-white p-5 shadow-xs md:p-6"
    >
      <StepIndicator current={currentStep} />
      <div className="mt-5 border-t border-slate-100 pt-5">
        {sent ? (
          <div className="space-y-4">
            <div className="flex flex-wrap items-baseline justify-between gap-2">
              <h2 className="text-base font-semibold text-plumb-950">{sent.filename}</h2>
              <p className="text-xs text-slate-600">
                {uploadKindLabels[sent.kind]} · {formatFileSize(sent.size)}
              </p>
            </div>
            <UploadStatusView
              key={sent.id}
              uploadId={sent.id}
              initialStatus={sent.status}
              duplicateNotice={sent.duplicateNotice}
              storedNote={
                sent.periods.length > 0
                  ? `Your report for ${formatPeriod(sent.periods[sent.periods.length - 1])} now includes it.`
                  : 'Your period report now includes it.'
              }
              onStored={() => onStored(sent.periods)}
            />
            <Button variant="secondary" onClick={startOver}>
              Send another file
            </Button>
          </div>
        ) : (
          <div className="space-y-5">
            <UploadKindChoice
              value={kind}
              onChange={chooseKind}
              disabled={preview.isPending || create.isPending}
            />
            {mapping && file ? (
              <ColumnMappingStep
                preview={mapping}
                fileName={file.name}
                draft={draft}
                periods={samplePeriods(kind, mapping, draft)}
                onChange={(column, header) => setDraft((current) => ({ ...current, [column]: header }))}
                onUpload={upload}
                onChooseAnother={startOver}
                isUploading={create.isPending}
                uploadError={create.error?.message ?? null}
              />
            ) : (
              <>
                <FileDropZone
                  file={file}
                  onFile={(chosen) => readFile(chosen, kind)}
                  disabled={preview.isPending}
                />
                {preview.isPending ? <Spinner label="Reading the first lines of the file" /> : null}
                {preview.isError ? (
                  <Alert tone="error" title="The file could not be read">
                    {preview.error.message}
                  </Alert>
                ) : null}
              </>
            )}
          </div>
        )}
      </div>
    </section>
  );
}
