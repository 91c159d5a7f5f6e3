import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import {
  peerStatistics as computePeerStatistics,
  evaluateMultirule,
  pool,
  summarize,
} from '@plumbline/stats';
import {
  auditEvents,
  columnMappings,
  peerGroups,
  peerStatistics,
  periods,
  qcSummaries,
  qcValues,
  uploads,
} from '@plumbline/db';
import { createWorkerHarness, type WorkerHarness } from '../testing/harness.ts';
import { processUpload } from './ingest.job.ts';
import { LocalFileSource } from '../storage/file-source.ts';

let h: WorkerHarness;
let worker: ReturnType<WorkerHarness['startWorker']>;
beforeAll(async () => {
  h = await createWorkerHarness('ingestjob');
  worker = h.startWorker();
});
afterAll(async () => h?.close());

const SUMMARY_HEADER = 'period,procedure,control_lot,level,n,mean,sd,unit';

async function summariesOf(labId: string) {
  return h.db.select().from(qcSummaries).where(eq(qcSummaries.labId, labId));
}

describe('summary files', () => {
  it('when four labs upload valid summaries, then each is stored and the peer figures equal @plumbline/stats on the same inputs', async () => {
    const lot = h.catalogue.lot.lotNumber;
    const inputs = [
      { mean: 5.51, sd: 0.11, n: 20 },
      { mean: 5.44, sd: 0.13, n: 22 },
      { mean: 5.58, sd: 0.1, n: 19 },
      { mean: 5.49, sd: 0.12, n: 25 },
    ];
    const procedureIds: string[] = [];
    for (const input of inputs) {
      const { lab, procedures } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
      procedureIds.push(procedures[0].id);
      const id = await h.addUpload({
        labId: lab.id,
        kind: 'qc-summary',
        content: `${SUMMARY_HEADER}\n2026-02,GLU1,${lot},1,${input.n},${input.mean},${input.sd},mmol/L\n`,
      });
      await h.enqueue(id);
      const done = await h.waitForStatus(id, ['stored', 'needs-review', 'failed']);
      expect(done.status).toBe('stored');
      expect(done.progress).toBe(1);
      expect(done.storedAt).not.toBeNull();
      expect(await summariesOf(lab.id)).toMatchObject([
        { n: input.n, mean: input.mean, sd: input.sd, source: 'summary', late: false },
      ]);
    }

    await h.waitForPeerStatistics();
    const [group] = await h.db
      .select()
      .from(peerGroups)
      .where(and(eq(peerGroups.controlLotId, h.catalogue.lot.id), eq(peerGroups.tier, 'instrument')));
    const [stored] = await h.db
      .select()
      .from(peerStatistics)
      .where(
        and(
          eq(peerStatistics.peerGroupId, group.id),
          eq(peerStatistics.period, '2026-02'),
          eq(peerStatistics.scope, 'period'),
        ),
      );
    const expected = computePeerStatistics(
      inputs.map((x, i) => ({ id: procedureIds[i], ...x })),
      { minLabs: 3 },
    );
    expect(stored).toMatchObject({ version: 0, labs: 4, n: expected.n, sufficient: true });
    expect(stored.mean).toBeCloseTo(expected.mean, 12);
    expect(stored.sd).toBeCloseTo(expected.sd, 12);
    expect(stored.withinCv).toBeCloseTo(expected.withinCv, 12);
    expect(stored.robustSd).toBeCloseTo(expected.robustSd, 12);
    // Lot-to-date figures of a single month are the month's figures.
    const [cumulative] = await h.db
      .select()
      .from(peerStatistics)
      .where(
        and(
          eq(peerStatistics.peerGroupId, group.id),
          eq(peerStatistics.period, '2026-02'),
          eq(peerStatistics.scope, 'cumulative'),
        ),
      );
    expect(cumulative.mean).toBeCloseTo(expected.mean, 12);
  });

  it('when a glucose file is in mg/dL, then it is stored in mmol/L (÷ 18.016, textbook factor, common practice)', async () => {
    const { lab } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU-CONV', unit: 'mg/dL' }]);
    const id = await h.addUpload({
      labId: lab.id,
      kind: 'qc-summary',
      content: `${SUMMARY_HEADER}\n2026-02,GLU-CONV,${h.catalogue.lot.lotNumber},2,20,250.4,5.1,mg/dL\n`,
    });
    await h.enqueue(id);
    expect((await h.waitForStatus(id, ['stored', 'needs-review', 'failed'])).status).toBe('stored');
    const [row] = await summariesOf(lab.id);
    expect(row.mean).toBeCloseTo(250.4 / 18.016, 9);
    expect(row.sd).toBeCloseTo(5.1 / 18.016, 9);
  });

  it('when a semicolon file with decimal commas, a BOM, CRLF and quoted fields arrives, then it is read correctly', async () => {
    const { lab } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU;A' }]);
    const content =
      '\uFEFFperiod;procedure;control_lot;level;n;mean;sd;unit\r\n' +
      `2026-03;"GLU;A";${h.catalogue.lot.lotNumber};1;21;5,47;0,125;mmol/L\r\n` +
      `2026-03;"GLU;A";${h.catalogue.lot.lotNumber};2;21;"16,2";0,31;mmol/L\r\n`;
    const id = await h.addUpload({ labId: lab.id, kind: 'qc-summary', content });
    await h.enqueue(id);
    expect((await h.waitForStatus(id, ['stored', 'needs-review', 'failed'])).status).toBe('stored');
    const rows = (await summariesOf(lab.id)).sort((a, b) => a.level - b.level);
    expect(rows.map((r) => [r.level, r.n, r.mean, r.sd])).toEqual([
      [1, 21, 5.47, 0.125],
      [2, 21, 16.2, 0.31],
    ]);
  });

  it('when rows are bad, then the upload waits for review with row and column errors and nothing is stored; confirm stores the valid rows', async () => {
    const { lab } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    const lot = h.catalogue.lot.lotNumber;
    const id = await h.addUpload({
      labId: lab.id,
      kind: 'qc-summary',
      content:
        'Month,Test,Lot,Level,N,Mean,SD,Unit\n' +
        `2026-03,GLU1,${lot},1,20,5.5,0.1,mmol/L\n` +
        `2026-03,GLU1,${lot},2,1,16.1,0.2,mmol/L\n` +
        `2026-03,GLU9,${lot},1,20,5.5,-0.1,mmol/L\n`,
    });
    await h.enqueue(id);
    const review = await h.waitForStatus(id, ['stored', 'needs-review', 'failed']);
    expect(review).toMatchObject({ status: 'needs-review', rowsTotal: 3, rowsAccepted: 1, rowsRejected: 2 });
    expect(review.errors).toEqual([
      { row: 3, column: 'N', code: 'n_too_small', message: expect.stringMatching(/at least 2/) },
      { row: 4, column: 'Test', code: 'unknown_procedure', message: expect.stringMatching(/GLU9/) },
      // Every problem of a row is reported, not just the first.
      { row: 4, column: 'SD', code: 'sd_not_positive', message: 'sd must be greater than 0, got -0.1' },
    ]);
    expect(await summariesOf(lab.id)).toEqual([]);

    await h.db.update(uploads).set({ status: 'queued', confirmedAt: new Date() }).where(eq(uploads.id, id));
    await h.enqueue(id, 'confirmed');
    const stored = await h.waitForStatus(id, ['stored', 'failed']);
    expect(stored).toMatchObject({ status: 'stored', rowsAccepted: 1, rowsRejected: 2 });
    expect((await summariesOf(lab.id)).map((r) => [r.level, r.mean])).toEqual([[1, 5.5]]);
  });

  it('when the same key is uploaded again, then the new figures replace the old and the replacement is audited', async () => {
    const { lab } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    const line = (mean: number) =>
      `${SUMMARY_HEADER}\n2026-01,GLU1,${h.catalogue.lot.lotNumber},1,20,${mean},0.1,mmol/L\n`;
    const first = await h.addUpload({ labId: lab.id, kind: 'qc-summary', content: line(5.5) });
    await h.enqueue(first);
    await h.waitForStatus(first, ['stored']);
    const second = await h.addUpload({ labId: lab.id, kind: 'qc-summary', content: line(5.7) });
    await h.enqueue(second);
    await h.waitForStatus(second, ['stored']);
    expect((await summariesOf(lab.id)).map((r) => [r.mean, r.uploadId])).toEqual([[5.7, second]]);
    const audit = await h.db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.kind, 'qc-data.replaced'), eq(auditEvents.entityId, second)));
    expect(audit).toHaveLength(1);
    expect(audit[0].details).toMatchObject({
      summariesReplaced: 1,
      keys: [{ period: '2026-01', previousUploadId: first }],
    });
  });

  it('when the period is closed, then the stored summaries are marked late', async () => {
    await h.db.update(periods).set({ state: 'closed' }).where(eq(periods.period, '2026-04'));
    const { lab } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    const id = await h.addUpload({
      labId: lab.id,
      kind: 'qc-summary',
      content: `${SUMMARY_HEADER}\n2026-04,GLU1,${h.catalogue.lot.lotNumber},1,20,5.5,0.1,mmol/L\n`,
    });
    await h.enqueue(id);
    await h.waitForStatus(id, ['stored']);
    expect((await summariesOf(lab.id))[0].late).toBe(true);
  });

  it('when the lab has a saved mapping and the file uses its headers, then the mapping is used', async () => {
    const { lab } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    await h.db.insert(columnMappings).values({
      labId: lab.id,
      kind: 'qc-summary',
      mapping: {
        period: 'Zeitraum',
        procedure: 'Kennung',
        control_lot: 'Charge',
        level: 'Stufe',
        n: 'Anzahl',
        mean: 'Mittel',
        sd: 'Streuung',
        unit: 'Einheit',
      },
    });
    const id = await h.addUpload({
      labId: lab.id,
      kind: 'qc-summary',
      content: `Kennung;Zeitraum;Charge;Stufe;Anzahl;Mittel;Streuung;Einheit\nGLU1;2026-02;${h.catalogue.lot.lotNumber};2;30;16,4;0,35;mmol/L\n`,
    });
    await h.enqueue(id);
    expect((await h.waitForStatus(id, ['stored', 'needs-review', 'failed'])).status).toBe('stored');
    expect((await summariesOf(lab.id)).map((r) => [r.level, r.n, r.mean])).toEqual([[2, 30, 16.4]]);
  });

  it('when a required column is missing, then the file fails with a header error naming what is missing', async () => {
    const { lab } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    const id = await h.addUpload({
      labId: lab.id,
      kind: 'qc-summary',
      content: 'period,procedure,level,n,mean,unit\n2026-02,GLU1,1,20,5,mmol/L\n',
    });
    await h.enqueue(id);
    const failed = await h.waitForStatus(id, ['failed', 'stored', 'needs-review']);
    expect(failed.status).toBe('failed');
    expect(failed.errors).toEqual([
      {
        row: 1,
        column: 'control_lot',
        code: 'missing_column',
        message: expect.stringMatching(/"control_lot", "sd"/),
      },
    ]);
  });
});

describe('daily values', () => {
  it('when daily values arrive, then monthly summaries are derived and each value carries its multirule result against the lab’s earlier figures', async () => {
    const { lab, procedures } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    const lot = h.catalogue.lot.lotNumber;
    // The lab's established figures for level 1 and 2 from January (stored as summaries).
    const january = await h.addUpload({
      labId: lab.id,
      kind: 'qc-summary',
      content: `${SUMMARY_HEADER}\n2026-01,GLU1,${lot},1,20,5.0,0.1,mmol/L\n2026-01,GLU1,${lot},2,20,15.0,0.3,mmol/L\n`,
    });
    await h.enqueue(january);
    await h.waitForStatus(january, ['stored']);

    const level1 = [5.02, 4.95, 5.31, 5.12, 4.9];
    const level2 = [15.1, 14.8, 15.7, 15.2, 14.9];
    const lines = ['measured_at,procedure,control_lot,level,value,unit,run,comment'];
    level1.forEach((v, day) => {
      lines.push(`2026-02-0${day + 1}T08:00,GLU1,${lot},1,${v},mmol/L,R${day + 1},`);
      lines.push(`2026-02-0${day + 1}T08:00,GLU1,${lot},2,${level2[day]},mmol/L,R${day + 1},"checked, ok"`);
    });
    const id = await h.addUpload({ labId: lab.id, kind: 'qc-values', content: lines.join('\n') });
    await h.enqueue(id);
    expect((await h.waitForStatus(id, ['stored', 'needs-review', 'failed'])).status).toBe('stored');

    const february = (await summariesOf(lab.id))
      .filter((s) => s.period === '2026-02')
      .sort((a, b) => a.level - b.level);
    const s1 = summarize(level1);
    expect(february[0]).toMatchObject({ level: 1, n: 5, source: 'values' });
    expect(february[0].mean).toBeCloseTo(s1.mean, 12);
    expect(february[0].sd).toBeCloseTo(s1.sd, 12);

    const stored = await h.db
      .select()
      .from(qcValues)
      .where(eq(qcValues.procedureId, procedures[0].id))
      .orderBy(qcValues.measuredAt, qcValues.level);
    expect(stored).toHaveLength(10);
    // Same inputs through @plumbline/stats: targets are January's figures (the lab's own, before this period).
    const expected = evaluateMultirule(
      level1.flatMap((v, day) => [
        { run: `R${day + 1}`, level: 1, value: v },
        { run: `R${day + 1}`, level: 2, value: level2[day] },
      ]),
      { 1: { mean: 5.0, sd: 0.1 }, 2: { mean: 15.0, sd: 0.3 } },
    );
    stored.forEach((row, k) => {
      expect(row.z).toBeCloseTo(expected.points[k].z, 12);
      expect([...row.rules].sort()).toEqual([...expected.points[k].rules].sort());
    });
    expect(stored.some((r) => r.rules.length > 0)).toBe(true);
    expect(stored[1].comment).toBe('checked, ok');
    expect(stored[0].run).toBe('R1');
  });

  it('when the lab has no earlier figures and no peers, then the month’s own figures are the targets', async () => {
    const { lab, procedures } = await h.catalogue.makeLabWithProcedures([
      { code: 'GLU-NEW', model: h.catalogue.models.y2 },
    ]);
    const values = [4.0, 4.1, 3.9, 4.05, 3.95, 4.6];
    const lines = ['measured_at,procedure,control_lot,level,value,unit'];
    values.forEach((v, i) =>
      lines.push(`2026-01-1${i}T07:00Z,GLU-NEW,${h.catalogue.lot.lotNumber},1,${v},mmol/L`),
    );
    const id = await h.addUpload({ labId: lab.id, kind: 'qc-values', content: lines.join('\r\n') });
    await h.enqueue(id);
    await h.waitForStatus(id, ['stored']);
    const own = summarize(values);
    const rows = await h.db
      .select()
      .from(qcValues)
      .where(eq(qcValues.procedureId, procedures[0].id))
      .orderBy(qcValues.measuredAt);
    expect(rows.map((r) => r.z)).toEqual(values.map((v) => expect.closeTo((v - own.mean) / own.sd, 12)));
  });
});

describe('multirule sequences across a month boundary', () => {
  // Rule definitions: Westgard et al., Clin Chem 1981;27:493–501 (4-1s = four consecutive values
  // beyond the same 1s limit). Values invented so that February ends on three values 1.5 SD above
  // the lab's January figures (5.0, 0.1) and March begins beyond +1 SD of its target.
  const lot = () => h.catalogue.lot.lotNumber;
  const valueLines = (code: string, month: string, values: number[]) =>
    values.map(
      (v, i) =>
        `${month}-${String(i + 1).padStart(2, '0')}T08:00,${code},${lot()},1,${v},mmol/L,${month}-R${i + 1}`,
    );
  const VALUES_HEADER = 'measured_at,procedure,control_lot,level,value,unit,run';
  const february = [4.95, 5.05, 4.9, 5.1, 5.0, 5.15, 5.15, 5.15];

  async function labWithJanuary(code: string) {
    const { lab, procedures } = await h.catalogue.makeLabWithProcedures([
      { code, model: h.catalogue.models.y2 },
    ]);
    const id = await h.addUpload({
      labId: lab.id,
      kind: 'qc-summary',
      content: `${SUMMARY_HEADER}\n2026-01,${code},${lot()},1,20,5.0,0.1,mmol/L\n`,
    });
    await h.enqueue(id);
    await h.waitForStatus(id, ['stored']);
    return { lab, procedureId: procedures[0].id };
  }
  async function upload(labId: string, lines: string[]) {
    const id = await h.addUpload({ labId, kind: 'qc-values', content: [VALUES_HEADER, ...lines].join('\n') });
    await h.enqueue(id);
    expect((await h.waitForStatus(id, ['stored', 'needs-review', 'failed'])).status).toBe('stored');
  }
  async function storedValues(procedureId: string, period: string) {
    return h.db
      .select()
      .from(qcValues)
      .where(and(eq(qcValues.procedureId, procedureId), eq(qcValues.period, period)))
      .orderBy(qcValues.measuredAt);
  }
  /** March's expected results: its target is January's summary and February's values pooled (METHODS §1). */
  function expectedMarch(march: number[], history: { level: number; z: number }[]) {
    const target = pool([{ n: 20, mean: 5.0, sd: 0.1 }, summarize(february)]);
    return evaluateMultirule(
      march.map((value, i) => ({ run: `2026-03-R${i + 1}`, level: 1, value })),
      { 1: { mean: target.mean, sd: target.sd } },
      { history },
    );
  }

  it('when February is stored and March starts beyond +1s, then the first March run is rejected by 4-1s and February keeps its results', async () => {
    const { lab, procedureId } = await labWithJanuary('GLU-4A');
    await upload(lab.id, valueLines('GLU-4A', '2026-02', february));
    const feb = await storedValues(procedureId, '2026-02');
    expect(feb.slice(-3).map((r) => r.z)).toEqual([1.5, 1.5, 1.5].map((z) => expect.closeTo(z, 9)));
    expect(feb.every((r) => !r.rules.includes('4-1s'))).toBe(true);

    const march = [5.2, 5.0, 4.95, 5.05];
    await upload(lab.id, valueLines('GLU-4A', '2026-03', march));
    const stored = await storedValues(procedureId, '2026-03');
    expect(stored[0].rules).toContain('4-1s');
    expect(stored.slice(1).every((r) => r.rules.length === 0)).toBe(true);
    const expected = expectedMarch(
      march,
      feb.map((r) => ({ level: 1, z: r.z! })),
    );
    stored.forEach((row, k) => expect([...row.rules].sort()).toEqual([...expected.points[k].rules].sort()));
    // February's stored results are not touched by March's evaluation.
    expect((await storedValues(procedureId, '2026-02')).map((r) => r.rules)).toEqual(feb.map((r) => r.rules));
  });

  it('when one file holds February and March, then the sequence runs across the boundary as well', async () => {
    const { lab, procedureId } = await labWithJanuary('GLU-4B');
    await upload(lab.id, [
      ...valueLines('GLU-4B', '2026-02', february),
      ...valueLines('GLU-4B', '2026-03', [5.2, 5.0]),
    ]);
    expect((await storedValues(procedureId, '2026-03'))[0].rules).toContain('4-1s');
  });

  it('when February already ended on a 4-1s (rejected there), then a March value that does not continue it is no new violation', async () => {
    const { lab, procedureId } = await labWithJanuary('GLU-4C');
    await upload(lab.id, valueLines('GLU-4C', '2026-02', [4.95, 5.05, 5.0, 5.15, 5.15, 5.15, 5.15]));
    expect((await storedValues(procedureId, '2026-02')).at(-1)!.rules).toContain('4-1s');
    await upload(lab.id, valueLines('GLU-4C', '2026-03', [5.03, 4.98]));
    expect((await storedValues(procedureId, '2026-03')).map((r) => r.rules)).toEqual([[], []]);
  });
});

describe('exactly once', () => {
  it('when the queue has lost an upload (e.g. Redis restarted), then recovery enqueues it again from PostgreSQL', async () => {
    const { lab } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    const id = await h.addUpload({
      labId: lab.id,
      kind: 'qc-summary',
      content: `${SUMMARY_HEADER}\n2026-02,GLU1,${h.catalogue.lot.lotNumber},2,20,16.0,0.3,mmol/L\n`,
    });
    // Never enqueued: only PostgreSQL knows about it.
    expect(await worker.recover()).toBeGreaterThanOrEqual(1);
    expect((await h.waitForStatus(id, ['stored', 'failed'])).status).toBe('stored');
  });

  it('when a stored upload is processed again, then nothing is stored twice', async () => {
    const { lab } = await h.catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    const lines = ['measured_at,procedure,control_lot,level,value,unit'];
    for (let d = 1; d <= 9; d++)
      lines.push(`2026-03-0${d}T08:00,GLU1,${h.catalogue.lot.lotNumber},1,${5 + d / 100},mmol/L`);
    const id = await h.addUpload({ labId: lab.id, kind: 'qc-values', content: lines.join('\n') });
    await h.enqueue(id);
    await h.waitForStatus(id, ['stored']);
    const again = await processUpload(
      { db: h.db, pool: h.pool, files: new LocalFileSource(h.storageDir), minLabs: 3 },
      id,
    );
    expect(again).toBe('stored'); // already stored: only the final steps are confirmed
    const [{ count }] = await h.db
      .select({ count: sql<number>`count(*)::int` })
      .from(qcValues)
      .where(eq(qcValues.uploadId, id));
    expect(count).toBe(9);
    const events = await h.db
      .select()
      .from(auditEvents)
      .where(and(eq(auditEvents.kind, 'upload.stored'), eq(auditEvents.entityId, id)));
    expect(events).toHaveLength(1);
  });

  it('lab to date: cumulative peer figures pool every month of the lot (docs/methods.md §2)', async () => {
    const procedureMeans = [
      [5.0, 5.1],
      [5.2, 5.15],
      [4.9, 5.0],
    ];
    const ids: string[] = [];
    for (const [jan, feb] of procedureMeans) {
      const { lab, procedures } = await h.catalogue.makeLabWithProcedures([
        { code: 'CR1', analyte: h.catalogue.analytes.creatinine, model: h.catalogue.models.y2 },
      ]);
      ids.push(procedures[0].id);
      const id = await h.addUpload({
        labId: lab.id,
        kind: 'qc-summary',
        content: `${SUMMARY_HEADER}\n2026-01,CR1,${h.catalogue.lot.lotNumber},1,10,${jan * 20},2,umol/L\n2026-02,CR1,${h.catalogue.lot.lotNumber},1,12,${feb * 20},2.5,umol/L\n`,
      });
      await h.enqueue(id);
      await h.waitForStatus(id, ['stored']);
    }
    await h.waitForPeerStatistics();
    const [group] = await h.db
      .select()
      .from(peerGroups)
      .where(
        and(eq(peerGroups.analyteId, h.catalogue.analytes.creatinine.id), eq(peerGroups.tier, 'instrument')),
      );
    const [cumulative] = await h.db
      .select()
      .from(peerStatistics)
      .where(
        and(
          eq(peerStatistics.peerGroupId, group.id),
          eq(peerStatistics.period, '2026-02'),
          eq(peerStatistics.scope, 'cumulative'),
        ),
      );
    const labToDate = procedureMeans.map(([jan, feb], i) => ({
      id: ids[i],
      ...pool([
        { n: 10, mean: jan * 20, sd: 2 },
        { n: 12, mean: feb * 20, sd: 2.5 },
      ]),
    }));
    const expected = computePeerStatistics(labToDate, { minLabs: 3 });
    expect(cumulative.n).toBe(66);
    expect(cumulative.mean).toBeCloseTo(expected.mean, 10);
    expect(cumulative.sd).toBeCloseTo(expected.sd, 10);
  });
});
