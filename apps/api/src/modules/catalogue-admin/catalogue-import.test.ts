import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { randomBytes } from 'node:crypto';
import { and, eq, inArray, like } from 'drizzle-orm';
import { analytes, auditEvents, controlLots, methods } from '@plumbline/db';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';

let t: TestApp;
let coordinator: Awaited<ReturnType<TestApp['makeUser']>>;

beforeAll(async () => {
  t = await createTestApp('catalogueimport');
  coordinator = await t.makeUser('coordinator', null);
});
afterAll(async () => t?.close());

const tag = () => randomBytes(3).toString('hex').toUpperCase();

function importCsv(list: string, csv: string, dryRun: boolean) {
  return request(t.app)
    .post(`/api/catalogue/${list}/import?dryRun=${dryRun}`)
    .set('Authorization', coordinator.auth)
    .set('Content-Type', 'text/csv')
    .send(csv);
}

describe('CSV import of analytes', () => {
  it('when the file is previewed, then each row says what it would do and nothing is stored', async () => {
    const x = tag();
    const csv = [
      'code,name,loinc,unit,conventional_unit,molar_mass,decimals,tea_pct,tea_source,tea_date',
      `GLU-${x},Glucose,2345-7,mmol/L,mg/dL,180.16,1,6.9,network specification,2025-02-01`,
      `NA-${x},Sodium,2951-2,mmol/L,,,,,,`,
    ].join('\n');
    const res = await importCsv('analytes', csv, true);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ created: 2, updated: 0, rejected: 0, applied: false });
    expect(res.body.rows[0]).toMatchObject({
      row: 2,
      action: 'create',
      data: {
        code: `GLU-${x}`,
        loinc: '2345-7',
        molarMass: 180.16,
        decimals: 1,
        teaPct: 6.9,
        teaDate: '2025-02-01',
      },
    });
    // A blank decimals cell takes the default (2) for a new analyte.
    expect(res.body.rows[1]).toMatchObject({
      row: 3,
      action: 'create',
      data: { decimals: 2, molarMass: null },
    });
    const stored = await t.db
      .select()
      .from(analytes)
      .where(like(analytes.code, `%-${x}`));
    expect(stored).toHaveLength(0);
  });

  it('when rows have errors, then the preview names row, column and reason, and applying is refused with 422', async () => {
    const x = tag();
    const csv = [
      'code,name,loinc,unit,molar_mass,tea_pct',
      `OK-${x},Fine,2160-0,umol/L,113.12,`,
      `BAD1-${x},Wrong check digit,2160-1,umol/L,,`,
      `BAD2-${x},Not UCUM,,micromoles,,`,
      `BAD3-${x},Not a number,,umol/L,heavy,`,
      `BAD4-${x},TEa without source,,umol/L,,7`,
      `OK-${x},Twice,,umol/L,,`,
      `,No code,,umol/L,,`,
    ].join('\n');
    const preview = await importCsv('analytes', csv, true);
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({ created: 1, rejected: 6 });
    const byRow = Object.fromEntries(preview.body.rows.map((r: { row: number }) => [r.row, r]));
    expect(byRow[2].action).toBe('create');
    expect(byRow[3].errors).toEqual([
      { column: 'loinc', message: expect.stringContaining('2160-0 expected') },
    ]);
    expect(byRow[4].errors).toEqual([
      { column: 'unit', message: expect.stringContaining('not a valid UCUM unit') },
    ]);
    expect(byRow[5].errors).toEqual([{ column: 'molar_mass', message: '"heavy" is not a number' }]);
    expect(byRow[6].errors.map((e: { column: string }) => e.column).sort()).toEqual([
      'tea_date',
      'tea_source',
    ]);
    expect(byRow[7].errors).toEqual([{ column: 'code', message: `"OK-${x}" is also on row 2 of this file` }]);
    expect(byRow[8].errors[0].column).toBe('code');

    const applied = await importCsv('analytes', csv, false);
    expect(applied.status).toBe(422);
    expect(applied.body.error.code).toBe('validation_failed');
    expect(applied.body.error.details.rows).toEqual(preview.body.rows);
    const stored = await t.db
      .select()
      .from(analytes)
      .where(like(analytes.code, `%-${x}`));
    expect(stored).toHaveLength(0);
  });

  it('when a clean file is applied, then new codes are created, known codes updated, all in one go and audited', async () => {
    const x = tag();
    const [existing] = await t.db
      .insert(analytes)
      .values({ code: `K-${x}`, name: 'Potassium', unit: 'mmol/L', decimals: 1, loinc: '2823-3' })
      .returning();
    const csv = [
      'code,name,unit,decimals',
      `K-${x},Potassium (serum),mmol/L,2`,
      `CREA-${x},Creatinine,umol/L,0`,
    ].join('\r\n');
    const preview = await importCsv('analytes', csv, true);
    expect(preview.body.rows[0]).toMatchObject({ action: 'update', changes: ['name', 'decimals'] });
    const res = await importCsv('analytes', csv, false);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ created: 1, updated: 1, rejected: 0, applied: true });
    const [updated] = await t.db.select().from(analytes).where(eq(analytes.id, existing.id));
    // Columns absent from the file (loinc) are left as they were.
    expect(updated).toMatchObject({ name: 'Potassium (serum)', decimals: 2, loinc: '2823-3' });
    const events = await t.db
      .select()
      .from(auditEvents)
      .where(
        and(
          inArray(auditEvents.kind, ['catalogue.analyte.create', 'catalogue.analyte.update']),
          eq(auditEvents.actorId, coordinator.id),
        ),
      );
    const fromImport = events.filter(
      (e) => e.details.via === 'csv-import' && String(JSON.stringify(e.details)).includes(x),
    );
    expect(fromImport.map((e) => e.kind).sort()).toEqual([
      'catalogue.analyte.create',
      'catalogue.analyte.update',
    ]);
  });

  it('when the header has an unknown or missing column, then 400 naming it', async () => {
    const res = await importCsv('analytes', 'code,name,colour\nA,B,red\n', true);
    expect(res.status).toBe(400);
    const messages = res.body.error.details.map((d: { message: string }) => d.message);
    expect(messages).toEqual(
      expect.arrayContaining([
        expect.stringContaining('unknown column "colour"'),
        'missing required column "unit"',
      ]),
    );
  });

  it('when the file is not CSV text, then 415; when it is malformed, then 400', async () => {
    const json = await request(t.app)
      .post('/api/catalogue/methods/import?dryRun=true')
      .set('Authorization', coordinator.auth)
      .send({ code: 'A' });
    expect(json.status).toBe(415);
    const malformed = await importCsv('methods', 'code,name\n"unclosed,quote\n', true);
    expect(malformed.status).toBe(400);
    expect(malformed.body.error.message).toContain('could not be read');
    const empty = await importCsv('methods', '', true);
    expect(empty.status).toBe(400);
  });

  it('when the dryRun flag is not a boolean, then 400 on dryRun', async () => {
    const res = await request(t.app)
      .post('/api/catalogue/methods/import?dryRun=perhaps')
      .set('Authorization', coordinator.auth)
      .set('Content-Type', 'text/csv')
      .send('code,name\nA,B\n');
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('dryRun');
  });

  it('when the file comes as a multipart upload, then it is read from the "file" field', async () => {
    const x = tag();
    const res = await request(t.app)
      .post('/api/catalogue/methods/import?dryRun=false')
      .set('Authorization', coordinator.auth)
      .attach(
        'file',
        Buffer.from(`code,name,principle\nISE-${x},Indirect ISE,potentiometry\n`),
        'methods.csv',
      );
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ created: 1, applied: true });
    const [stored] = await t.db
      .select()
      .from(methods)
      .where(eq(methods.code, `ISE-${x}`));
    expect(stored.principle).toBe('potentiometry');
  });
});

describe('CSV import of control lots', () => {
  it('when lots are imported by material code with levels and descriptions, then they are created with their levels', async () => {
    const x = tag();
    const material = await request(t.app)
      .post('/api/catalogue/control-materials')
      .set('Authorization', coordinator.auth)
      .send({ code: `CM-${x}`, name: 'Chemistry control' });
    const csv = [
      'lot_number,material_code,expires_on,levels,level_descriptions',
      `L1-${x},CM-${x},2027-03-31,1;2,normal;pathological`,
      `L2-${x},NOPE-${x},2027-03-31,1,`,
      `L3-${x},CM-${x},2027-02-30,1;x,`,
      `L4-${x},CM-${x},2027-03-31,1;2;3,low;high`,
    ].join('\n');
    const preview = await importCsv('control-lots', csv, true);
    expect(preview.status).toBe(200);
    const [ok, unknownMaterial, badLevels, badDescriptions] = preview.body.rows;
    expect(ok).toMatchObject({
      action: 'create',
      data: {
        lotNumber: `L1-${x}`,
        materialId: material.body.id,
        levels: [
          { level: 1, description: 'normal' },
          { level: 2, description: 'pathological' },
        ],
      },
    });
    expect(unknownMaterial.errors).toEqual([
      { column: 'material_code', message: `no control material has the code "NOPE-${x}"` },
    ]);
    expect(badLevels.errors.map((e: { column: string }) => e.column).sort()).toEqual([
      'expires_on',
      'levels',
    ]);
    expect(badDescriptions.errors[0].column).toBe('level_descriptions');

    const onlyGood = [csv.split('\n')[0], csv.split('\n')[1]].join('\n');
    const applied = await importCsv('control-lots', onlyGood, false);
    expect(applied.status).toBe(200);
    const [lot] = await t.db
      .select()
      .from(controlLots)
      .where(eq(controlLots.lotNumber, `L1-${x}`));
    expect(lot.levels).toEqual([1, 2]);
    const listed = await request(t.app)
      .get(`/api/catalogue/control-lots?q=L1-${x}`)
      .set('Authorization', coordinator.auth);
    expect(listed.body.items[0].levels).toEqual([
      { level: 1, description: 'normal' },
      { level: 2, description: 'pathological' },
    ]);
  });
});
