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
 * The hashes are compared bytewise (collation "C"): they are hex, and a locale-aware sort is several
 * times slower.
 */
function deduplicated(filter: SQL): SQL {
  return sql`
    select value from patient_results where ${filter} and sample_hash is null
    union all
    select value from (
      select distinct on (sample_hash collate "C") value from patient_results
       where ${filter} and sample_hash is not null order by sample_hash collate "C", id) d`;
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

/** A partition's values, read as one text aggregate (much cheaper than a row per value). */
export async function partitionValues(
  db: Executor,
  labId: string,
  analyteId: string,
  selection: StudySelection,
  partition: PartitionKey,
): Promise<number[]> {
  const result = await db.execute<{ v: string | null }>(
    sql`select string_agg(value::text, ',') as v from (${deduplicated(where(labId, analyteId, selection, partition))}) s`,
  );
  const text = result.rows[0]?.v;
  if (!text) return [];
  const parts = text.split(',');
  const values = new Array<number>(parts.length);
  for (let i = 0; i < parts.length; i++) values[i] = Number(parts[i]);
  return values;
}
