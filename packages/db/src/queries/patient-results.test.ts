import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { createScratchDatabase, type ScratchDatabase } from '../testing.ts';
import { countPatientResults, markUniqueSamples, studyValues } from './patient-results.ts';

// Which results a study reads: the first result of each sample key within the selection (repeats of a
// person dropped), whatever the order of uploads. Expected values are worked out by hand from the rows
// below (common practice: one result per person in a reference sample, CLSI EP28-A3c).

let scratch: ScratchDatabase;
let lab: string;
let analyte: string;
const selection = { ageLow: 18, ageHigh: 120, sex: 'all' } as const;
const women = { sex: 'female', ageLow: 18, ageHigh: 120 } as const;
const men = { sex: 'male', ageLow: 18, ageHigh: 120 } as const;

/** Stores rows as ingest does: sample_unique true where there is a key, then repeats unmarked. */
async function upload(rows: { value: number; sex: string; hash: string | null }[]): Promise<void> {
  await scratch.db.transaction(async (tx) => {
    const made = await tx.execute<{ id: string }>(sql`
      insert into uploads (lab_id, kind, filename, size, sha256, storage_key, status)
      values (${lab}, 'patient-results', 'p.csv', 0, md5(random()::text), 'none', 'stored') returning id`);
    const uploadId = made.rows[0].id;
    for (const r of rows)
      await tx.execute(sql`
        insert into patient_results (lab_id, upload_id, analyte_id, value, sex, age_years, collected_month,
                                     setting, sample_hash, sample_unique)
        values (${lab}, ${uploadId}, ${analyte}, ${r.value}, ${r.sex}, 40, '2026-01', 'outpatient', ${r.hash},
                ${r.hash !== null})`);
    await markUniqueSamples(tx, lab, uploadId);
  });
}

beforeAll(async () => {
  scratch = await createScratchDatabase('patientresults');
  const ids = await scratch.db.execute<{ lab: string; analyte: string }>(sql`
    with l as (insert into labs (code, name) values ('PR1', 'Invented lab') returning id),
         a as (insert into analytes (code, name, unit) values ('NA-PR', 'Sodium', 'mmol/L') returning id)
    select (select id from l) as lab, (select id from a) as analyte`);
  ({ lab, analyte } = ids.rows[0]);
  await upload([
    { value: 140, sex: 'female', hash: 'a1' },
    { value: 141, sex: 'female', hash: 'a1' }, // repeat within the upload: dropped
    { value: 142, sex: 'female', hash: 'b2' },
    { value: 138, sex: 'male', hash: 'c3' },
    { value: 139, sex: 'male', hash: null }, // no key: always read
  ]);
  await upload([
    { value: 150, sex: 'female', hash: 'b2' }, // repeats an earlier upload: dropped
    { value: 137, sex: 'male', hash: 'd4' },
  ]);
});
afterAll(async () => scratch?.drop());

describe('reading a study’s values', () => {
  it('when sample keys repeat within and across uploads, then only their first result is marked unique', async () => {
    const marked = await scratch.db.execute<{ value: number; sample_unique: boolean }>(
      sql`select value, sample_unique from patient_results order by id`,
    );
    expect(marked.rows.map((r) => [r.value, r.sample_unique])).toEqual([
      [140, false],
      [141, false],
      [142, false],
      [138, true],
      [139, false],
      [150, false],
      [137, true],
    ]);
  });

  it('when keys repeat, then each partition reads the first result of each key once, in one scan', async () => {
    const [w, m] = await studyValues(scratch.db, lab, analyte, selection, [women, men]);
    expect([...w].sort((x, y) => x - y)).toEqual([140, 142]);
    expect([...m].sort((x, y) => x - y)).toEqual([137, 138, 139]);
    expect(await countPatientResults(scratch.db, lab, analyte, selection)).toBe(5);
  });

  it('when a value has no short decimal form, then it is read back exactly', async () => {
    await upload([{ value: 0.1 + 0.2, sex: 'female', hash: 'e5' }]);
    const [w] = await studyValues(scratch.db, lab, analyte, selection, [women]);
    expect(w).toContain(0.1 + 0.2);
  });
});
