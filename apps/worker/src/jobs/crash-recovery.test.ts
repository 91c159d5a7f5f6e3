import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { auditEvents, qcSummaries, qcValues, uploads } from '@plumbline/db';
import { createWorkerHarness, REDIS_URL, type WorkerHarness } from '../testing/harness.ts';
import { spawnWorkerProcess } from '../testing/worker-process.ts';

let h: WorkerHarness;
beforeAll(async () => {
  h = await createWorkerHarness('crash');
});
afterAll(async () => h?.close());

async function countWhere<T>(table: T, uploadId: string) {
  const t = table as typeof qcValues;
  const [{ count }] = await h.db
    .select({ count: sql<number>`count(*)::int` })
    .from(t)
    .where(eq(t.uploadId, uploadId));
  return count;
}

describe('a worker killed mid-file', () => {
  it('when the worker dies inside the storing transaction, then nothing is half-stored, and after a restart the upload is stored exactly once', async () => {
    const { lab } = await h.catalogue.makeLabWithProcedures([
      { code: 'GLU1' },
      { code: 'GLU2', model: h.catalogue.models.y2 },
    ]);
    const lines = ['measured_at,procedure,control_lot,level,value,unit,run'];
    let rows = 0;
    for (let day = 1; day <= 28; day++) {
      for (const code of ['GLU1', 'GLU2']) {
        for (let run = 0; run < 20; run++) {
          for (const level of [1, 2]) {
            const value = (level === 1 ? 5.5 : 16) + Math.sin(day * 31 + run * 7 + level) * 0.1;
            lines.push(
              `2026-02-${String(day).padStart(2, '0')}T${String(run).padStart(2, '0')}:15,${code},${h.catalogue.lot.lotNumber},${level},${value.toFixed(3)},mmol/L,D${day}R${run}`,
            );
            rows += 1;
          }
        }
      }
    }
    const uploadId = await h.addUpload({ labId: lab.id, kind: 'qc-values', content: lines.join('\n') });

    // The real worker process, told to hold its transaction open before COMMIT so it can be killed there.
    const child = await spawnWorkerProcess({
      DATABASE_URL: h.url,
      REDIS_URL,
      QUEUE_PREFIX: h.prefix,
      STORAGE_DIR: h.storageDir,
      INGEST_HOLD_BEFORE_COMMIT_MS: '120000',
      INGEST_LOCK_MS: '3000',
      INGEST_STALLED_CHECK_MS: '1000',
    });
    const dbName = new URL(h.url).pathname.slice(1);
    let waitingInTransaction = false;
    for (let i = 0; i < 400 && !waitingInTransaction; i++) {
      const activity = await h.pool.query(
        `select count(*)::int as n from pg_stat_activity where datname = $1 and state = 'idle in transaction'`,
        [dbName],
      );
      waitingInTransaction = activity.rows[0].n > 0;
      if (!waitingInTransaction) await new Promise((r) => setTimeout(r, 50));
    }
    expect(waitingInTransaction, `the worker never reached its transaction:\n${child.output()}`).toBe(true);
    await child.kill();

    // PostgreSQL rolls the dead connection's transaction back.
    for (let i = 0; i < 100; i++) {
      const activity = await h.pool.query(
        `select count(*)::int as n from pg_stat_activity where datname = $1 and state = 'idle in transaction'`,
        [dbName],
      );
      if (activity.rows[0].n === 0) break;
      await new Promise((r) => setTimeout(r, 50));
    }
    const [afterKill] = await h.db.select().from(uploads).where(eq(uploads.id, uploadId));
    expect(afterKill).toMatchObject({ status: 'processing', storedAt: null });
    expect(await countWhere(qcValues, uploadId)).toBe(0);
    expect(await countWhere(qcSummaries, uploadId)).toBe(0);

    // A fresh worker: its start-up recovery re-enqueues the upload (the dead job's id collapses with it),
    // and the job whose worker died is taken up again once its lock expires.
    const worker = h.startWorker({ stalledIntervalMs: 1000 });
    await worker.recover();
    const stored = await h.waitForStatus(uploadId, ['stored', 'failed', 'needs-review'], 30_000);
    expect(stored.status).toBe('stored');
    expect(stored.rowsAccepted).toBe(rows);
    expect(await countWhere(qcValues, uploadId)).toBe(rows);
    expect(await countWhere(qcSummaries, uploadId)).toBe(4);
    const events = await h.db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.kind, 'upload.stored'), eq(auditEvents.entityId, uploadId)));
    expect(events).toHaveLength(1);
    expect(stored.attempts).toBe(2);
  }, 90_000);
});
