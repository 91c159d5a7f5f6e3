import { and, desc, eq, getTableColumns, inArray, isNull, sql } from 'drizzle-orm';
import { columnMappings, labs, uploads, users, type Executor } from '@plumbline/db';
import type { ColumnMapping, UploadKind, UploadStatus } from '@plumbline/contracts';

export type UploadRow = typeof uploads.$inferSelect & { uploaderName: string | null };

const uploadColumns = { upload: uploads, uploaderName: users.name };

/** An upload as lists show it: never its row errors, which may be large (read them one upload at a time). */
export type UploadListRow = Omit<UploadRow, 'errors'>;
const { errors: _errors, ...listedColumns } = getTableColumns(uploads);

export async function findLab(db: Executor, labId: string): Promise<{ id: string; active: boolean } | null> {
  const [lab] = await db
    .select({ id: labs.id, active: labs.active })
    .from(labs)
    .where(eq(labs.id, labId))
    .limit(1);
  return lab ?? null;
}

export async function findUpload(db: Executor, id: string): Promise<UploadRow | null> {
  const [row] = await db
    .select(uploadColumns)
    .from(uploads)
    .leftJoin(users, eq(users.id, uploads.uploadedBy))
    .where(eq(uploads.id, id))
    .limit(1);
  return row ? { ...row.upload, uploaderName: row.uploaderName } : null;
}

/** Most recent first; `labId` null lists every lab (coordinator). */
export async function listUploads(db: Executor, labId: string | null, limit = 200): Promise<UploadListRow[]> {
  const rows = await db
    .select({ upload: listedColumns, uploaderName: users.name })
    .from(uploads)
    .leftJoin(users, eq(users.id, uploads.uploadedBy))
    .where(labId ? eq(uploads.labId, labId) : undefined)
    .orderBy(desc(uploads.createdAt))
    .limit(limit);
  return rows.map((r) => ({ ...r.upload, uploaderName: r.uploaderName }));
}

/**
 * The lab and the latest earlier upload of the lab with the same content, in one round trip (every
 * upload asks); null when there is no such lab.
 */
export async function findLabAndSameContent(
  db: Executor,
  labId: string,
  sha256: string,
): Promise<{
  lab: { id: string; active: boolean };
  earlier: { id: string; filename: string; status: UploadStatus; createdAt: Date } | null;
} | null> {
  const result = await db.execute<{
    id: string;
    active: boolean;
    earlier_id: string | null;
    earlier_filename: string | null;
    earlier_status: UploadStatus | null;
    earlier_created_at: Date | null;
  }>(sql`
    select l.id, l.active, u.id as earlier_id, u.filename as earlier_filename, u.status as earlier_status,
           u.created_at as earlier_created_at
      from labs l
      left join lateral (
        select id, filename, status, created_at from uploads
         where lab_id = l.id and sha256 = ${sha256}
         order by created_at desc limit 1) u on true
     where l.id = ${labId}`);
  const row = result.rows[0];
  if (!row) return null;
  return {
    lab: { id: row.id, active: row.active },
    earlier: row.earlier_id
      ? {
          id: row.earlier_id,
          filename: row.earlier_filename!,
          status: row.earlier_status!,
          createdAt: new Date(row.earlier_created_at!),
        }
      : null,
  };
}

/**
 * Records a received upload, the lab's column mapping when one came with it, and the audit event, in
 * one statement (so together or not at all, in one round trip).
 */
export async function insertReceivedUpload(
  db: Executor,
  upload: {
    id: string;
    labId: string;
    uploadedBy: string | null;
    tokenId: string | null;
    kind: UploadKind;
    filename: string;
    size: number;
    sha256: string;
    storageKey: string;
    columnMapping: ColumnMapping | null;
    duplicateOf: string | null;
  },
  audit: { actorId: string | null; actorLabel: string | null; details: Record<string, unknown> },
): Promise<void> {
  const mapping = upload.columnMapping ? JSON.stringify(upload.columnMapping) : null;
  await db.execute(sql`
    with received as (
      insert into uploads (id, lab_id, uploaded_by, token_id, kind, filename, size, sha256, storage_key,
                           column_mapping, duplicate_of)
      values (${upload.id}, ${upload.labId}, ${upload.uploadedBy}, ${upload.tokenId}, ${upload.kind},
              ${upload.filename}, ${upload.size}, ${upload.sha256}, ${upload.storageKey}, ${mapping}::jsonb,
              ${upload.duplicateOf})
      returning id, lab_id
    ),
    saved_mapping as (
      insert into column_mappings (lab_id, kind, mapping)
      select ${upload.labId}::uuid, ${upload.kind}::upload_kind, ${mapping}::jsonb where ${mapping}::jsonb is not null
      on conflict (lab_id, kind) do update set mapping = excluded.mapping, updated_at = ${new Date().toISOString()}::timestamptz
    )
    insert into audit_events (actor_id, actor_label, lab_id, kind, entity, entity_id, details)
    select ${audit.actorId}::uuid, ${audit.actorLabel}::text, lab_id, 'upload.received', 'upload', id::text,
           ${JSON.stringify(audit.details)}::jsonb
      from received`);
}

/** needs-review → queued for a second pass that stores the valid rows; null when the upload was not waiting. */
export async function markConfirmed(db: Executor, id: string, userId: string): Promise<boolean> {
  const rows = await db
    .update(uploads)
    .set({
      status: 'queued',
      progress: 0,
      confirmedAt: new Date(),
      confirmedBy: userId,
      updatedAt: new Date(),
    })
    .where(and(eq(uploads.id, id), eq(uploads.status, 'needs-review'), sql`${uploads.rowsAccepted} > 0`))
    .returning({ id: uploads.id });
  return rows.length === 1;
}

/**
 * Cancels an upload that has stored nothing. The condition is re-checked after any concurrent store
 * commits (row lock), so a file that was just stored is never marked cancelled.
 */
export async function markCancelled(db: Executor, id: string): Promise<boolean> {
  const rows = await db
    .update(uploads)
    .set({ status: 'cancelled', updatedAt: new Date() })
    .where(
      and(
        eq(uploads.id, id),
        inArray(uploads.status, ['queued', 'processing', 'needs-review']),
        isNull(uploads.storedAt),
      ),
    )
    .returning({ id: uploads.id });
  return rows.length === 1;
}

export async function findColumnMapping(
  db: Executor,
  labId: string,
  kind: UploadKind,
): Promise<{ mapping: ColumnMapping; updatedAt: Date } | null> {
  const [row] = await db
    .select({ mapping: columnMappings.mapping, updatedAt: columnMappings.updatedAt })
    .from(columnMappings)
    .where(and(eq(columnMappings.labId, labId), eq(columnMappings.kind, kind)))
    .limit(1);
  return row ?? null;
}

export async function saveColumnMapping(
  db: Executor,
  labId: string,
  kind: UploadKind,
  mapping: ColumnMapping,
) {
  const [row] = await db
    .insert(columnMappings)
    .values({ labId, kind, mapping })
    .onConflictDoUpdate({
      target: [columnMappings.labId, columnMappings.kind],
      set: { mapping, updatedAt: new Date() },
    })
    .returning({ mapping: columnMappings.mapping, updatedAt: columnMappings.updatedAt });
  return row;
}
