import { text } from 'node:stream/consumers';
import { FileFormatError } from '../ingest/csv-reader.ts';
import { UnitConverter } from '../ingest/units.ts';
import * as ingestRepo from '../ingest/ingest.repository.ts';
import type { IngestDeps, IngestOutcome } from '../jobs/ingest.job.ts';
import { readFhirBundle } from './fhir-bundle.ts';
import { readPatientCsv, type PatientRead } from './patient-csv.ts';
import { analyteLookup, type PatientContext } from './patient-rows.ts';
import { loadAnalytes, storePatientRows } from './patient.repository.ts';

const units = new UnitConverter();

/**
 * Processes a patient-results CSV or FHIR Bundle that the ingest job has claimed. The same life as a QC
 * upload (needs-review with row errors until confirmed, failed when unreadable), with two differences:
 * a direct identifier refuses the whole file, and the original file is deleted once the upload is
 * settled (stored, failed or refused); it is kept only while the upload waits for review.
 * Log lines carry the upload id and counts, never file content.
 */
export async function processPatientUpload(
  deps: IngestDeps,
  upload: ingestRepo.UploadRecord,
  progress: (fraction: number) => Promise<void>,
): Promise<IngestOutcome> {
  const log = deps.log ?? (() => {});
  const settle = () => deps.files.delete(upload.storageKey).catch(() => {});
  let read: PatientRead;
  try {
    read = await readPatientFile(deps, upload, progress);
  } catch (error) {
    if (error instanceof FileFormatError) {
      await ingestRepo.markFailed(deps.db, upload.id, error.message, [error.error]);
      await settle();
      log(`upload ${upload.id}: failed (${error.error.code})`);
      return 'failed';
    }
    throw error;
  }
  const counts = {
    rowsTotal: read.rowsTotal,
    rowsAccepted: read.rows.length,
    rowsRejected: read.rowsRejected,
  };
  if (read.rowsRejected > 0 && !upload.confirmedAt) {
    await ingestRepo.markNeedsReview(deps.db, upload.id, counts, read.errors, read.errorsTotal);
    log(`upload ${upload.id}: needs review (${read.rowsRejected} of ${read.rowsTotal} rows rejected)`);
    return 'needs-review';
  }
  if (read.rows.length === 0) {
    await ingestRepo.markFailed(
      deps.db,
      upload.id,
      'No row of the file is valid, so nothing was stored.',
      read.errors,
      read.errorsTotal,
    );
    await settle();
    return 'failed';
  }
  await progress(0.7);
  const stored = await storePatientRows(deps.db, upload, read.rows, counts, read.errors, read.errorsTotal);
  if (!stored) return 'skipped';
  await settle();
  log(`upload ${upload.id}: stored ${read.rows.length} patient results`);
  return 'stored';
}

async function readPatientFile(
  deps: IngestDeps,
  upload: ingestRepo.UploadRecord,
  progress: (fraction: number) => Promise<void>,
): Promise<PatientRead> {
  const ctx: PatientContext = {
    labId: upload.labId,
    analytes: analyteLookup(await loadAnalytes(deps.db)),
    units,
    salt: deps.sampleKeySalt ?? '',
  };
  let source;
  try {
    source = await deps.files.open(upload.storageKey);
  } catch {
    throw new FileFormatError({
      row: 1,
      column: null,
      code: 'malformed_csv',
      message: 'The uploaded file is no longer in storage; upload it again.',
    });
  }
  if (upload.kind === 'fhir-bundle') {
    const body = await text(source);
    await progress(0.3);
    return readFhirBundle(ctx, body);
  }
  const lookups = await ingestRepo.loadRowLookups(deps.db, upload.labId, upload.kind);
  let bytes = 0;
  return readPatientCsv(
    ctx,
    source,
    () => deps.files.open(upload.storageKey),
    upload.columnMapping && Object.keys(upload.columnMapping).length ? upload.columnMapping : null,
    lookups.mapping,
    (n) => {
      bytes += n;
      void progress(upload.size > 0 ? (0.6 * bytes) / upload.size : 0);
    },
  );
}
