import { and, eq, inArray, isNull, sql } from 'drizzle-orm';
import { uploads, type Executor } from '@plumbline/db';
import {
  MAX_ERROR_TEXT_LENGTH,
  boundText,
  stripControlCharacters,
  type ColumnMapping,
  type RowError,
  type UploadKind,
} from '@plumbline/contracts';
import type { LotInfo, PeriodInfo, ProcedureInfo } from './row-schemas.ts';

export type UploadRecord = typeof uploads.$inferSelect;

export async function loadUpload(db: Executor, id: string): Promise<UploadRecord | null> {
  const [row] = await db.select().from(uploads).where(eq(uploads.id, id)).limit(1);
  return row ?? null;
}

/**
 * queued (or a processing run that died) → processing, returning the upload; null when it is no longer
 * waiting (or does not exist).
 */
export async function claimUpload(db: Executor, id: string): Promise<UploadRecord | null> {
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
    .returning();
  return rows[0] ?? null;
}

/** Progress of a processing upload (a cancelled one is left alone). */
export async function saveProgress(db: Executor, id: string, progress: number): Promise<void> {
  await db
    .update(uploads)
    .set({ progress, updatedAt: new Date() })
    .where(and(eq(uploads.id, id), eq(uploads.status, 'processing')));
}

/**
 * A row error as stored: messages and column names quote the file, so control characters (NUL above
 * all, which PostgreSQL refuses in JSON) are removed, then the text is cut to MAX_ERROR_TEXT_LENGTH.
 */
export function boundError(error: RowError): RowError {
  return {
    ...error,
    column: error.column === null ? null : boundText(stripControlCharacters(error.column)),
    message: boundText(stripControlCharacters(error.message)),
  };
}

export async function markNeedsReview(
  db: Executor,
  id: string,
  counts: { rowsTotal: number; rowsAccepted: number; rowsRejected: number },
  errors: RowError[],
  errorsTotal: number,
): Promise<boolean> {
  const rows = await db
    .update(uploads)
    .set({
      status: 'needs-review',
      progress: 1,
      ...counts,
      errors: errors.map(boundError),
      errorsTotal,
      updatedAt: new Date(),
    })
    .where(and(eq(uploads.id, id), eq(uploads.status, 'processing')))
    .returning({ id: uploads.id });
  return rows.length === 1;
}

export async function markFailed(
  db: Executor,
  id: string,
  message: string,
  errors: RowError[] = [],
  errorsTotal = errors.length,
): Promise<void> {
  await db
    .update(uploads)
    .set({
      status: 'failed',
      progress: 1,
      // A message may quote the file (a header, a cell): cleaned and kept short whatever the file held.
      failureMessage: boundText(stripControlCharacters(message), 4 * MAX_ERROR_TEXT_LENGTH),
      errors: errors.map(boundError),
      errorsTotal,
      updatedAt: new Date(),
    })
    .where(
      and(eq(uploads.id, id), inArray(uploads.status, ['queued', 'processing']), isNull(uploads.storedAt)),
    );
}

/**
 * What rows are checked against — the lab's procedures by code, the lots by number, the periods (marked
 * when the lab has signed them off) — and the lab's saved column mapping for the kind, in one round trip
 * (it runs for every upload).
 */
export async function loadRowLookups(db: Executor, labId: string, kind: UploadKind) {
  const result = await db.execute<{
    procedures: ProcedureInfo[];
    lots: LotInfo[];
    periods: PeriodInfo[];
    signed: string[];
    mapping: ColumnMapping | null;
  }>(sql`
    select
      (select coalesce(json_agg(json_build_object(
                'id', p.id, 'code', p.code, 'labId', p.lab_id, 'analyteId', a.id, 'analyteName', a.name,
                'analyteUnit', a.unit, 'molarMass', a.molar_mass, 'plausibleLow', a.plausible_low,
                'plausibleHigh', a.plausible_high, 'plausibilitySource', a.plausibility_source,
                'allowsNegative', a.allows_negative)), '[]'::json)
         from procedures p join analytes a on a.id = p.analyte_id
        where p.lab_id = ${labId} and p.retired_at is null) as procedures,
      (select coalesce(json_agg(json_build_object('id', id, 'lotNumber', lot_number, 'levels', levels)), '[]'::json)
         from control_lots) as lots,
      (select coalesce(json_agg(json_build_object('period', period, 'state', state)), '[]'::json)
         from periods) as periods,
      (select coalesce(json_agg(period), '[]'::json) from period_signoffs where lab_id = ${labId}) as signed,
      (select mapping from column_mappings where lab_id = ${labId} and kind = ${kind} limit 1) as mapping`);
  const row = result.rows[0];
  const procedureRows = row.procedures;
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
  const lots = new Map<string, LotInfo>(row.lots.map((l) => [l.lotNumber, l]));
  // A month the lab has signed off is read-only: its rows are rejected (comments stay possible elsewhere).
  const signedPeriods = new Set(row.signed);
  const periodMap = new Map<string, PeriodInfo>(
    row.periods.map((p) => [p.period, { ...p, signedOff: signedPeriods.has(p.period) }]),
  );
  return { procedures: procedureMap, lots, periods: periodMap, mapping: row.mapping ?? null };
}

/** Uploads the worker must (re)start: left queued, or processing when a worker died. */
export async function uploadsToRecover(db: Executor): Promise<{ id: string; confirmed: boolean }[]> {
  const rows = await db
    .select({ id: uploads.id, confirmedAt: uploads.confirmedAt })
    .from(uploads)
    .where(inArray(uploads.status, ['queued', 'processing']));
  return rows.map((r) => ({ id: r.id, confirmed: r.confirmedAt !== null }));
}
