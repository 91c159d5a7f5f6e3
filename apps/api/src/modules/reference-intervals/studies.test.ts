import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { nonparametricInterval, screenOutliers, verifyInterval } from '@plumbline/stats';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import { spawnWorkerFor, type WorkerProcess } from '../../testing/worker-process.ts';
import { makeRiAnalytes, uploadFile, waitForStudy, waitForUpload } from './testing/ri-fixtures.ts';

// Data source: US National Center for Health Statistics (NCHS/CDC), NHANES 2017–2018 public-use files
// BIOPRO_J (standard biochemistry profile) joined with DEMO_J (demographics), as placed in the shared
// reference-data folder (see its README for provenance and terms).
// REFERENCE_DATA_DIR overrides; otherwise ../shared/reference-data beside the checkout.
const referenceRoots = [
  process.env.REFERENCE_DATA_DIR,
  resolve(fileURLToPath(new URL('.', import.meta.url)), '../../../../../../shared/reference-data'),
  '/work/shared/reference-data',
].filter((p): p is string => Boolean(p));
const NHANES = resolve(
  referenceRoots.find((p) => existsSync(p)) ?? referenceRoots[0],
  'nhanes-2017-2018-biopro/nhanes_2017_2018_biopro_demo.csv',
);
const haveNhanes = existsSync(NHANES);
if (!haveNhanes)
  console.warn(`NHANES 2017–2018 (NCHS) file not found at ${NHANES}: the NHANES study test is skipped.`);

let t: TestApp;
let worker: WorkerProcess;
let ri: Awaited<ReturnType<typeof makeRiAnalytes>>;
let supervisor: { auth: string };
let analyst: { auth: string };
let otherAnalyst: { auth: string };

beforeAll(async () => {
  t = await createTestApp('ristudies', { env: { MAX_UPLOAD_BYTES: String(20 * 1024 * 1024) } });
  ri = await makeRiAnalytes(t);
  const lab = await t.makeLab();
  supervisor = await t.makeUser('supervisor', lab.id);
  analyst = await t.makeUser('analyst', lab.id);
  otherAnalyst = await t.makeUser('analyst', (await t.makeLab()).id);
  worker = await spawnWorkerFor(t);
});
afterAll(async () => {
  await worker?.stop();
  await t?.close();
});

type NhanesRow = {
  seqn: string;
  sex: 'female' | 'male';
  age: number;
  pregnant: boolean;
  na: number | null;
  k: number | null;
};

function readNhanes(): NhanesRow[] {
  const [header, ...lines] = readFileSync(NHANES, 'utf8').trim().split(/\r?\n/);
  const col = Object.fromEntries(header.split(',').map((h, i) => [h, i]));
  return lines.map((line) => {
    const c = line.split(',');
    const num = (name: string) => (c[col[name]] === '' ? null : Number(c[col[name]]));
    return {
      seqn: c[col.SEQN],
      sex: c[col.RIAGENDR] === '1' ? 'male' : 'female',
      age: Number(c[col.RIDAGEYR]),
      pregnant: c[col.RIDEXPRG] === '1',
      na: num('LBXSNASI'),
      k: num('LBXSKSI'),
    };
  });
}

const post = (path: string, auth: string, body: object) =>
  request(t.app).post(`/api/reference-intervals${path}`).set('Authorization', auth).send(body);

describe.skipIf(!haveNhanes)('a study on NHANES 2017–2018 (NCHS) results', () => {
  it('when adult sodium and potassium are studied by sex, then the limits and CIs equal @plumbline/stats on the same values', async () => {
    // Canonical CSV: pregnant participants left out here; the study selects adults (18+) itself. NHANES
    // publishes no collection month, so one invented month is used for every row.
    const rows = readNhanes().filter((r) => !r.pregnant);
    const lines = ['analyte,value,unit,sex,age_years,collected_month,setting,sample_id'];
    for (const r of rows) {
      if (r.na !== null)
        lines.push(`${ri.sodium.code},${r.na},mmol/L,${r.sex},${r.age},2018-01,screening,${r.seqn}`);
      if (r.k !== null)
        lines.push(`${ri.potassium.code},${r.k},mmol/L,${r.sex},${r.age},2018-01,screening,${r.seqn}`);
    }
    const res = await uploadFile(t, analyst.auth, lines.join('\n') + '\n', 'patient-results', 'nhanes.csv');
    expect(res.status).toBe(202);
    const done = await waitForUpload(t, analyst.auth, res.body.id, worker.output);
    expect(done).toMatchObject({ status: 'stored', rowsRejected: 0 });

    const selection = { ageLow: 18, ageHigh: 120, sex: 'all' };
    const count = await post('/studies/count', analyst.auth, { analyteId: ri.sodium.id, selection });
    const adults = rows.filter((r) => r.age >= 18);
    expect(count.body.count).toBe(adults.filter((r) => r.na !== null).length);

    for (const [analyte, screening, pick] of [
      [ri.sodium, 'none', (r: NhanesRow) => r.na],
      [ri.potassium, 'tukey', (r: NhanesRow) => r.k],
    ] as const) {
      const created = await post('/studies', supervisor.auth, {
        name: `Adult ${analyte.name.toLowerCase()} by sex`,
        analyteId: analyte.id,
        selection,
        partitioning: { bySex: true, ageBands: [] },
        method: 'nonparametric',
        screening,
      });
      expect(created.status).toBe(201);
      const study = await waitForStudy(t, analyst.auth, created.body.id, worker.output);
      expect(study.status).toBe('done');
      const [result] = study.results;
      expect(result.version).toBe(1);
      for (const sex of ['female', 'male'] as const) {
        const values = adults
          .filter((r) => r.sex === sex)
          .map(pick)
          .filter((v): v is number => v !== null);
        const kept = screening === 'none' ? values : screenOutliers(values, 'tukey').kept;
        const expected = nonparametricInterval(kept);
        const partition = result.partitions.find((p: { key: { sex: string } }) => p.key.sex === sex);
        expect(partition.n).toBe(values.length);
        expect(partition.excludedCount).toBe(values.length - kept.length);
        expect(partition.lower).toEqual(expected.lower);
        expect(partition.upper).toEqual(expected.upper);
        if (analyte === ri.sodium) {
          // Self-computed unweighted percentiles noted beside the data (reference-data README, not published figures).
          expect(partition.lower.value).toBe(135);
          expect(partition.upper.value).toBe(146);
        }
      }
      expect(result.advice).toHaveLength(1);
      expect(result.advice[0].advice).toMatch(/Harris & Boyd/);
      expect(study.caution).toMatch(/laboratory director/);
    }
  }, 180_000);
});

describe('studies: approval, versions and adoption', () => {
  let studyId: string;
  beforeAll(async () => {
    const lines = ['analyte,value,unit,sex,age_years,collected_month,setting,sample_id'];
    // Invented demo-style values: 150 per sex around 140 mmol/L.
    for (let i = 0; i < 300; i++)
      lines.push(
        `${ri.sodium.code},${136 + (i % 9)},mmol/L,${i % 2 ? 'F' : 'M'},${20 + (i % 50)},2026-01,outpatient,X${i}`,
      );
    const up = await uploadFile(t, analyst.auth, lines.join('\n') + '\n', 'patient-results');
    await waitForUpload(t, analyst.auth, up.body.id, worker.output);
    const created = await post('/studies', supervisor.auth, {
      name: 'Sodium, invented data',
      analyteId: ri.sodium.id,
      selection: { ageLow: 18, ageHigh: 120, sex: 'all', settings: ['outpatient'] },
      partitioning: { bySex: false, ageBands: [] },
      method: 'nonparametric',
      screening: 'dixon',
    });
    studyId = created.body.id;
    await waitForStudy(t, analyst.auth, studyId, worker.output);
  });

  it('when an analyst tries to create, run or approve, then it is forbidden (403)', async () => {
    expect(
      (
        await post(`/studies/${studyId}/versions/1/approve`, analyst.auth, {
          statement: 'Looks right to me, approved.',
        })
      ).status,
    ).toBe(403);
    expect((await post(`/studies/${studyId}/run`, analyst.auth, {})).status).toBe(403);
  });

  it('when the supervisor approves and reruns, then the approved version stays and a new version is added', async () => {
    const approved = await post(`/studies/${studyId}/versions/1/approve`, supervisor.auth, {
      statement: 'Reviewed with the laboratory director; adopted for outpatients.',
    });
    expect(approved.status).toBe(200);
    expect(approved.body.approval.statement).toMatch(/laboratory director/);
    expect(
      (
        await post(`/studies/${studyId}/versions/1/approve`, supervisor.auth, {
          statement: 'Approving once more, again.',
        })
      ).status,
    ).toBe(409);
    expect((await post(`/studies/${studyId}/run`, supervisor.auth, {})).status).toBe(202);
    const study = await waitForStudy(t, analyst.auth, studyId, worker.output);
    expect(study.results.map((r: { version: number }) => r.version)).toEqual([2, 1]);
    expect(study.results[1].approval).not.toBeNull();
    expect(study.results[0].approval).toBeNull();
    expect(study.approvedVersion).toBe(1);

    const adopt = await post('/current/adopt', supervisor.auth, {
      resultId: study.results[1].id,
      partition: study.results[1].partitions[0].label,
    });
    expect(adopt.status).toBe(200);
    expect(adopt.body.adoptedFrom).toEqual({ studyId, version: 1 });
    expect(adopt.body.lower).toBe(study.results[1].partitions[0].lower.value);
    const audit = await request(t.app).get('/api/audit').set('Authorization', supervisor.auth);
    if (audit.status === 200) expect(JSON.stringify(audit.body)).toContain('current-interval.adopted');

    const csv = await request(t.app)
      .get(`/api/reference-intervals/studies/${studyId}/versions/1/export.csv`)
      .set('Authorization', analyst.auth);
    expect(csv.status).toBe(200);
    expect(csv.text).toMatch(/laboratory director/);
    expect(csv.text).toMatch(/Reviewed with the laboratory director/);
    const pdf = await request(t.app)
      .get(`/api/reference-intervals/studies/${studyId}/versions/1/export.pdf`)
      .set('Authorization', analyst.auth)
      .buffer(true)
      .parse((res, done) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => done(null, Buffer.concat(chunks)));
      });
    expect(pdf.status).toBe(200);
    expect((pdf.body as Buffer).subarray(0, 5).toString()).toBe('%PDF-');
  });

  it('when another lab’s analyst asks for any study or verification route, then it is not found (404)', async () => {
    const current = await request(t.app)
      .put('/api/reference-intervals/current')
      .set('Authorization', supervisor.auth)
      .send({
        analyteId: ri.potassium.id,
        sex: 'all',
        ageLow: 18,
        ageHigh: 120,
        lower: 3.5,
        upper: 5.1,
        source: 'Invented transferred interval',
      });
    const verification = await post('/verifications', analyst.auth, {
      currentIntervalId: current.body.id,
      values: Array.from({ length: 20 }, () => 4.2),
    });
    const vid = verification.body.id;
    const routes: [string, string, unknown?][] = [
      ['get', `/studies/${studyId}`],
      ['post', `/studies/${studyId}/run`, {}],
      ['post', `/studies/${studyId}/versions/1/approve`, { statement: 'Not my lab, still trying.' }],
      ['get', `/studies/${studyId}/versions/1/export.csv`],
      ['get', `/studies/${studyId}/versions/1/export.pdf`],
      ['get', `/verifications/${vid}`],
      ['post', `/verifications/${vid}/rounds`, { values: Array.from({ length: 20 }, () => 4) }],
      ['post', `/verifications/${vid}/approve`, { statement: 'Not my lab, still trying.' }],
      [
        'post',
        '/verifications',
        { currentIntervalId: current.body.id, values: Array.from({ length: 20 }, () => 4) },
      ],
      ['post', '/current/adopt', { resultId: studyId, partition: 'x' }],
    ];
    for (const [method, path, body] of routes) {
      const url = `/api/reference-intervals${path}`;
      const req = (method === 'get' ? request(t.app).get(url) : request(t.app).post(url)).set(
        'Authorization',
        otherAnalyst.auth,
      );
      const r = body === undefined ? await req : await req.send(body as object);
      expect(r.status, `${method} ${path}`).toBe(404);
    }
    const list = await request(t.app)
      .get('/api/reference-intervals/studies')
      .set('Authorization', otherAnalyst.auth);
    expect(list.body).toEqual([]);
  });
});

describe('verification of a transferred interval (CLSI EP28-A3c: accept when ≤ 2 of 20 fall outside)', () => {
  let currentId: string;
  beforeAll(async () => {
    const res = await request(t.app)
      .put('/api/reference-intervals/current')
      .set('Authorization', supervisor.auth)
      .send({
        analyteId: ri.creatinine.id,
        sex: 'male',
        ageLow: 18,
        ageHigh: 120,
        lower: 64,
        upper: 104,
        source: 'Invented: manufacturer’s insert',
      });
    expect(res.status).toBe(200);
    currentId = res.body.id;
  });
  const twenty = (outside: number) => [
    ...Array.from({ length: 20 - outside }, (_, i) => 70 + i),
    ...Array.from({ length: outside }, (_, i) => (i % 2 ? 50 : 120 + i)),
  ];

  it('when 2 of 20 fall outside, then the interval is accepted', async () => {
    const res = await post('/verifications', analyst.auth, {
      currentIntervalId: currentId,
      values: twenty(2),
    });
    expect(res.status).toBe(201);
    expect(res.body.status).toBe('accepted');
    expect(res.body.rounds[0].outside).toBe(verifyInterval(twenty(2), [64, 104]).outside);
    expect(res.body.caution).toMatch(/laboratory director/);
  });

  it('when 3 of 20 fall outside, then it is not accepted and the EP28 next step is shown; a second failure says derive locally', async () => {
    const res = await post('/verifications', analyst.auth, {
      currentIntervalId: currentId,
      values: twenty(3),
    });
    expect(res.body).toMatchObject({ status: 'collect-more' });
    expect(res.body.rounds[0]).toMatchObject({ outside: 3, accepted: false });
    expect(res.body.nextStep).toMatch(/Collect 20 more results/);
    const again = await post(`/verifications/${res.body.id}/rounds`, analyst.auth, { values: twenty(3) });
    expect(again.body.status).toBe('derive-locally');
    expect(again.body.nextStep).toMatch(/derive the reference interval locally/);
    const approved = await post(`/verifications/${res.body.id}/approve`, supervisor.auth, {
      statement: 'Reviewed: interval to be derived locally next quarter.',
    });
    expect(approved.status).toBe(200);
    expect(approved.body.approval.statement).toMatch(/derived locally/);
  });
});
