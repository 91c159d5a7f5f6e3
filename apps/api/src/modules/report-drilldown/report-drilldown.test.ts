import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import {
  evaluateMultirule,
  measurementUncertainty,
  peerMeanUncertaintyPct,
  pool,
  sigmaMetric,
  standing,
} from '@plumbline/stats';
import { labs as labsTable } from '@plumbline/db';
import { drilldownSchema, peerReportSchema, type Drilldown, type PeerReport } from '@plumbline/contracts';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import {
  LAB_NAMES,
  MARCH_Z,
  PERIODS,
  expectedPeer as peerAt,
  expectedPeerToDate as peerToDate,
  seedWorkspaceNetwork,
  type Analyte,
  type WorkspaceNetwork,
} from './testing/workspace-network.ts';

let t: TestApp;
let net: WorkspaceNetwork;

beforeAll(async () => {
  t = await createTestApp('drilldown');
  net = await seedWorkspaceNetwork(t);
});
afterAll(async () => {
  await t?.close();
});

const procedureOf = (name: (typeof LAB_NAMES)[number], analyte: Analyte) => net.labs[name][analyte];
const expectedPeer = (analyte: Analyte, period: string, level: number) => peerAt(net, analyte, period, level);
const expectedPeerToDate = (analyte: Analyte, period: string, level: number) =>
  peerToDate(net, analyte, period, level);

async function getReport(query: string, auth = net.labs.A.analyst.auth) {
  const res = await request(t.app)
    .get(`/api/labs/${net.labs.A.id}/peer-report?${query}`)
    .set('Authorization', auth);
  expect(res.status).toBe(200);
  // The response keeps its contract (packages/contracts/src/peer-report.ts).
  peerReportSchema.parse(res.body);
  return res.body as PeerReport;
}

async function getDrilldown(level: number, query: string, analyte: Analyte = 'glucose') {
  const res = await request(t.app)
    .get(
      `/api/labs/${net.labs.A.id}/report-rows/${procedureOf('A', analyte)}/${net.catalogue.lot.id}/${level}?${query}`,
    )
    .set('Authorization', net.labs.A.analyst.auth);
  expect(res.status).toBe(200);
  // The response keeps its contract (packages/contracts/src/lab-workspace.ts).
  drilldownSchema.parse(res.body);
  return res.body as Drilldown;
}

describe('the peer report on stored summaries', () => {
  it('when lab A reads March, then every row equals @plumbline/stats on the stored inputs', async () => {
    const report = await getReport('period=2026-03&units=si');
    expect(report.units).toBe('si');
    expect(report.rows).toHaveLength(4);
    for (const row of report.rows) {
      const analyte: Analyte = row.procedure.code === 'GLU1' ? 'glucose' : 'creatinine';
      const lab = net.table[analyte].A['2026-03'][row.level];
      const peer = expectedPeer(analyte, '2026-03', row.level);
      const position = standing(lab, peer);
      const labCv = (100 * lab.sd) / lab.mean;
      expect(row.unit).toBe(row.canonicalUnit);
      expect(row.lab.mean).toBe(lab.mean);
      expect(row.peer).toMatchObject({ tier: 'instrument', labs: peer.labs, n: peer.n });
      expect(row.peer!.mean).toBeCloseTo(peer.mean, 10);
      expect(row.peer!.sd).toBeCloseTo(peer.sd, 10);
      expect(row.peer!.withinCv).toBeCloseTo(peer.withinCv, 10);
      expect(row.sdi).toBeCloseTo(position.sdi, 10);
      expect(row.cvr).toBeCloseTo(position.cvr, 10);
      expect(row.biasPct).toBeCloseTo(position.biasPct, 10);
      expect(row.sigma).toBeCloseTo(sigmaMetric(row.analyte.teaPct!, position.biasPct, labCv), 10);
      const labToDate = pool(PERIODS.map((p) => net.table[analyte].A[p][row.level]));
      expect(row.cumulative.sdi).toBeCloseTo(
        standing(labToDate, expectedPeerToDate(analyte, '2026-03', row.level)).sdi,
        10,
      );
    }
  });
});

describe('unit preference', () => {
  it('when conventional units are asked for, then means and SDs are converted and SDI, CVR and bias are not', async () => {
    const si = await getReport('period=2026-03&units=si');
    const conventional = await getReport('period=2026-03&units=conventional');
    expect(conventional.units).toBe('conventional');
    const pair = (code: string, level: number) =>
      [si, conventional].map((r) => r.rows.find((x) => x.procedure.code === code && x.level === level)!);

    // Glucose: mg/dL = mmol/L × 18.016 (molar mass 180.16 g/mol; common practice, textbook factor).
    const [gluSi, gluConv] = pair('GLU1', 1);
    expect(gluConv.unit).toBe('mg/dL');
    expect(gluConv.canonicalUnit).toBe('mmol/L');
    expect(gluConv.lab.mean).toBeCloseTo(gluSi.lab.mean! * 18.016, 9);
    expect(gluConv.lab.sd).toBeCloseTo(gluSi.lab.sd! * 18.016, 9);
    expect(gluConv.peer!.mean).toBeCloseTo(gluSi.peer!.mean * 18.016, 9);
    expect(gluConv.cumulative.peer!.sd).toBeCloseTo(gluSi.cumulative.peer!.sd * 18.016, 9);
    expect(gluConv.lab.cv).toBe(gluSi.lab.cv);
    expect(gluConv.sdi).toBe(gluSi.sdi);
    expect(gluConv.cvr).toBe(gluSi.cvr);
    expect(gluConv.biasPct).toBe(gluSi.biasPct);

    // Creatinine: mg/dL = µmol/L ÷ 88.42 (common practice, textbook factor). With the catalogue's
    // 113.12 g/mol the exact factor is 10000 / 113.12 = 88.40; the textbook's rounding differs by 0.03 %.
    const [creaSi, creaConv] = pair('CREA1', 2);
    expect(creaConv.unit).toBe('mg/dL');
    expect(creaConv.lab.mean! / (creaSi.lab.mean! / 88.42)).toBeCloseTo(1, 3);
    expect(creaConv.peer!.sd / (creaSi.peer!.sd / 88.42)).toBeCloseTo(1, 3);
    expect(creaConv.sdi).toBe(creaSi.sdi);
  });

  it('when no units are asked for, then the lab’s preferred units apply', async () => {
    await t.db
      .update(labsTable)
      .set({ preferredUnits: 'conventional' })
      .where(eq(labsTable.id, net.labs.A.id));
    const report = await getReport('period=2026-03');
    expect(report.units).toBe('conventional');
    expect(report.rows.find((r) => r.procedure.code === 'GLU1')!.unit).toBe('mg/dL');
    await t.db.update(labsTable).set({ preferredUnits: 'si' }).where(eq(labsTable.id, net.labs.A.id));
    expect((await getReport('period=2026-03')).units).toBe('si');
  });

  it('when an unknown unit system is asked for, then 400 names the parameter', async () => {
    const res = await request(t.app)
      .get(`/api/labs/${net.labs.A.id}/peer-report?period=2026-03&units=imperial`)
      .set('Authorization', net.labs.A.analyst.auth);
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('units');
  });
});

describe('the drill-down of one row', () => {
  it('when the trend is read, then each period’s SDI, CVR and bias equal standing() on that period’s inputs', async () => {
    const d = await getDrilldown(1, 'period=2026-03&units=si');
    expect(d.trend.map((p) => p.period)).toEqual([...PERIODS]);
    for (const point of d.trend) {
      const lab = net.table.glucose.A[point.period][1];
      const peer = expectedPeer('glucose', point.period, 1);
      const position = standing(lab, peer);
      expect(point.sdi).toBeCloseTo(position.sdi, 10);
      expect(point.cvr).toBeCloseTo(position.cvr, 10);
      expect(point.biasPct).toBeCloseTo(position.biasPct, 10);
      expect(point.peerMean).toBeCloseTo(peer.mean, 10);
      expect(point.labMean).toBe(lab.mean);
      expect(point.tier).toBe('instrument');
      expect(point.published).toBe(false);
    }
    expect(d.peer).toEqual({ tier: 'instrument', labs: expectedPeer('glucose', '2026-03', 1).labs });
  });

  it('when the peer distribution is read, then it holds every member’s mean anonymously with ours marked', async () => {
    const d = await getDrilldown(1, 'period=2026-03');
    const means = LAB_NAMES.map((n) => net.table.glucose[n]['2026-03'][1].mean).sort((a, b) => a - b);
    expect(d.distribution!.labMeans.map((m) => m.mean)).toEqual(means);
    expect(d.distribution!.labMeans.filter((m) => m.own)).toEqual([
      { mean: net.table.glucose.A['2026-03'][1].mean, own: true, excluded: expect.any(Boolean) },
    ]);
    for (const m of d.distribution!.labMeans)
      expect(Object.keys(m).sort()).toEqual(['excluded', 'mean', 'own']);
    const body = JSON.stringify(d);
    for (const name of LAB_NAMES.filter((n) => n !== 'A')) {
      expect(body).not.toContain(net.labs[name].id);
      expect(body).not.toContain(net.labs[name].glucose);
      expect(body).not.toContain(net.labs[name].code);
    }
  });

  it('when the two-level plot is read, then every lab’s point is its SDI at level 1 and level 2', async () => {
    const d = await getDrilldown(2, 'period=2026-03');
    const p1 = expectedPeer('glucose', '2026-03', 1);
    const p2 = expectedPeer('glucose', '2026-03', 2);
    const expected = LAB_NAMES.map((n) => ({
      sdi1: (net.table.glucose[n]['2026-03'][1].mean - p1.mean) / p1.sd,
      sdi2: (net.table.glucose[n]['2026-03'][2].mean - p2.mean) / p2.sd,
      own: n === 'A',
    })).sort((a, b) => a.sdi1 - b.sdi1);
    expect(d.twoLevel!.levels).toEqual([1, 2]);
    expect(d.twoLevel!.points).toHaveLength(expected.length);
    d.twoLevel!.points.forEach((point, i) => {
      expect(point.own).toBe(expected[i].own);
      expect(point.sdi1).toBeCloseTo(expected[i].sdi1, 10);
      expect(point.sdi2).toBeCloseTo(expected[i].sdi2, 10);
    });
  });

  /** Lab A's March values of both levels in run order, as evaluateMultirule takes them. */
  function marchPoints() {
    return MARCH_Z[1].flatMap((_, day) =>
      [1, 2].map((level) => {
        const earlier = pool([net.table.glucose.A['2026-01'][level], net.table.glucose.A['2026-02'][level]]);
        return {
          run: `R${String(day + 1).padStart(2, '0')}`,
          level,
          value: Number((earlier.mean + MARCH_Z[level as 1 | 2][day] * earlier.sd).toFixed(4)),
        };
      }),
    );
  }

  it('when the control chart uses the lab’s target, then z and rules equal evaluateMultirule against Jan + Feb pooled', async () => {
    const d = await getDrilldown(1, 'period=2026-03&target=lab&units=si');
    const targets = {
      1: pool([net.table.glucose.A['2026-01'][1], net.table.glucose.A['2026-02'][1]]),
      2: pool([net.table.glucose.A['2026-01'][2], net.table.glucose.A['2026-02'][2]]),
    };
    const expected = evaluateMultirule(marchPoints(), targets).points.filter((p) => p.level === 1);
    expect(d.leveyJennings.target).toMatchObject({ kind: 'lab', basis: 'established' });
    expect(d.leveyJennings.target!.mean).toBeCloseTo(targets[1].mean, 10);
    expect(d.leveyJennings.target!.sd).toBeCloseTo(targets[1].sd, 10);
    expect(d.leveyJennings.points).toHaveLength(20);
    d.leveyJennings.points.forEach((point, i) => {
      expect(point.run).toBe(expected[i].run);
      expect(point.value).toBe(expected[i].value);
      expect(point.z).toBeCloseTo(expected[i].z, 10);
      expect(point.rules).toEqual(expected[i].rules);
    });
    // The designed sequence violates 1-3s on day 8 (z 3.4) and 2-2s on days 14–15 (Westgard et al. 1981).
    expect(d.leveyJennings.points[7].rules).toContain('1-3s');
    expect(d.leveyJennings.points[14].rules).toContain('2-2s');
    expect(d.leveyJennings.runs.find((r) => r.run === 'R08')).toMatchObject({ verdict: 'reject' });
  });

  it('when the control chart uses the peer target, then the rules are re-evaluated against the peers’ lot-to-date figures', async () => {
    const d = await getDrilldown(1, 'period=2026-03&target=peer&units=si');
    const targets = {
      1: expectedPeerToDate('glucose', '2026-03', 1),
      2: expectedPeerToDate('glucose', '2026-03', 2),
    };
    const expected = evaluateMultirule(marchPoints(), targets).points.filter((p) => p.level === 1);
    expect(d.leveyJennings.target).toMatchObject({ kind: 'peer', basis: 'peer-to-date' });
    expect(d.leveyJennings.target!.mean).toBeCloseTo(targets[1].mean, 10);
    d.leveyJennings.points.forEach((point, i) => {
      expect(point.z).toBeCloseTo(expected[i].z, 10);
      expect(point.rules).toEqual(expected[i].rules);
    });
  });

  it('when the drill-down is read in conventional units, then values and targets are converted and z is not', async () => {
    const si = await getDrilldown(1, 'period=2026-03&units=si');
    const conv = await getDrilldown(1, 'period=2026-03&units=conventional');
    expect(conv.unit).toBe('mg/dL');
    // Glucose mg/dL = mmol/L × 18.016 (textbook factor, common practice).
    expect(conv.leveyJennings.points[3].value).toBeCloseTo(si.leveyJennings.points[3].value * 18.016, 9);
    expect(conv.leveyJennings.target!.sd).toBeCloseTo(si.leveyJennings.target!.sd * 18.016, 9);
    expect(conv.leveyJennings.points[3].z).toBe(si.leveyJennings.points[3].z);
    expect(conv.trend[0].peerMean).toBeCloseTo(si.trend[0].peerMean! * 18.016, 9);
    expect(conv.uncertainty!.U).toBe(si.uncertainty!.U);
  });

  it('when the uncertainty is read, then it equals measurementUncertainty on the lab’s long-term CV and its peer comparisons', async () => {
    const d = await getDrilldown(1, 'period=2026-03&units=si');
    const longTerm = pool(PERIODS.map((p) => net.table.glucose.A[p][1]));
    const comparisons = PERIODS.map((p) => {
      const peer = expectedPeer('glucose', p, 1);
      return {
        biasPct: standing(net.table.glucose.A[p][1], peer).biasPct,
        // u(Cref) from the between-lab dispersion of the lab means (robust s*), not the peer CV of single values.
        uRefPct: peerMeanUncertaintyPct(peer.robustSd, peer.mean, peer.labs),
        uRefFromPeerCv: peer.cv / Math.sqrt(peer.labs),
      };
    });
    const expected = measurementUncertainty({ cvPct: (100 * longTerm.sd) / longTerm.mean, comparisons });
    const u = d.uncertainty!;
    for (const key of ['uRw', 'rmsBias', 'uRef', 'uBias', 'uc', 'U'] as const)
      expect(u[key]).toBeCloseTo(expected[key], 10);
    expect(u.k).toBe(2);
    expect(u.U).toBeCloseTo(2 * Math.hypot(u.uRw, u.uBias), 10);
    expect(u.comparisons.map((c) => c.period)).toEqual([...PERIODS]);
    u.comparisons.forEach((c, i) => expect(c.uRefPct).not.toBeCloseTo(comparisons[i].uRefFromPeerCv, 6));
  });

  it('when the row is another lab’s, unknown or without data, then 404; a bad target gives 400', async () => {
    const base = `/api/labs/${net.labs.A.id}/report-rows`;
    const lot = net.catalogue.lot.id;
    const get = (path: string, auth = net.labs.A.analyst.auth) =>
      request(t.app).get(path).set('Authorization', auth);
    expect(
      (await get(`${base}/${net.labs.A.glucose}/${lot}/1?period=2026-03`, net.labs.B.supervisor.auth)).status,
    ).toBe(404);
    expect((await get(`${base}/${net.labs.B.glucose}/${lot}/1?period=2026-03`)).status).toBe(404);
    expect((await get(`${base}/${net.labs.A.glucose}/${lot}/3?period=2026-03`)).status).toBe(404);
    expect((await get(`${base}/${net.labs.A.glucose}/${lot}/1?period=2026-04`)).status).toBe(404);
    const bad = await get(`${base}/${net.labs.A.glucose}/${lot}/1?period=2026-03&target=median`);
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('target');
  });

  it('when the trend and control chart are downloaded, then the CSVs hold the same values', async () => {
    const d = await getDrilldown(1, 'period=2026-03&units=si');
    const path = `/api/labs/${net.labs.A.id}/report-rows/${net.labs.A.glucose}/${net.catalogue.lot.id}/1`;
    const trend = await request(t.app)
      .get(`${path}/trend.csv?period=2026-03&units=si`)
      .set('Authorization', net.labs.A.analyst.auth);
    expect(trend.status).toBe(200);
    expect(trend.headers['content-type']).toMatch(/^text\/csv/);
    const lines = trend.text.trim().split('\r\n');
    expect(lines).toHaveLength(1 + d.trend.length);
    expect(lines[3].split(',')[10]).toBe(String(d.trend[2].sdi));
    const lj = await request(t.app)
      .get(`${path}/levey-jennings.csv?period=2026-03`)
      .set('Authorization', net.labs.A.analyst.auth);
    const ljLines = lj.text.trim().split('\r\n');
    expect(ljLines).toHaveLength(21);
    expect(ljLines[8].split(',').at(-1)).toBe(d.leveyJennings.points[7].rules.join(' '));
  });
});
