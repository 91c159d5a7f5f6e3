import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { createQcCatalogue, createScratchDatabase, type ScratchDatabase } from '../testing.ts';
import { analytes, qcSummaries, qcValues } from './index.ts';

// The CHECK constraints repeat the ingest checks in PostgreSQL: whatever writes QC figures, a
// non-finite or impossible one is refused. double precision accepts 'Infinity' and 'NaN' as input
// (PostgreSQL manual, "Floating-Point Types"), which is why finiteness is checked explicitly.

let scratch: ScratchDatabase;
let row: typeof qcSummaries.$inferInsert;
let value: typeof qcValues.$inferInsert;

beforeAll(async () => {
  scratch = await createScratchDatabase('qcchecks');
  const catalogue = await createQcCatalogue(scratch.db);
  const { lab, procedures } = await catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
  row = {
    labId: lab.id,
    procedureId: procedures[0].id,
    controlLotId: catalogue.lot.id,
    level: 1,
    period: '2026-02',
    n: 20,
    mean: 5.5,
    sd: 0.1,
  };
  value = {
    labId: lab.id,
    procedureId: procedures[0].id,
    controlLotId: catalogue.lot.id,
    level: 1,
    period: '2026-02',
    measuredAt: new Date('2026-02-03T08:00:00Z'),
    value: 5.5,
  };
});
afterAll(async () => scratch?.drop());

/** The constraint PostgreSQL names when it refuses the insert. */
async function refusedBy(insert: () => Promise<unknown>): Promise<string | null> {
  try {
    await scratch.db.transaction(async (tx) => {
      await tx.execute(sql`select 1`);
      await insert();
      tx.rollback();
    });
  } catch (error) {
    const cause = (error as { cause?: { constraint?: string } }).cause;
    return cause?.constraint ?? (error as { constraint?: string }).constraint ?? null;
  }
  return null;
}

describe('CHECK constraints on QC figures', () => {
  it('when a summary is finite with SD > 0 and n ≥ 2, then it is accepted', async () => {
    const [stored] = await scratch.db.insert(qcSummaries).values(row).returning();
    expect(stored.mean).toBe(5.5);
    await scratch.db.delete(qcSummaries);
  });

  it.each([
    ['mean Infinity', { mean: Infinity }, 'qc_summaries_mean_finite'],
    ['mean -Infinity', { mean: -Infinity }, 'qc_summaries_mean_finite'],
    ['mean NaN', { mean: NaN }, 'qc_summaries_mean_finite'],
    ['sd 0', { sd: 0 }, 'qc_summaries_sd_positive_finite'],
    ['sd negative', { sd: -0.1 }, 'qc_summaries_sd_positive_finite'],
    ['sd NaN', { sd: NaN }, 'qc_summaries_sd_positive_finite'],
    ['n 1', { n: 1 }, 'qc_summaries_n_at_least_2'],
    ['level 0', { level: 0 }, 'qc_summaries_level_positive'],
  ])('when a summary has %s, then PostgreSQL refuses it', async (_name, change, constraint) => {
    expect(await refusedBy(() => scratch.db.insert(qcSummaries).values({ ...row, ...change }))).toBe(
      constraint,
    );
  });

  it.each([
    ['value Infinity', { value: Infinity }, 'qc_values_value_finite'],
    ['value NaN', { value: NaN }, 'qc_values_value_finite'],
    ['z -Infinity', { z: -Infinity }, 'qc_values_z_finite'],
  ])('when a daily value has %s, then PostgreSQL refuses it', async (_name, change, constraint) => {
    expect(await refusedBy(() => scratch.db.insert(qcValues).values({ ...value, ...change }))).toBe(
      constraint,
    );
  });

  it('when an analyte has a low plausibility limit above its high one, then PostgreSQL refuses it', async () => {
    const constraint = await refusedBy(() =>
      scratch.db
        .insert(analytes)
        .values({ code: 'X-CHK', name: 'X', unit: 'mmol/L', plausibleLow: 10, plausibleHigh: 1 }),
    );
    expect(constraint).toBe('analytes_plausible_range');
  });
});
