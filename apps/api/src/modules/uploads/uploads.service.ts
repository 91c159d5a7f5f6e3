import { randomUUID } from 'node:crypto';
import {
  canonicalColumns,
  columnMappingProblems,
  isPatientUploadKind,
  detectDecimalComma,
  detectDelimiter,
  firstLine,
  parseCsvStart,
  sniffTextFile,
  duplicateHeader,
  stripBom,
  suggestMapping,
  uploadFieldsSchema,
  uploadKindSchema,
  type ColumnMapping,
  type ColumnMappingResponse,
  type UploadCreated,
  type UploadDetail,
  type UploadKind,
  type UploadPreview,
  type UploadSummary,
} from '@plumbline/contracts';
import { recordAudit } from '@plumbline/db';
import type { AppDeps } from '../../deps.ts';
import type { Principal } from '../../auth/principal.ts';
import { actorOf } from '../../auth/principal.ts';
import { assertLabAccess } from '../../auth/authenticate.ts';
import { badRequest, conflict, forbidden, notFound } from '../../errors/app-error.ts';
import { parseInput } from '../../http/validate.ts';
import type { StoredObject } from '../../storage/storage.ts';
import * as repo from './uploads.repository.ts';

export type UploadDeps = Pick<AppDeps, 'db' | 'storage' | 'ingestQueue'>;

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** The lab an upload is for: a token's own lab, the caller's lab, or (coordinator) the lab named in the form. */
function uploadLabFor(principal: Principal, requested: string | undefined): string {
  if (principal.kind === 'lab-token' || principal.role !== 'coordinator') {
    if (!principal.labId) throw forbidden('Your account belongs to no lab, so it cannot upload QC data.');
    if (requested && requested !== principal.labId) throw notFound('Lab');
    return principal.labId;
  }
  if (!requested)
    throw badRequest('A coordinator uploads on behalf of a lab: give its id in the "labId" field.');
  if (!UUID.test(requested)) throw badRequest(`The "labId" field is not a lab id (expected a UUID).`);
  return requested;
}

/** Multipart text fields → typed fields; `mapping` arrives as JSON text. */
function parseUploadFields(fields: Record<string, string>) {
  let mapping: unknown = undefined;
  if (fields.mapping !== undefined && fields.mapping.trim() !== '') {
    try {
      mapping = JSON.parse(fields.mapping);
    } catch {
      throw badRequest('The "mapping" field is not valid JSON: send an object such as {"mean": "Average"}.');
    }
  }
  const parsed = parseInput(
    uploadFieldsSchema,
    { kind: fields.kind, labId: fields.labId || undefined, mapping },
    'form fields',
  );
  if (parsed.mapping) {
    const problems = columnMappingProblems(parsed.kind, parsed.mapping);
    if (problems.length)
      throw badRequest(`The column mapping is not valid: ${problems.join('; ')}.`, problems);
  }
  return parsed;
}

/**
 * Records a file that has been streamed to storage and hands it to the ingest worker. Whatever fails
 * here removes the stored file again, so storage holds no file without an upload row.
 */
export async function receiveUpload(
  deps: UploadDeps,
  principal: Principal,
  input: { uploadId: string; fields: Record<string, string>; filename: string; stored: StoredObject },
): Promise<UploadCreated> {
  try {
    const fields = parseUploadFields(input.fields);
    const labId = uploadLabFor(principal, fields.labId);
    const found = UUID.test(labId)
      ? await repo.findLabAndSameContent(deps.db, labId, input.stored.sha256)
      : null;
    if (!found) throw notFound('Lab');
    if (!found.lab.active) throw conflict('This lab is deactivated and cannot upload data.');
    if (input.stored.size === 0) throw badRequest(`The file "${input.filename}" is empty.`);

    const earlier = found.earlier;
    const actor = actorOf(principal);
    // The upload row, the lab's column mapping (when one was sent) and the audit event go in together.
    await repo.insertReceivedUpload(
      deps.db,
      {
        id: input.uploadId,
        labId,
        uploadedBy: actor.actorId,
        tokenId: principal.kind === 'lab-token' ? principal.tokenId : null,
        kind: fields.kind,
        filename: input.filename,
        size: input.stored.size,
        sha256: input.stored.sha256,
        storageKey: input.stored.key,
        columnMapping: fields.mapping ?? null,
        duplicateOf: earlier?.id ?? null,
      },
      {
        ...actor,
        details: {
          kind: fields.kind,
          filename: input.filename,
          size: input.stored.size,
          sha256: input.stored.sha256,
        },
      },
    );
    await deps.ingestQueue.enqueue(input.uploadId, 'initial');

    if (!earlier) return { id: input.uploadId, status: 'queued' };
    return {
      id: input.uploadId,
      status: 'queued',
      duplicateOf: earlier.id,
      message:
        `This file is identical to "${earlier.filename}", uploaded on ${earlier.createdAt.toISOString().slice(0, 10)} ` +
        `(that upload is ${earlier.status}). It is processed again: its data replaces the same lab, procedure, lot, ` +
        `level and period, so nothing is counted twice.`,
    };
  } catch (error) {
    await deps.storage.delete(input.stored.key).catch(() => {});
    throw error;
  }
}

export function newUploadId(): string {
  return randomUUID();
}

function toSummary(row: repo.UploadListRow): UploadSummary {
  return {
    id: row.id,
    labId: row.labId,
    kind: row.kind,
    filename: row.filename,
    size: row.size,
    sha256: row.sha256,
    status: row.status,
    progress: Math.min(1, Math.max(0, row.progress)),
    rowsTotal: row.rowsTotal,
    rowsAccepted: row.rowsAccepted,
    rowsRejected: row.rowsRejected,
    failureMessage: row.failureMessage,
    duplicateOf: row.duplicateOf,
    via: row.tokenId ? 'api-token' : 'user',
    uploadedBy: row.uploadedBy ? { id: row.uploadedBy, name: row.uploaderName ?? '' } : null,
    createdAt: row.createdAt.toISOString(),
    storedAt: row.storedAt?.toISOString() ?? null,
    confirmedAt: row.confirmedAt?.toISOString() ?? null,
  };
}

/** An upload the principal may see; another lab's upload is "not found". */
async function visibleUpload(deps: UploadDeps, principal: Principal, id: string): Promise<repo.UploadRow> {
  const row = UUID.test(id) ? await repo.findUpload(deps.db, id) : null;
  if (!row) throw notFound('Upload');
  assertLabAccess(principal, row.labId, 'Upload');
  return row;
}

export async function getUploadDetail(
  deps: UploadDeps,
  principal: Principal,
  id: string,
): Promise<UploadDetail> {
  const row = await visibleUpload(deps, principal, id);
  return {
    ...toSummary(row),
    errors: row.errors as UploadDetail['errors'],
    errorsTotal: Math.max(row.errorsTotal, row.errors.length),
    // The worker keeps the first errors only (the INGEST_MAX_ROW_ERRORS threshold) but counts them all.
    errorsTruncated: row.errorsTotal > row.errors.length,
    columnMapping: row.columnMapping ?? null,
  };
}

export async function listLabUploads(
  deps: UploadDeps,
  principal: Principal,
  labId: string | undefined,
): Promise<UploadSummary[]> {
  let scope: string | null;
  if (principal.role === 'coordinator') scope = labId ?? null;
  else {
    if (labId && labId !== principal.labId) throw notFound('Lab');
    if (!principal.labId) return [];
    scope = principal.labId;
  }
  return (await repo.listUploads(deps.db, scope)).map(toSummary);
}

export async function confirmUpload(
  deps: UploadDeps,
  principal: Principal,
  id: string,
): Promise<UploadSummary> {
  const row = await visibleUpload(deps, principal, id);
  if (principal.kind !== 'user') throw forbidden('Only a signed-in user can confirm an upload.');
  if (row.status !== 'needs-review') {
    throw conflict(`Only an upload waiting for review can be confirmed; this one is ${row.status}.`);
  }
  if (row.rowsAccepted === 0)
    throw conflict(
      'No row of this file is valid, so there is nothing to store. Cancel it and upload a corrected file.',
    );
  const confirmed = await deps.db.transaction(async (tx) => {
    const ok = await repo.markConfirmed(tx, id, principal.userId);
    if (ok) {
      await recordAudit(tx, {
        kind: 'upload.confirmed',
        ...actorOf(principal),
        labId: row.labId,
        entity: 'upload',
        entityId: id,
        details: { rowsAccepted: row.rowsAccepted, rowsRejected: row.rowsRejected },
      });
    }
    return ok;
  });
  if (!confirmed) throw conflict('The upload changed meanwhile; reload it and try again.');
  await deps.ingestQueue.enqueue(id, 'confirmed');
  return toSummary((await repo.findUpload(deps.db, id))!);
}

export async function cancelUpload(
  deps: UploadDeps,
  principal: Principal,
  id: string,
): Promise<UploadSummary> {
  const row = await visibleUpload(deps, principal, id);
  if (principal.kind !== 'user') throw forbidden('Only a signed-in user can cancel an upload.');
  const cancelled = await deps.db.transaction(async (tx) => {
    const ok = await repo.markCancelled(tx, id);
    if (ok) {
      await recordAudit(tx, {
        kind: 'upload.cancelled',
        ...actorOf(principal),
        labId: row.labId,
        entity: 'upload',
        entityId: id,
      });
    }
    return ok;
  });
  if (!cancelled) {
    const now = await repo.findUpload(deps.db, id);
    throw conflict(`This upload can no longer be cancelled: it is ${now?.status ?? row.status}.`);
  }
  // A patient file is kept only while it waits for a decision.
  if (isPatientUploadKind(row.kind)) await deps.storage.delete(row.storageKey).catch(() => {});
  return toSummary((await repo.findUpload(deps.db, id))!);
}

/** How many bytes of a file the preview reads. */
export const PREVIEW_BYTES = 64 * 1024;
const PREVIEW_ROWS = 10;

/** Reads the head of a file: delimiter, decimal comma, headers, the first rows and a suggested mapping. */
export async function previewUpload(
  deps: UploadDeps,
  principal: Principal,
  input: { fields: Record<string, string>; head: Buffer; complete: boolean; filename: string },
): Promise<UploadPreview> {
  const kind = parseInput(uploadKindSchema, input.fields.kind, 'kind');
  if (kind === 'fhir-bundle')
    throw badRequest('A FHIR Bundle has no columns to map: upload it directly with kind "fhir-bundle".');
  const labId = uploadLabFor(principal, input.fields.labId || undefined);
  const sniffed = sniffTextFile(input.head, input.complete);
  if ('problem' in sniffed) throw badRequest(`"${input.filename}": ${sniffed.problem}`);
  const decoded = new TextDecoder(sniffed.encoding, { ignoreBOM: true }).decode(input.head);
  const { text, bom } = stripBom(decoded);
  if (text.trim() === '') throw badRequest(`The file "${input.filename}" is empty.`);
  const delimiter = detectDelimiter(firstLine(text));
  const [headers = [], ...rows] = parseCsvStart(text, delimiter, {
    maxRows: PREVIEW_ROWS + 1,
    complete: input.complete,
  });
  const repeated = duplicateHeader(headers.map((h) => h.trim()));
  if (repeated !== null) {
    throw badRequest(
      `"${input.filename}": the header names the column "${repeated.trim()}" more than once; remove or rename one of them.`,
    );
  }
  const saved = await repo.findColumnMapping(deps.db, labId, kind);
  const suggestion = suggestMapping(
    kind,
    headers.map((h) => h.trim()),
    saved?.mapping,
  );
  return {
    kind,
    delimiter,
    decimalComma: detectDecimalComma(delimiter, rows),
    bom,
    headers: headers.map((h) => h.trim()),
    rows,
    suggestedMapping: suggestion.mapping,
    mappingSource: suggestion.source,
    missingColumns: suggestion.missing,
    columns: canonicalColumns[kind].map((c) => ({ ...c })),
  };
}

export async function getColumnMapping(
  deps: UploadDeps,
  principal: Principal,
  labId: string,
  kindText: string,
): Promise<ColumnMappingResponse> {
  assertLabAccess(principal, labId);
  const kind = parseKind(kindText);
  const saved = UUID.test(labId) ? await repo.findColumnMapping(deps.db, labId, kind) : null;
  return { kind, mapping: saved?.mapping ?? null, updatedAt: saved?.updatedAt.toISOString() ?? null };
}

export async function putColumnMapping(
  deps: UploadDeps,
  principal: Principal,
  labId: string,
  kindText: string,
  mapping: ColumnMapping,
): Promise<ColumnMappingResponse> {
  assertLabAccess(principal, labId);
  const kind = parseKind(kindText);
  const lab = UUID.test(labId) ? await repo.findLab(deps.db, labId) : null;
  if (!lab) throw notFound('Lab');
  const problems = columnMappingProblems(kind, mapping);
  if (problems.length) throw badRequest(`The column mapping is not valid: ${problems.join('; ')}.`, problems);
  const saved = await deps.db.transaction(async (tx) => {
    const row = await repo.saveColumnMapping(tx, labId, kind, mapping);
    await recordAudit(tx, {
      kind: 'column-mapping.saved',
      ...actorOf(principal),
      labId,
      entity: 'column-mapping',
      entityId: kind,
      details: { mapping },
    });
    return row;
  });
  return { kind, mapping: saved.mapping, updatedAt: saved.updatedAt.toISOString() };
}

function parseKind(kindText: string): UploadKind {
  const parsed = uploadKindSchema.safeParse(kindText);
  if (!parsed.success) throw notFound('File kind');
  return parsed.data;
}
