import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { and, eq } from 'drizzle-orm';
import {
  classifyCvr,
  classifySdi,
  evaluateTea,
  peerStatistics as computePeerStatistics,
  pool,
  sigmaMetric,
  standing,
} from '@plumbline/stats';
import {
  analytes,
  peerExclusions,
  peerStatistics,
  publications,
  recomputeAllPeerStatistics,
} from '@plumbline/db';
import { createQcCatalogue, type QcCatalogue } from '@plumbline/db/testing';
import type { PeerReport, PeerReportRow } from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import { spawnWorkerFor, type WorkerProcess } from '../../testing/worker-process.ts';

let t: TestApp;
let worker: WorkerProcess;
let catalogue: QcCatalogue;

type Lab = { id: string; procedureId: string; auth: string };
const labs: Record<string, Lab> = {};

// Level-1 glucose summaries (mmol/L). A–D run model X1, E runs model Y2; all use the same method and
// reagent, so A–D form an instrument group of 4 while E's instrument group has 1 lab. E reads far high.
const january: Record<string, { n: number; mean: number; sd: number }> = {
  A: { n: 20, mean: 5.48, sd: 0.11 },
  B: { n: 18, mean: 5.52, sd: 0.12 },
  C: { n: 21, mean: 5.45, sd: 0.1 },
  D: { n: 19, mean: 5.55, sd: 0.13 },
  E: { n: 20, mean: 7.1, sd: 0.12 },
};
const february: Record<string, { n: number; mean: number; sd: number }> = {
  A: { n: 22, mean: 5.61, sd: 0.14 },
  B: { n: 20, mean: 5.5, sd: 0.11 },
  C: { n: 19, mean: 5.47, sd: 0.12 },
  D: { n: 21, mean: 5.53, sd: 0.1 },
  E: { n: 20, mean: 7.2, sd: 0.15 },
};

/** The report once pending recomputes are done (the worker folds new uploads in within moments). */
async function report(lab: Lab, period = '2026-02', auth = lab.auth) {
  for (let i = 0; i < 400; i++) {
    const res = await request(t.app)
      .get(`/api/labs/${lab.id}/peer-report?period=${period}`)
      .set('Authorization', auth);
    if (res.status !== 200 || res.body.statisticsPending === false) return res;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error('peer statistics stayed pending');
}
const rowOf = (body: PeerReport) => body.rows.find((r) => r.level === 1) as PeerReportRow;

beforeAll(async () => {
  t = await createTestApp('peerreport');
  catalogue = await createQcCatalogue(t.db);
  worker = await spawnWorkerFor(t);
  for (const name of ['A', 'B', 'C', 'D', 'E']) {
    const { lab, procedures } = await catalogue.makeLabWithProcedures([
      { code: 'GLU1', model: name === 'E' ? catalogue.models.y2 : catalogue.models.x1 },
    ]);
    const analyst = await t.makeUser('analyst', lab.id);
    labs[name] = { id: lab.id, procedureId: procedures[0].id, auth: analyst.auth };
    const lines = ['period,procedure,control_lot,level,n,mean,sd,unit'];
    for (const [period, data] of [
      ['2026-01', january],
      ['2026-02', february],
    ] as const) {
      const x = data[name];
      lines.push(`${period},GLU1,${catalogue.lot.lotNumber},1,${x.n},${x.mean},${x.sd},mmol/L`);
    }
    const res = await request(t.app)
      .post('/api/uploads')
      .set('Authorization', analyst.auth)
      .field('kind', 'qc-summary')
      .attach('file', Buffer.from(lines.join('\n')), 'summary.csv');
    for (let i = 0; i < 300; i++) {
      const status = await request(t.app)
        .get(`/api/uploads/${res.body.id}`)
        .set('Authorization', analyst.auth);
      if (status.body.status === 'stored') break;
      if (i === 299) throw new Error(`upload not stored: ${JSON.stringify(status.body)}\n${worker.output()}`);
      await new Promise((r) => setTimeout(r, 50));
    }
  }
});
afterAll(async () => {
  await worker?.stop();
  await t?.close();
});

const inputsOf = (data: typeof february, names: string[]) =>
  names.map((n) => ({ id: labs[n].procedureId, ...data[n] }));

describe('the peer report', () => {
  it('when a lab is in a full instrument group, then its row equals @plumbline/stats on the same inputs', async () => {
    const res = await report(labs.A);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      period: '2026-02',
      published: null,
      statisticsPending: false,
      lab: { id: labs.A.id },
    });
    const row = rowOf(res.body);

    const peer = computePeerStatistics(inputsOf(february, ['A', 'B', 'C', 'D']), { minLabs: 3 });
    const position = standing(february.A, peer);
    const labCv = (100 * february.A.sd) / february.A.mean;
    expect(row.lab).toEqual({ n: 22, mean: 5.61, sd: 0.14, cv: expect.closeTo(labCv, 12) });
    expect(row.peer).toMatchObject({ tier: 'instrument', labs: 4, n: peer.n });
    expect(row.peer!.mean).toBeCloseTo(peer.mean, 12);
    expect(row.peer!.sd).toBeCloseTo(peer.sd, 12);
    expect(row.peer!.withinCv).toBeCloseTo(peer.withinCv, 12);
    expect(row.sdi).toBeCloseTo(position.sdi, 12);
    expect(row.cvr).toBeCloseTo(position.cvr, 12);
    expect(row.biasPct).toBeCloseTo(position.biasPct, 12);
    expect(row.sigma).toBeCloseTo(sigmaMetric(8, position.biasPct, labCv), 12);
    expect(row.peerNote).toBe('Compared with 4 labs using the same instrument model, method and reagent.');
    expect(row.flags).toEqual([
      { kind: 'sdi', severity: classifySdi(position.sdi), message: expect.stringMatching(/^SDI /) },
      { kind: 'cvr', severity: classifyCvr(position.cvr), message: expect.stringMatching(/^CVR /) },
    ]);
    expect(row.excluded).toBeNull();
    expect(row.analyte).toMatchObject({ name: 'Glucose', unit: 'mmol/L', teaPct: 8 });
  });

  it('when figures are taken lot to date, then lab and peer pool January and February (docs/methods.md §1–2)', async () => {
    const row = rowOf((await report(labs.A)).body);
    const toDate = (n: string) => ({ id: labs[n].procedureId, ...pool([january[n], february[n]]) });
    const labToDate = pool([january.A, february.A]);
    const peer = computePeerStatistics(['A', 'B', 'C', 'D'].map(toDate), { minLabs: 3 });
    expect(row.cumulative.lab!.n).toBe(42);
    expect(row.cumulative.lab!.mean).toBeCloseTo(labToDate.mean, 12);
    expect(row.cumulative.peer).toMatchObject({ tier: 'instrument', labs: 4 });
    expect(row.cumulative.peer!.mean).toBeCloseTo(peer.mean, 12);
    expect(row.cumulative.sdi).toBeCloseTo(standing(labToDate, peer).sdi, 12);
  });

  it('when the instrument group is too small, then the method tier is used, named, and an outlier lab is left out', async () => {
    const row = rowOf((await report(labs.E)).body);
    // Five labs share the method: Algorithm A flags E (ISO 13528 x* ± 3s*), leaving four.
    const peer = computePeerStatistics(inputsOf(february, ['A', 'B', 'C', 'D', 'E']), { minLabs: 3 });
    expect(peer.excluded).toEqual([{ id: labs.E.procedureId, reason: 'outlier' }]);
    expect(row.peer).toMatchObject({ tier: 'method', labs: 4 });
    expect(row.peer!.mean).toBeCloseTo(peer.mean, 12);
    expect(row.sdi).toBeCloseTo(standing(february.E, peer).sdi, 12);
    expect(row.peerNote).toBe(
      'Too few labs for a narrower comparison (1 lab with the same instrument model, method and reagent; 3 needed). ' +
        'Compared with 4 labs using the same method.',
    );
    expect(row.excluded).toEqual({ reason: 'outlier', note: null });
    expect(row.flags).toContainEqual({
      kind: 'exclusion',
      severity: 'action',
      message: expect.stringMatching(/robust range/),
    });
    expect(row.flags).toContainEqual({ kind: 'sdi', severity: 'action', message: expect.any(String) });
  });

  it('when the TEa rule has an absolute part, then sigma uses the larger of the two parts at the level’s peer mean', async () => {
    const glucose = catalogue.analytes.glucose;
    const labCv = (100 * february.A.sd) / february.A.mean;
    try {
      // ± 6 mg/dL or ± 8 % (US CLIA 2024 glucose limit, memory): 6 mg/dL = 6/18.016 mmol/L (glucose
      // molar mass 180.16 g/mol) is below 8 % of about 5.5 mmol/L, so the percentage still governs.
      await t.db
        .update(analytes)
        .set({ teaAbsolute: 6 / 18.016 })
        .where(eq(analytes.id, glucose.id));
      let row = rowOf((await report(labs.A)).body);
      expect(row.tea).toEqual({ pct: 8, governing: 'percent' });
      expect(row.analyte.teaAbsolute).toBeCloseTo(6 / 18.016, 12);

      // An invented absolute part of 0.6 mmol/L exceeds 8 % of the peer mean: it governs, and the
      // sigma metric uses 100 · 0.6 / peer mean instead of 8 %.
      await t.db.update(analytes).set({ teaAbsolute: 0.6 }).where(eq(analytes.id, glucose.id));
      row = rowOf((await report(labs.A)).body);
      const peerMean = row.peer!.mean;
      const tea = evaluateTea({ absolute: 0.6, percent: 8 }, peerMean);
      expect(tea.governing).toBe('absolute');
      expect(row.tea!.governing).toBe('absolute');
      expect(row.tea!.pct).toBeCloseTo((100 * 0.6) / peerMean, 12);
      expect(row.sigma).toBeCloseTo(sigmaMetric(tea.teaPct, row.biasPct!, labCv), 12);
      expect(row.sigma).not.toBeCloseTo(sigmaMetric(8, row.biasPct!, labCv), 6);
    } finally {
      await t.db.update(analytes).set({ teaAbsolute: null }).where(eq(analytes.id, glucose.id));
    }
  });

  it('when the coordinator excludes a lab’s data, then the figures leave it out and its row says why', async () => {
    await t.db.insert(peerExclusions).values({
      procedureId: labs.B.procedureId,
      controlLotId: catalogue.lot.id,
      period: '2026-02',
      reason: 'calibration fault reported by the lab',
    });
    await recomputeAllPeerStatistics(t.db);
    const rowB = rowOf((await report(labs.B)).body);
    const peer = computePeerStatistics(inputsOf(february, ['A', 'B', 'C', 'D']), {
      minLabs: 3,
      excludeIds: [labs.B.procedureId],
    });
    expect(rowB.peer).toMatchObject({ tier: 'instrument', labs: 3 });
    expect(rowB.peer!.mean).toBeCloseTo(peer.mean, 12);
    expect(rowB.excluded).toEqual({ reason: 'manual', note: 'calibration fault reported by the lab' });
    expect(rowB.flags).toContainEqual({
      kind: 'exclusion',
      severity: 'warning',
      message: expect.stringMatching(/calibration fault/),
    });
    await t.db.delete(peerExclusions);
    await recomputeAllPeerStatistics(t.db);
  });

  it('when the period is published, then the report reads the published version', async () => {
    await t.db.insert(publications).values({ period: '2026-02', version: 1 });
    const provisional = await t.db
      .select()
      .from(peerStatistics)
      .where(and(eq(peerStatistics.period, '2026-02'), eq(peerStatistics.version, 0)));
    await t.db.insert(peerStatistics).values(
      provisional.map(({ id: _id, ...row }) => ({
        ...row,
        version: 1,
        mean: row.mean === null ? null : row.mean + 0.01,
      })),
    );
    const res = await report(labs.A);
    expect(res.body.published).toMatchObject({ version: 1 });
    const peer = computePeerStatistics(inputsOf(february, ['A', 'B', 'C', 'D']), { minLabs: 3 });
    expect(rowOf(res.body).peer!.mean).toBeCloseTo(peer.mean + 0.01, 12);
    await t.db.delete(peerStatistics).where(eq(peerStatistics.version, 1));
    await t.db.delete(publications);
  });

  it('when an analyst of another lab asks for the report, then 404; a malformed period gives 400', async () => {
    expect((await report(labs.A, '2026-02', labs.B.auth)).status).toBe(404);
    const bad = await report(labs.A, '2026-2');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('period');
  });

  it('when the lab has no data for the period, then the report has no rows', async () => {
    const res = await report(labs.A, '2026-04');
    expect(res.status).toBe(200);
    expect(res.body.rows).toEqual([]);
  });
});
