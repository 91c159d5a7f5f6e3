import { and, eq, inArray, isNull, sql } from 'drizzle-orm';
import {
  periodSignoffs,
  analytes,
  columnMappings,
  controlLots,
  periods,
  procedures,
  uploads,
  type Executor,
} from '@plumbline/db';
import type { ColumnMapping, RowError, UploadKind } from '@plumbline/contracts';
import type { LotInfo, PeriodInfo, ProcedureInfo } from './row-schemas.ts';

export type UploadRecord = typeof uploads.$inferSelect;

export async function loadUpload(db: Executor, id: string): Promise<UploadRecord | null> {
  const [row] = await db.select().from(uploads).where(eq(uploads.id, id)).limit(1);
  return row ?? null;
}

/** queued (or a processing run that died) → processing; false when the upload is no longer waiting. */
export async function markProcessing(db: Executor, id: string): Promise<boolean> {
  const rows = await db
    .update(uploads)
    .set({
      status: 'processing',
      progress: 0,
      attempts: sql`${uploads.attempts} + 1`,
      failureMessage: null,
      updatedAt: new Date(),
    })
    .where(
      and(eq(uploads.id, id), inArray(uploads.status, ['queued', 'processing']), isNull(uploads.storedAt)),
    )
    .returning({ id: uploads.id });
  return rows.length === 1;
}

/** Progress of a processing upload (a cancelled one is left alone). */
export async function saveProgress(db: Executor, id: string, progress: number): Promise<void> {
  await db
    .update(uploads)
    .set({ progress, updatedAt: new Date() })
    .where(and(eq(uploads.id, id), eq(uploads.status, 'processing')));
}

export async function markNeedsReview(
  db: Executor,
  id: string,
  counts: { rowsTotal: number; rowsAccepted: number; rowsRejected: number },
  errors: RowError[],
): Promise<boolean> {
  const rows = await db
    .update(uploads)
    .set({ status: 'needs-review', progress: 1, ...counts, errors, updatedAt: new Date() })
    .where(and(eq(uploads.id, id), eq(uploads.status, 'processing')))
    .returning({ id: uploads.id });
  return rows.length === 1;
}

export async function markFailed(
  db: Executor,
  id: string,
  message: string,
  errors: RowError[] = [],
): Promise<void> {
  await db
    .update(uploads)
    .set({ status: 'failed', progress: 1, failureMessage: message, errors, updatedAt: new Date() })
    .where(
      and(eq(uploads.id, id), inArray(uploads.status, ['queued', 'processing']), isNull(uploads.storedAt)),
    );
}

export async function savedColumnMapping(
  db: Executor,
  labId: string,
  kind: UploadKind,
): Promise<ColumnMapping | null> {
  const [row] = await db
    .select({ mapping: columnMappings.mapping })
    .from(columnMappings)
    .where(and(eq(columnMappings.labId, labId), eq(columnMappings.kind, kind)))
    .limit(1);
  return row?.mapping ?? null;
}

/** What rows are checked against: the lab's procedures by code, the lots by number, the periods. */
export async function loadRowLookups(db: Executor, labId: string) {
  const procedureRows = await db
    .select({
      id: procedures.id,
      code: procedures.code,
      labId: procedures.labId,
      analyteId: analytes.id,
      analyteName: analytes.name,
      analyteUnit: analytes.unit,
      molarMass: analytes.molarMass,
    })
    .from(procedures)
    .innerJoin(analytes, eq(analytes.id, procedures.analyteId))
    .where(and(eq(procedures.labId, labId), isNull(procedures.retiredAt)));
  const procedureMap = new Map<string, ProcedureInfo>();
  for (const p of procedureRows) procedureMap.set(p.code, p);
  // Codes are matched exactly first, then ignoring case (when that is unambiguous).
  for (const p of procedureRows) {
    const upper = p.code.toUpperCase();
    if (
      !procedureMap.has(upper) &&
      procedureRows.filter((q) => q.code.toUpperCase() === upper).length === 1
    ) {
      procedureMap.set(upper, p);
    }
  }

  const lotRows = await db
    .select({ id: controlLots.id, lotNumber: controlLots.lotNumber, levels: controlLots.levels })
    .from(controlLots);
  const lots = new Map<string, LotInfo>(lotRows.map((l) => [l.lotNumber, l]));

  const periodRows = await db.select({ period: periods.period, state: periods.state }).from(periods);
  // A month the lab has signed off is read-only: its rows are rejected (comments stay possible elsewhere).
  const signed = await db
    .select({ period: periodSignoffs.period })
    .from(periodSignoffs)
    .where(eq(periodSignoffs.labId, labId));
  const signedPeriods = new Set(signed.map((s) => s.period));
  const periodMap = new Map<string, PeriodInfo>(
    periodRows.map((p) => [p.period, { ...p, signedOff: signedPeriods.has(p.period) }]),
  );

  return { procedures: procedureMap, lots, periods: periodMap };
}

/** Uploads the worker must (re)start: left queued, or processing when a worker died. */
export async function uploadsToRecover(db: Executor): Promise<{ id: string; confirmed: boolean }[]> {
  const rows = await db
    .select({ id: uploads.id, confirmedAt: uploads.confirmedAt })
    .from(uploads)
    .where(inArray(uploads.status, ['queued', 'processing']));
  return rows.map((r) => ({ id: r.id, confirmed: r.confirmedAt !== null }));
}
