import { sql, type SQL } from 'drizzle-orm';
import type { PartitionKey, StudySelection } from '@plumbline/contracts';
import type { Executor } from '../client.ts';

/**
 * The one definition of which stored patient results a study reads: the lab and analyte, the
 * selection (months, settings, ages, sex) and, when given, one partition (sex and age band). The live
 * count of the study form and the study job both use it, so they always agree.
 */
function where(labId: string, analyteId: string, selection: StudySelection, partition?: PartitionKey): SQL {
  const parts: SQL[] = [sql`lab_id = ${labId}`, sql`analyte_id = ${analyteId}`];
  if (selection.fromMonth) parts.push(sql`collected_month >= ${selection.fromMonth}`);
  if (selection.toMonth) parts.push(sql`collected_month <= ${selection.toMonth}`);
  if (selection.settings?.length) parts.push(sql`setting = any(${sql.param(selection.settings)}::text[])`);
  const ageLow = Math.max(selection.ageLow, partition?.ageLow ?? 0);
  const ageHigh = Math.min(selection.ageHigh, partition?.ageHigh ?? 200);
  parts.push(sql`age_years between ${ageLow} and ${ageHigh}`);
  const sex = partition && partition.sex !== 'all' ? partition.sex : selection.sex;
  if (sex !== 'all') parts.push(sql`sex = ${sex}`);
  return sql.join(parts, sql` and `);
}

/**
 * Matching results, keeping only the first result of each sample key (repeats of a person dropped).
 * Rows whose key ingest found unique are read as they are; only the others are deduplicated. The
 * hashes are compared bytewise (collation "C"): they are hex, and a locale-aware sort is several times
 * slower.
 */
function deduplicated(filter: SQL): SQL {
  return sql`
    select value from patient_results where ${filter} and (sample_hash is null or sample_unique)
    union all
    select value from (
      select distinct on (sample_hash collate "C") value from patient_results
       where ${filter} and sample_hash is not null and not sample_unique
       order by sample_hash collate "C", id) d`;
}

export async function countPatientResults(
  db: Executor,
  labId: string,
  analyteId: string,
  selection: StudySelection,
): Promise<number> {
  const result = await db.execute<{ n: string }>(
    sql`select count(*) as n from (${deduplicated(where(labId, analyteId, selection))}) s`,
  );
  return Number(result.rows[0]?.n ?? 0);
}

/**
 * After an upload's rows are stored with `sample_unique` true wherever they have a sample key (same
 * transaction): unmarks every row of the lab and analyte whose key another row shares — earlier rows
 * that this upload repeats, and repeats within the upload. Only repeated rows are rewritten. Uploads of
 * one lab are marked one at a time (transaction-level advisory lock), and each statement sees the
 * uploads committed before it, so two concurrent uploads cannot both leave a shared key marked.
 */
export async function markUniqueSamples(db: Executor, labId: string, uploadId: string): Promise<void> {
  await db.execute(
    sql`select pg_advisory_xact_lock(hashtext('patient_results.sample_unique'), hashtext(${labId}))`,
  );
  await db.execute(sql`
    update patient_results p set sample_unique = false
      from (select distinct analyte_id, sample_hash from patient_results
             where upload_id = ${uploadId} and sample_hash is not null) m
     where p.lab_id = ${labId} and p.analyte_id = m.analyte_id and p.sample_hash = m.sample_hash
       and p.sample_unique
       and exists (select 1 from patient_results q
                    where q.lab_id = p.lab_id and q.analyte_id = p.analyte_id
                      and q.sample_hash = p.sample_hash and q.id <> p.id)`);
}

/**
 * Each partition's values, read in one scan: the rows whose sample key is unique (or absent) go to
 * every partition whose filter they meet, and each partition's other rows are deduplicated as in
 * {@link deduplicated} (few rows, found by a partial index). Values travel as one binary aggregate per
 * partition — each float8 in its 8-byte network form, exact, with no text conversion on either side.
 */
export async function studyValues(
  db: Executor,
  labId: string,
  analyteId: string,
  selection: StudySelection,
  partitions: PartitionKey[],
): Promise<number[][]> {
  if (partitions.length === 0) return [];
  const aggregates = partitions.map(
    (p, i) =>
      sql`string_agg(float8send(value), ''::bytea) filter (where ${where(labId, analyteId, selection, p)}) as ${sql.identifier(`p${i}`)}`,
  );
  // JIT compilation costs more than it saves on these plain scans (tens of ms per query).
  return db.transaction(async (tx) => {
    await tx.execute(sql`set local jit = off`);
    const unique = await tx.execute<Record<string, Buffer | null>>(sql`
      select ${sql.join(aggregates, sql`, `)} from patient_results
       where ${where(labId, analyteId, selection)} and (sample_hash is null or sample_unique)`);
    const row = unique.rows[0] ?? {};
    const values: number[][] = [];
    for (const [i, p] of partitions.entries()) {
      const repeated = await tx.execute<{ v: Buffer | null }>(sql`
        select string_agg(float8send(value), ''::bytea) as v from (
          select distinct on (sample_hash collate "C") value from patient_results
           where ${where(labId, analyteId, selection, p)} and sample_hash is not null and not sample_unique
           order by sample_hash collate "C", id) d`);
      values.push(float8s(row[`p${i}`] ?? null).concat(float8s(repeated.rows[0]?.v ?? null)));
    }
    return values;
  });
}

/** Big-endian float8s packed back to back. */
function float8s(bytes: Buffer | null): number[] {
  if (!bytes) return [];
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const values = new Array<number>(bytes.byteLength / 8);
  for (let i = 0; i < values.length; i++) values[i] = view.getFloat64(i * 8);
  return values;
}
