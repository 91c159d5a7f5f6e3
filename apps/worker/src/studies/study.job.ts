import { sql } from 'drizzle-orm';
import {
  studyPartitioningSchema,
  studySelectionSchema,
  type OutlierScreening,
  type PartitionKey,
  type PartitionResult,
  type StudyMethod,
  type StudyPartitioning,
  type StudySelection,
} from '@plumbline/contracts';
import { studyValues, type Database } from '@plumbline/db';
import { computePartition, partitionAdvice } from './compute-study.ts';

type StudyRow = {
  id: string;
  labId: string;
  analyteId: string;
  unit: string;
  selection: unknown;
  partitioning: unknown;
  method: StudyMethod;
  screening: OutlierScreening;
};

/** The partitions of a study: each sex asked for (or both together) × each age band. */
export function studyPartitions(selection: StudySelection, partitioning: StudyPartitioning): PartitionKey[] {
  const sexes: PartitionKey['sex'][] =
    selection.sex !== 'all' ? [selection.sex] : partitioning.bySex ? ['female', 'male'] : ['all'];
  const bands = partitioning.ageBands.length
    ? partitioning.ageBands
        .map((b) => ({ low: Math.max(b.low, selection.ageLow), high: Math.min(b.high, selection.ageHigh) }))
        .filter((b) => b.low <= b.high)
    : [{ low: selection.ageLow, high: selection.ageHigh }];
  return sexes.flatMap((sex) => bands.map((b) => ({ sex, ageLow: b.low, ageHigh: b.high })));
}

export function partitionLabel(key: PartitionKey): string {
  const who = key.sex === 'all' ? 'Both sexes' : key.sex === 'female' ? 'Women' : 'Men';
  return `${who}, ${key.ageLow}–${key.ageHigh} years`;
}

/**
 * Runs one study: claims it (queued → running), reads every partition's values from PostgreSQL, screens
 * and computes them, and stores the result as the study's next version. Never overwrites a version.
 */
export async function runStudy(
  db: Database,
  studyId: string,
  reportProgress: (fraction: number) => Promise<void> = async () => {},
): Promise<'done' | 'skipped' | 'failed'> {
  const claimed = await db.execute<StudyRow>(sql`
    update ri_studies s set status = 'running', progress = 0, failure_message = null, updated_at = now()
      from analytes a
     where s.id = ${studyId} and s.status in ('queued', 'running') and a.id = s.analyte_id
    returning s.id, s.lab_id as "labId", s.analyte_id as "analyteId", a.unit, s.selection, s.partitioning,
              s.method, s.screening`);
  const study = claimed.rows[0];
  if (!study) return 'skipped';
  try {
    const selection = studySelectionSchema.parse(study.selection);
    const partitioning = studyPartitioningSchema.parse(study.partitioning);
    const keys = studyPartitions(selection, partitioning);
    const currents = await db.execute<{
      sex: string;
      ageLow: number;
      ageHigh: number;
      lower: number;
      upper: number;
      source: string;
    }>(sql`
      select sex, age_low as "ageLow", age_high as "ageHigh", lower, upper, source from current_intervals
       where lab_id = ${study.labId} and analyte_id = ${study.analyteId}`);
    const partitions: PartitionResult[] = [];
    const kept: { key: PartitionKey; label: string; kept: number[] }[] = [];
    const allValues = await studyValues(db, study.labId, study.analyteId, selection, keys);
    for (const [i, key] of keys.entries()) {
      const values = allValues[i];
      const label = partitionLabel(key);
      const computed = computePartition(key, label, values, study.method, study.screening);
      partitions.push({ ...computed.result, current: currentFor(currents.rows, key) });
      kept.push({ key, label, kept: computed.kept });
      const fraction = (i + 1) / keys.length;
      await db.execute(sql`update ri_studies set progress = ${0.9 * fraction} where id = ${study.id}`);
      await reportProgress(0.9 * fraction);
    }
    const result = { unit: study.unit, partitions, advice: partitionAdvice(kept) };
    await db.transaction(async (tx) => {
      await tx.execute(sql`
        insert into ri_study_results (study_id, version, result)
        select ${study.id}, coalesce(max(version), 0) + 1, ${JSON.stringify(result)}::jsonb
          from ri_study_results where study_id = ${study.id}`);
      await tx.execute(
        sql`update ri_studies set status = 'done', progress = 1, updated_at = now() where id = ${study.id}`,
      );
    });
    await reportProgress(1);
    return 'done';
  } catch (error) {
    await db.execute(sql`
      update ri_studies set status = 'failed', failure_message = ${`The study could not be computed: ${(error as Error).message}`},
             updated_at = now() where id = ${study.id}`);
    return 'failed';
  }
}

/** The lab's current interval for a partition: same sex (else "all") whose age range covers the band. */
function currentFor(
  rows: { sex: string; ageLow: number; ageHigh: number; lower: number; upper: number; source: string }[],
  key: PartitionKey,
): PartitionResult['current'] {
  const covers = (r: (typeof rows)[number]) => r.ageLow <= key.ageLow && r.ageHigh >= key.ageHigh;
  const found =
    rows.find((r) => r.sex === key.sex && covers(r)) ?? rows.find((r) => r.sex === 'all' && covers(r));
  return found ? { lower: found.lower, upper: found.upper, source: found.source } : null;
}

export async function studiesToRecover(db: Database): Promise<string[]> {
  const rows = await db.execute<{ id: string }>(
    sql`select id from ri_studies where status in ('queued', 'running')`,
  );
  return rows.rows.map((r) => r.id);
}
