import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { canonicalColumns, type PatientUploadKind } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { riUploadKeys } from '../api/ri-keys.ts';
import { useDecidePatientUpload, useUploadPatientFile } from '../api/ri-actions.ts';

const kinds: { kind: PatientUploadKind; label: string; accept: string }[] = [
  { kind: 'patient-results', label: 'CSV of patient results', accept: '.csv,text/csv' },
  {
    kind: 'fhir-bundle',
    label: 'FHIR R4 Bundle (JSON)',
    accept: '.json,application/json,application/fhir+json',
  },
];

/** Uploads a de-identified patient file and follows it to stored, needs-review or refused. */
export function PatientUpload() {
  const [kind, setKind] = useState<PatientUploadKind>('patient-results');
  const [file, setFile] = useState<File | null>(null);
  const [uploadId, setUploadId] = useState<string | null>(null);
  const upload = useUploadPatientFile();
  const decide = useDecidePatientUpload();
  const status = useQuery({
    ...riUploadKeys.upload(uploadId ?? ''),
    enabled: uploadId !== null,
    refetchInterval: (q) =>
      ['queued', 'processing'].includes(q.state.data?.status ?? 'queued') ? 700 : false,
  });
  const detail = status.data;
  return (
    <section
      className="grid max-w-3xl gap-3 rounded-lg border border-slate-200 p-4"
      aria-label="Patient results"
    >
      <h2 className="text-lg font-semibold">Add patient results</h2>
      <p className="text-sm text-slate-700">
        De-identified results only. A file with a name, record number, birth date, address, phone, e-mail or
        national id is refused whole and nothing of it is kept. CSV columns:{' '}
        <code>{canonicalColumns['patient-results'].map((c) => c.name).join(',')}</code>.
      </p>
      <form
        className="grid gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          if (file) upload.mutate({ file, kind }, { onSuccess: (created) => setUploadId(created.id) });
        }}
      >
        <fieldset className="flex flex-wrap gap-4">
          <legend className="sr-only">File kind</legend>
          {kinds.map((k) => (
            <label key={k.kind} className="flex items-center gap-2 text-sm">
              <input
                type="radio"
                name="patient-kind"
                checked={kind === k.kind}
                onChange={() => setKind(k.kind)}
              />
              {k.label}
            </label>
          ))}
        </fieldset>
        <input
          type="file"
          aria-label="Patient results file"
          accept={kinds.find((k) => k.kind === kind)?.accept}
          onChange={(e) => setFile(e.target.files?.[0] ?? null)}
        />
        <div>
          <Button type="submit" disabled={!file} isLoading={upload.isPending}>
            Upload
          </Button>
        </div>
      </form>
      {upload.isError ? <Alert tone="error">{upload.error.message}</Alert> : null}
      {detail ? (
        <div className="grid gap-2 text-sm" aria-live="polite">
          <p>
            {detail.filename}: <strong>{detail.status}</strong> — {detail.rowsAccepted} accepted,{' '}
            {detail.rowsRejected} rejected
          </p>
          {detail.failureMessage ? <Alert tone="error">{detail.failureMessage}</Alert> : null}
          {detail.errors.length && detail.status !== 'failed' ? (
            <ul className="list-disc pl-5">
              {detail.errors.slice(0, 20).map((e, i) => (
                <li key={i}>
                  Row {e.row}
                  {e.column ? `, ${e.column}` : ''}: {e.message}
                </li>
              ))}
            </ul>
          ) : null}
          {detail.status === 'needs-review' ? (
            <div className="flex gap-2">
              <Button size="sm" onClick={() => decide.mutate({ id: detail.id, decision: 'confirm' })}>
                Store the valid rows
              </Button>
              <Button
                size="sm"
                variant="secondary"
                onClick={() => decide.mutate({ id: detail.id, decision: 'cancel' })}
              >
                Discard the file
              </Button>
            </div>
          ) : null}
        </div>
      ) : null}
    </section>
  );
}
