import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { gzipSync } from 'node:zlib';
import { eq, sql } from 'drizzle-orm';
import { qcSummaries } from '@plumbline/db';
import { createWorkerHarness, type WorkerHarness } from '../testing/harness.ts';

// The three files a first try with malformed monthly summaries got wrong: each was stored, or failed
// as if the fault were ours.

let h: WorkerHarness;
beforeAll(async () => {
  h = await createWorkerHarness('refusals');
  h.startWorker();
});
afterAll(async () => h?.close());

const HEADER = 'period,procedure,control_lot,level,n,mean,sd,unit';

async function run(content: string | Buffer) {
  const { lab } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
  const id = await h.addUpload({ labId: lab.id, kind: 'qc-summary', content });
  await h.enqueue(id);
  const done = await h.waitForStatus(id, ['stored', 'needs-review', 'failed']);
  const stored = await h.db.select().from(qcSummaries).where(eq(qcSummaries.labId, lab.id));
  return { done, stored };
}

describe('files that must not be stored', () => {
  it('when a mean is 1e308, then the row is rejected as outside the computable range and nothing is stored', async () => {
    const lot = h.catalogue.lot.lotNumber;
    const { done, stored } = await run(`${HEADER}\n2026-02,GLU1,${lot},1,20,1e308,0.1,mmol/L\n`);
    expect(done.status).toBe('needs-review');
    expect(done.errors).toEqual([expect.objectContaining({ row: 2, column: 'mean', code: 'out_of_range' })]);
    expect(stored).toEqual([]);
  });

  it('when the header has two mean columns, then the file fails naming the column and nothing is stored', async () => {
    const lot = h.catalogue.lot.lotNumber;
    const { done, stored } = await run(
      `period,procedure,control_lot,level,n,mean,sd,unit,mean\n2026-02,GLU1,${lot},1,20,5.5,0.1,mmol/L,9.9\n`,
    );
    expect(done.status).toBe('failed');
    expect(done.errors).toEqual([
      expect.objectContaining({ row: 1, column: 'mean', code: 'duplicate_column' }),
    ]);
    expect(done.failureMessage).toMatch(/"mean" more than once/);
    expect(stored).toEqual([]);
  });

  it('when a gzip file is sent as CSV, then it fails at the first attempt as "not a text file", not as our problem', async () => {
    const lot = h.catalogue.lot.lotNumber;
    const { done, stored } = await run(
      gzipSync(Buffer.from(`${HEADER}\n2026-02,GLU1,${lot},1,20,5.5,0.1,mmol/L\n`)),
    );
    expect(done.status).toBe('failed');
    expect(done.failureMessage).toBe('This is not a text file: it looks like a gzip archive.');
    expect(done.errors).toEqual([expect.objectContaining({ row: 1, code: 'not_text' })]);
    expect(done.attempts).toBe(1);
    expect(stored).toEqual([]);
  });

  it('when the database refuses a figure the checks let through, then the upload fails naming the constraint', async () => {
    // A constraint stricter than the ingest checks stands in for a gap between the two.
    await h.db.execute(
      sql.raw('alter table qc_summaries add constraint test_mean_below_1000 check (mean < 1000)'),
    );
    try {
      const lot = h.catalogue.lot.lotNumber;
      const { done, stored } = await run(`${HEADER}\n2026-02,GLU1,${lot},1,20,2000,10,mmol/L\n`);
      expect(done.status).toBe('failed');
      expect(done.failureMessage).toMatch(/database refuses \(test_mean_below_1000\)/);
      expect(stored).toEqual([]);
    } finally {
      await h.db.execute(sql.raw('alter table qc_summaries drop constraint test_mean_below_1000'));
    }
  });
});
