import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createQcCatalogue, type QcCatalogue } from '@plumbline/db/testing';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';

let t: TestApp;
let catalogue: QcCatalogue;
beforeAll(async () => {
  t = await createTestApp('lookups');
  catalogue = await createQcCatalogue(t.db);
});
afterAll(async () => t?.close());

describe('lists for uploading and reading reports', () => {
  it('when a user lists periods, then they come newest first with state and deadline', async () => {
    const user = await t.makeUser('analyst', (await t.makeLab()).id);
    const res = await request(t.app).get('/api/periods').set('Authorization', user.auth);
    expect(res.status).toBe(200);
    expect(res.body.map((p: { period: string }) => p.period)).toEqual([
      '2026-04',
      '2026-03',
      '2026-02',
      '2026-01',
    ]);
    expect(res.body[0]).toEqual({ period: '2026-04', state: 'open', deadline: '2026-04-28T23:59:00.000Z' });
  });

  it('when an analyst lists their lab’s procedures, then each comes with analyte, instrument model, method and reagent; another lab gives 404', async () => {
    const { lab, procedures } = await catalogue.makeLabWithProcedures([
      { code: 'GLU1', unit: 'mg/dL' },
      {
        code: 'CREA1',
        analyte: catalogue.analytes.creatinine,
        model: catalogue.models.y2,
        method: catalogue.methods.oxidase,
        reagent: catalogue.reagents.s,
      },
    ]);
    const analyst = await t.makeUser('analyst', lab.id);
    const res = await request(t.app).get(`/api/labs/${lab.id}/procedures`).set('Authorization', analyst.auth);
    expect(res.status).toBe(200);
    expect(res.body).toEqual([
      {
        id: procedures[1].id,
        code: 'CREA1',
        analyte: {
          code: catalogue.analytes.creatinine.code,
          name: 'Creatinine',
          loinc: '14682-9',
          unit: 'umol/L',
        },
        instrumentModel: { id: catalogue.models.y2.id, name: 'Testline Y2' },
        method: { id: catalogue.methods.oxidase.id, name: 'Glucose oxidase' },
        reagent: { id: catalogue.reagents.s.id, name: 'Reagent kit S' },
        unit: 'umol/L',
      },
      expect.objectContaining({ id: procedures[0].id, code: 'GLU1', unit: 'mg/dL' }),
    ]);
    const other = await t.makeUser('analyst', (await t.makeLab()).id);
    expect(
      (await request(t.app).get(`/api/labs/${lab.id}/procedures`).set('Authorization', other.auth)).status,
    ).toBe(404);
  });

  it('when a user lists control lots, then each has its material, levels and expiry', async () => {
    const user = await t.makeUser('supervisor', (await t.makeLab()).id);
    const res = await request(t.app).get('/api/control-lots').set('Authorization', user.auth);
    expect(res.body).toContainEqual({
      id: catalogue.lot.id,
      lotNumber: catalogue.lot.lotNumber,
      material: { id: catalogue.material.id, name: 'Chemistry control (test)' },
      levels: [1, 2],
      expiresOn: '2027-12-31',
    });
  });

  it('when nobody is signed in, then 401', async () => {
    expect((await request(t.app).get('/api/control-lots')).status).toBe(401);
  });
});
