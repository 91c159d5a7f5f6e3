import { sql } from 'drizzle-orm';
import { markUniqueSamples, recordAudit, type Database, type Executor } from '@plumbline/db';
import type { RowError } from '@plumbline/contracts';
import { boundError } from '../ingest/ingest.repository.ts';
import type { AnalyteInfo, PatientRow } from './patient-rows.ts';

export async function loadAnalytes(db: Executor): Promise<AnalyteInfo[]> {
  const result = await db.execute<AnalyteInfo>(sql`
    select id, code, loinc, unit, molar_mass as "molarMass", plausible_low as "plausibleLow",
           plausible_high as "plausibleHigh"
      from analytes where retired_at is null`);
  return result.rows;
}

const CHUNK = 5000;

/**
 * Stores an upload's rows, replacing the rows of earlier uploads of the same lab with identical content
 * (a re-upload replaces), and marks the upload stored — in one transaction.
 */
export async function storePatientRows(...args: Parameters<typeof storeRows>): Promise<boolean> {
  // Driver errors quote the statement's parameters; the message must not carry stored content to the log.
  return storeRows(...args).catch((error: unknown) => {
    const code = (error as { cause?: { code?: string } }).cause?.code ?? 'unknown';
    throw new Error(`storing the patient results failed (database error ${code})`);
  });
}

async function storeRows(
  db: Database,
  upload: { id: string; labId: string; sha256: string },
  rows: PatientRow[],
  counts: { rowsTotal: number; rowsAccepted: number; rowsRejected: number },
  errors: RowError[],
  errorsTotal: number,
): Promise<boolean> {
  return db
    .transaction(async (tx) => {
      await tx.execute(sql`
      delete from patient_results where upload_id in (
        select id from uploads where lab_id = ${upload.labId} and sha256 = ${upload.sha256} and id <> ${upload.id})`);
      for (let start = 0; start < rows.length; start += CHUNK) {
        const chunk = rows.slice(start, start + CHUNK);
        await tx.execute(sql`
        insert into patient_results
          (lab_id, upload_id, analyte_id, value, sex, age_years, collected_month, setting, sample_hash,
           sample_unique)
        select ${upload.labId}, ${upload.id}, u.*, u.hash is not null from unnest(
          ${sql.param(chunk.map((r) => r.analyteId))}::uuid[], ${sql.param(chunk.map((r) => r.value))}::float8[],
          ${sql.param(chunk.map((r) => r.sex))}::text[], ${sql.param(chunk.map((r) => r.ageYears))}::int2[],
          ${sql.param(chunk.map((r) => r.collectedMonth))}::text[], ${sql.param(chunk.map((r) => r.setting))}::text[],
          ${sql.param(chunk.map((r) => r.sampleHash))}::text[])
          as u(analyte_id, value, sex, age_years, collected_month, setting, hash)`);
      }
      // Keys this upload repeats (in itself or with earlier uploads) lose their mark.
      await markUniqueSamples(tx, upload.labId, upload.id);
      const marked = await tx.execute(sql`
      update uploads set status = 'stored', stored_at = now(), progress = 1, rows_total = ${counts.rowsTotal},
             rows_accepted = ${counts.rowsAccepted}, rows_rejected = ${counts.rowsRejected},
             errors = ${JSON.stringify(errors.map(boundError))}::jsonb, errors_total = ${errorsTotal},
             updated_at = now()
       where id = ${upload.id} and status = 'processing' and stored_at is null`);
      if (marked.rowCount !== 1) {
        tx.rollback();
      }
      await recordAudit(tx, {
        kind: 'upload.stored',
        actorLabel: 'ingest-worker',
        labId: upload.labId,
        entity: 'upload',
        entityId: upload.id,
        details: { ...counts },
      });
      return true;
    })
    .catch((error: unknown) => {
      if (error instanceof Error && error.name === 'TransactionRollbackError') return false;
      throw error;
    });
}
