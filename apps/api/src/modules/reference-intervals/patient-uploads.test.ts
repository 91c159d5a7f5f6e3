import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import request from 'supertest';
import { eq } from 'drizzle-orm';
import { patientResults } from '@plumbline/db';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';
import { spawnWorkerFor, type WorkerProcess } from '../../testing/worker-process.ts';
import { everythingKept, makeRiAnalytes, uploadFile, waitForUpload } from './testing/ri-fixtures.ts';

let t: TestApp;
let worker: WorkerProcess;
let ri: Awaited<ReturnType<typeof makeRiAnalytes>>;
let auth: string;
let labId: string;
const apiLogs: string[] = [];

beforeAll(async () => {
  // Everything the API process prints is captured, to be searched for planted identifiers.
  for (const method of ['log', 'warn', 'error', 'info'] as const)
    vi.spyOn(console, method).mockImplementation((...args: unknown[]) => {
      apiLogs.push(args.map(String).join(' '));
    });
  t = await createTestApp('patientuploads');
  ri = await makeRiAnalytes(t);
  const lab = await t.makeLab();
  labId = lab.id;
  auth = (await t.makeUser('analyst', lab.id)).auth;
  worker = await spawnWorkerFor(t);
});
afterAll(async () => {
  await worker?.stop();
  await t?.close();
  vi.restoreAllMocks();
});

const HEADER = 'analyte,value,unit,sex,age_years,collected_month,setting,sample_id';

// Invented identifiers, one per kind of direct identifier; each must be refused and found nowhere.
const planted: [string, string, RegExp][] = [
  ['patient_name', 'Quillon Marbrecht', /"patient_name" is a name/],
  ['MRN', 'MRN-77341290', /"MRN" is a medical record number/],
  ['date_of_birth', '1961-04-17', /"date_of_birth" is a full birth date/],
  ['street_address', '14 Tallowmere Lane', /"street_address" is a street address/],
  ['phone', '+44 20 7946 0381', /"phone" is a phone number/],
  ['email', 'q.marbrecht@example.org', /"email" is an e-mail address/],
  ['national_id', 'ZX 99 31 27 C', /"national_id" is a national id/],
  // The same kinds hidden under harmless column names are caught by their content.
  [
    'remarks',
    'marbrecht.quillon@example.net',
    /"remarks" \(line 2\) holds what looks like an e-mail address/,
  ],
  ['note', '+31 6 4410 2298', /"note" \(line 2\) holds what looks like a phone number/],
];

describe('patient results with a direct identifier', () => {
  it.each(planted)(
    'when a file has a %s column, then it is refused with the column and the reason, and the value is kept nowhere',
    async (column, value, message) => {
      const csv = `${HEADER},${column}\n${ri.sodium.code},140,mmol/L,F,40,2026-01,outpatient,S1,${value}\n`;
      const res = await uploadFile(t, auth, csv, 'patient-results');
      expect(res.status).toBe(202);
      const done = await waitForUpload(t, auth, res.body.id, worker.output);
      expect(done.status).toBe('failed');
      expect(done.errors).toHaveLength(1);
      expect(done.errors[0]).toMatchObject({ code: 'direct_identifier', column });
      expect(done.failureMessage).toMatch(message);
      const rows = await t.db.select().from(patientResults).where(eq(patientResults.uploadId, res.body.id));
      expect(rows).toEqual([]);
      const kept = await everythingKept(t);
      expect(kept).not.toContain(value);
      expect(worker.output()).not.toContain(value);
      expect(apiLogs.join('\n')).not.toContain(value);
    },
  );
});

describe('a canonical patient-results CSV', () => {
  it('when it is valid, then values are stored in the canonical unit, the sample key only as a hash, and the file is deleted', async () => {
    const csv =
      `${HEADER}\n` +
      `${ri.creatinine.code},1.0,mg/dL,M,51,2026-02-14,inpatient,KEY-4471\n` +
      `${ri.sodium.code},141,mmol/L,female,33,2026-02,outpatient,KEY-4472\n`;
    const res = await uploadFile(t, auth, csv, 'patient-results');
    const done = await waitForUpload(t, auth, res.body.id, worker.output);
    expect(done).toMatchObject({ status: 'stored', rowsAccepted: 2, rowsRejected: 0 });
    const rows = await t.db.select().from(patientResults).where(eq(patientResults.uploadId, res.body.id));
    const crea = rows.find((r) => r.analyteId === ri.creatinine.id)!;
    // 1 mg/dL creatinine = 88.4 µmol/L (common practice factor).
    expect(crea.value).toBeCloseTo(88.4, 1);
    expect(crea).toMatchObject({
      sex: 'male',
      ageYears: 51,
      collectedMonth: '2026-02',
      setting: 'inpatient',
    });
    expect(crea.sampleHash).toMatch(/^[0-9a-f]{64}$/);
    const kept = await everythingKept(t);
    expect(kept).not.toContain('KEY-4471');
    expect(kept).not.toContain('2026-02-14');
  });

  it('when a value is outside the analyte’s plausibility limits, then that row is an error', async () => {
    const csv = `${HEADER}\n${ri.sodium.code},14,mmol/L,F,40,2026-01,outpatient,\n${ri.sodium.code},140,mmol/L,F,40,2026-01,outpatient,\n`;
    const res = await uploadFile(t, auth, csv, 'patient-results');
    const done = await waitForUpload(t, auth, res.body.id, worker.output);
    expect(done.status).toBe('needs-review');
    expect(done.errors).toEqual([
      expect.objectContaining({ row: 2, column: 'value', code: 'implausible_value' }),
    ]);
  });
});

const patient = (id: string, gender: string, birthDate: string, extra: Record<string, unknown> = {}) => ({
  fullUrl: `urn:uuid:${id}`,
  resource: { resourceType: 'Patient', id, gender, birthDate, ...extra },
});
const observation = (loinc: string, value: number, unit: string, effective: string, subject: string) => ({
  resource: {
    resourceType: 'Observation',
    status: 'final',
    code: { coding: [{ system: 'http://loinc.org', code: loinc }] },
    valueQuantity: { value, unit, system: 'http://unitsofmeasure.org', code: unit },
    effectiveDateTime: effective,
    subject: { reference: `urn:uuid:${subject}` },
  },
});

describe('a FHIR R4 Bundle', () => {
  it('when it holds Observations and Patients, then ages, sexes, values and canonical units are right', async () => {
    const bundle = {
      resourceType: 'Bundle',
      type: 'collection',
      entry: [
        patient('p-a1', 'female', '1980-06-15'),
        patient('p-b2', 'male', '2000-01-01'),
        // Birthday not yet reached on the collection day: 45, not 46.
        observation('2951-2', 139, 'mmol/L', '2026-06-14T08:30:00Z', 'p-a1'),
        observation('2160-0', 0.9, 'mg/dL', '2026-03-02', 'p-b2'),
      ],
    };
    const res = await uploadFile(t, auth, JSON.stringify(bundle), 'fhir-bundle', 'bundle.json');
    const done = await waitForUpload(t, auth, res.body.id, worker.output);
    expect(done).toMatchObject({ status: 'stored', rowsAccepted: 2 });
    const rows = await t.db.select().from(patientResults).where(eq(patientResults.uploadId, res.body.id));
    const na = rows.find((r) => r.analyteId === ri.sodium.id)!;
    expect(na).toMatchObject({ sex: 'female', ageYears: 45, collectedMonth: '2026-06', value: 139 });
    const crea = rows.find((r) => r.analyteId === ri.creatinine.id)!;
    expect(crea).toMatchObject({ sex: 'male', ageYears: 26, collectedMonth: '2026-03' });
    // 0.9 mg/dL × 88.4 = 79.6 µmol/L (common practice factor).
    expect(crea.value).toBeCloseTo(79.56, 1);
    expect(await everythingKept(t)).not.toContain('1980-06-15');
  });

  it('when a Patient has a name, then the Bundle is refused and the name is kept nowhere', async () => {
    const bundle = {
      resourceType: 'Bundle',
      type: 'collection',
      entry: [
        patient('p-c3', 'female', '1975-02-02', { name: [{ family: 'Vantreske', given: ['Odilia'] }] }),
        observation('2951-2', 140, 'mmol/L', '2026-01-10', 'p-c3'),
      ],
    };
    const res = await uploadFile(t, auth, JSON.stringify(bundle), 'fhir-bundle', 'bundle.json');
    const done = await waitForUpload(t, auth, res.body.id, worker.output);
    expect(done.status).toBe('failed');
    expect(done.errors[0]).toMatchObject({ code: 'direct_identifier', column: 'Patient.name' });
    expect(done.failureMessage).toMatch(/Patient.*name/);
    const kept = await everythingKept(t);
    expect(kept).not.toContain('Vantreske');
    expect(worker.output()).not.toContain('Vantreske');
  });

  it('when the other lab’s analyst asks for a patient upload, then it is not found', async () => {
    const other = await t.makeUser('analyst', (await t.makeLab()).id);
    const csv = `${HEADER}\n${ri.sodium.code},140,mmol/L,F,40,2026-01,outpatient,\n`;
    const res = await uploadFile(t, auth, csv, 'patient-results');
    await waitForUpload(t, auth, res.body.id, worker.output);
    for (const [method, path] of [
      ['get', `/api/uploads/${res.body.id}`],
      ['post', `/api/uploads/${res.body.id}/confirm`],
      ['post', `/api/uploads/${res.body.id}/cancel`],
    ] as const) {
      const r = await request(t.app)[method](path).set('Authorization', other.auth);
      expect(r.status, path).toBe(404);
    }
    expect(labId).toBeTruthy();
  });
});
