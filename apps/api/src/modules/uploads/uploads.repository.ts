import { and, desc, eq, inArray, isNull, sql } from 'drizzle-orm';
import { columnMappings, labs, uploads, users, type Executor } from '@plumbline/db';
import type { ColumnMapping, UploadKind, UploadStatus } from '@plumbline/contracts';

export type UploadRow = typeof uploads.$inferSelect & { uploaderName: string | null };

const uploadColumns = { upload: uploads, uploaderName: users.name };

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
export async function listUploads(db: Executor, labId: string | null, limit = 200): Promise<UploadRow[]> {
  const rows = await db
    .select(uploadColumns)
    .from(uploads)
    .leftJoin(users, eq(users.id, uploads.uploadedBy))
    .where(labId ? eq(uploads.labId, labId) : undefined)
    .orderBy(desc(uploads.createdAt))
    .limit(limit);
  return rows.map((r) => ({ ...r.upload, uploaderName: r.uploaderName }));
}

/** The latest earlier upload of the lab with the same content. */
export async function findSameContent(
  db: Executor,
  labId: string,
  sha256: string,
): Promise<{ id: string; filename: string; status: UploadStatus; createdAt: Date } | null> {
  const [row] = await db
    .select({
      id: uploads.id,
      filename: uploads.filename,
      status: uploads.status,
      createdAt: uploads.createdAt,
    })
    .from(uploads)
    .where(and(eq(uploads.labId, labId), eq(uploads.sha256, sha256)))
    .orderBy(desc(uploads.createdAt))
    .limit(1);
  return row ?? null;
}

export async function insertUpload(db: Executor, values: typeof uploads.$inferInsert): Promise<void> {
  await db.insert(uploads).values(values);
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
