import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { randomBytes } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import {
  analytes,
  auditEvents,
  instrumentModels,
  methods,
  procedures,
  qcSummaries,
  periods,
  reagents,
} from '@plumbline/db';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';

let t: TestApp;
let coordinator: Awaited<ReturnType<TestApp['makeUser']>>;
let analyst: Awaited<ReturnType<TestApp['makeUser']>>;
let supervisor: Awaited<ReturnType<TestApp['makeUser']>>;

beforeAll(async () => {
  t = await createTestApp('catalogueadmin');
  coordinator = await t.makeUser('coordinator', null);
  const lab = await t.makeLab();
  analyst = await t.makeUser('analyst', lab.id);
  supervisor = await t.makeUser('supervisor', lab.id);
});
afterAll(async () => t?.close());

const unique = (prefix: string) => `${prefix}-${randomBytes(3).toString('hex').toUpperCase()}`;

const post = (path: string, body: unknown, auth = coordinator.auth) =>
  request(t.app)
    .post(`/api${path}`)
    .set('Authorization', auth)
    .send(body as object);
const patch = (path: string, body: unknown, auth = coordinator.auth) =>
  request(t.app)
    .patch(`/api${path}`)
    .set('Authorization', auth)
    .send(body as object);
const get = (path: string, auth = coordinator.auth) =>
  request(t.app).get(`/api${path}`).set('Authorization', auth);

async function auditFor(kind: string, entityId: string) {
  return t.db
    .select()
    .from(auditEvents)
    .where(and(eq(auditEvents.kind, kind), eq(auditEvents.entityId, entityId)));
}

function analyteBody(overrides: Record<string, unknown> = {}) {
  return {
    code: unique('NA'),
    name: 'Sodium',
    loinc: '2951-2',
    unit: 'mmol/L',
    decimals: 1,
    ...overrides,
  };
}

async function makeMaterial() {
  const res = await post('/catalogue/control-materials', {
    code: unique('CM'),
    name: 'Chemistry control',
    matrix: 'serum',
  });
  expect(res.status).toBe(201);
  return res.body as { id: string; code: string };
}

describe('catalogue roles', () => {
  const lists = ['analytes', 'methods', 'instrument-models', 'reagents', 'control-materials', 'control-lots'];

  it('when an analyst or a supervisor reads a catalogue list, then only active entries come back', async () => {
    expect(
      (await post('/catalogue/methods', { code: 'KEEP-ME', name: 'Method in use' }, coordinator.auth)).status,
    ).toBe(201);
    const created = await post(
      '/catalogue/methods',
      { code: 'RET-ME', name: 'Method to retire' },
      coordinator.auth,
    );
    expect(created.status).toBe(201);
    expect((await post(`/catalogue/methods/${created.body.id}/retire`, {}, coordinator.auth)).status).toBe(
      200,
    );
    const asCoordinator = await get('/catalogue/methods?state=all&limit=500', coordinator.auth);
    expect(asCoordinator.body.items.map((m: { code: string }) => m.code)).toContain('RET-ME');
    for (const user of [analyst, supervisor]) {
      const res = await get('/catalogue/methods?state=all&limit=500', user.auth);
      expect(res.status).toBe(200);
      expect(res.body.items.map((m: { code: string }) => m.code)).toContain('KEEP-ME');
      expect(res.body.items.map((m: { code: string }) => m.code)).not.toContain('RET-ME');
    }
  });

  it('when an analyst or a supervisor writes any catalogue list, then 403', async () => {
    for (const user of [analyst, supervisor]) {
      for (const list of lists) {
        expect((await post(`/catalogue/${list}`, { code: 'X', name: 'X' }, user.auth)).status).toBe(403);
      }
      const id = '00000000-0000-4000-8000-000000000000';
      expect((await patch(`/catalogue/methods/${id}`, { name: 'Y' }, user.auth)).status).toBe(403);
      expect((await post(`/catalogue/methods/${id}/retire`, {}, user.auth)).status).toBe(403);
      expect((await post(`/catalogue/methods/${id}/restore`, {}, user.auth)).status).toBe(403);
      const imported = await request(t.app)
        .post('/api/catalogue/methods/import')
        .set('Authorization', user.auth)
        .set('Content-Type', 'text/csv')
        .send('code,name\nM1,Method one\n');
      expect(imported.status).toBe(403);
    }
  });

  it('when nobody is signed in, then 401', async () => {
    expect((await request(t.app).get('/api/catalogue/analytes')).status).toBe(401);
  });

  it('when the list name is unknown, then 404 naming the lists', async () => {
    const res = await get('/catalogue/colours');
    expect(res.status).toBe(404);
    expect(res.body.error.message).toContain('analytes');
  });
});

describe('analytes', () => {
  it('when the coordinator creates an analyte with a real LOINC code and UCUM unit, then it is stored and audited', async () => {
    const body = analyteBody({
      conventionalUnit: 'mg/dL',
      molarMass: 22.99,
      teaPct: 5,
      teaSource: 'network quality specification',
      teaDate: '2025-01-15',
      reason: 'new analyte for the chemistry panel',
    });
    const res = await post('/catalogue/analytes', body);
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      code: body.code,
      loinc: '2951-2',
      unit: 'mmol/L',
      conventionalUnit: 'mg/dL',
      molarMass: 22.99,
      decimals: 1,
      teaPct: 5,
      teaDate: '2025-01-15',
      retired: false,
      retiredAt: null,
    });
    const events = await auditFor('catalogue.analyte.create', res.body.id);
    expect(events).toHaveLength(1);
    expect(events[0].actorId).toBe(coordinator.id);
    expect(events[0].details).toMatchObject({
      reason: 'new analyte for the chemistry panel',
      values: { code: body.code },
    });
  });

  it('when the LOINC check digit is wrong, then 400 with a field error on loinc', async () => {
    // 2345-7 is glucose (from memory); 2345-6 has the wrong check digit.
    const res = await post('/catalogue/analytes', analyteBody({ loinc: '2345-6' }));
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([
      { path: 'loinc', message: expect.stringContaining('2345-7 expected') },
    ]);
  });

  it('when the unit is not UCUM, then 400 with a field error on unit', async () => {
    const res = await post('/catalogue/analytes', analyteBody({ unit: 'mEq/L' }));
    expect(res.status).toBe(400);
    expect(res.body.error.details).toEqual([
      { path: 'unit', message: expect.stringContaining('not a valid UCUM unit') },
    ]);
  });

  it('when the conventional unit cannot be converted to the canonical one, then 400 on conventionalUnit', async () => {
    // Mass to substance needs the molar mass (UCUM: mg/dL and mmol/L differ in the mole dimension).
    const withoutMolarMass = await post(
      '/catalogue/analytes',
      analyteBody({ unit: 'mmol/L', conventionalUnit: 'mg/dL' }),
    );
    expect(withoutMolarMass.status).toBe(400);
    expect(withoutMolarMass.body.error.details[0].path).toBe('conventionalUnit');
    const incommensurable = await post(
      '/catalogue/analytes',
      analyteBody({ unit: 'mmol/L', conventionalUnit: 'U/L' }),
    );
    expect(incommensurable.status).toBe(400);
    expect(incommensurable.body.error.details[0].message).toContain('cannot be converted');
  });

  it('when a total allowable error has no source or date, then 400 naming both', async () => {
    const res = await post('/catalogue/analytes', analyteBody({ teaPct: 6 }));
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual([
      'teaDate',
      'teaSource',
    ]);
  });

  it('when an older analyte has a TEa without a date, then a rename passes but a new TEa needs its date', async () => {
    const [older] = await t.db
      .insert(analytes)
      .values({
        code: unique('K'),
        name: 'Potassium',
        unit: 'mmol/L',
        teaPct: 5.8,
        teaSource: 'biological variation',
      })
      .returning();
    const renamed = await patch(`/catalogue/analytes/${older.id}`, { name: 'Potassium (plasma)' });
    expect(renamed.status).toBe(200);
    const retuned = await patch(`/catalogue/analytes/${older.id}`, { teaPct: 6 });
    expect(retuned.status).toBe(400);
    expect(retuned.body.error.details).toEqual([{ path: 'teaDate', message: expect.any(String) }]);
  });

  it('when several fields are wrong, then each gets its own error', async () => {
    const res = await post('/catalogue/analytes', {
      code: '',
      name: '',
      unit: '',
      decimals: 1.5,
      molarMass: -1,
    });
    expect(res.status).toBe(400);
    const paths = res.body.error.details.map((d: { path: string }) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['code', 'name', 'unit', 'decimals', 'molarMass']));
  });

  it('when the code is taken, then 409 with a clear message', async () => {
    const body = analyteBody();
    expect((await post('/catalogue/analytes', body)).status).toBe(201);
    const res = await post('/catalogue/analytes', { ...body, name: 'Another' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toBe(
      `An analyte with the code "${body.code}" already exists; codes must be unique.`,
    );
  });

  it('when the coordinator edits an analyte, then only the changed fields are audited with before and after', async () => {
    const created = (await post('/catalogue/analytes', analyteBody())).body;
    const res = await patch(`/catalogue/analytes/${created.id}`, {
      name: 'Sodium (serum)',
      decimals: 1,
      reason: 'clearer name',
    });
    expect(res.status).toBe(200);
    expect(res.body.name).toBe('Sodium (serum)');
    const [event] = await auditFor('catalogue.analyte.update', created.id);
    expect(event.details).toEqual({
      code: created.code,
      changes: { name: { from: 'Sodium', to: 'Sodium (serum)' } },
      reason: 'clearer name',
    });
  });

  it('when an edit clears an optional field with null or an empty string, then it is stored empty', async () => {
    const created = (await post('/catalogue/analytes', analyteBody())).body;
    const res = await patch(`/catalogue/analytes/${created.id}`, { loinc: '' });
    expect(res.status).toBe(200);
    expect(res.body.loinc).toBeNull();
  });

  it('when an edit would break the UCUM unit, then 400 and nothing changes', async () => {
    const created = (await post('/catalogue/analytes', analyteBody())).body;
    const res = await patch(`/catalogue/analytes/${created.id}`, { unit: 'millimoles' });
    expect(res.status).toBe(400);
    expect(res.body.error.details[0].path).toBe('unit');
    const list = await get(`/catalogue/analytes?q=${created.code}`);
    expect(list.body.items[0].unit).toBe('mmol/L');
  });

  it('when procedures use an analyte, then its canonical unit cannot change (409)', async () => {
    const analyte = (await post('/catalogue/analytes', analyteBody())).body;
    const lab = await t.makeLab();
    const [model] = await t.db
      .insert(instrumentModels)
      .values({ code: unique('IM'), name: 'Analyser' })
      .returning();
    const [method] = await t.db
      .insert(methods)
      .values({ code: unique('ME'), name: 'Method' })
      .returning();
    const [reagent] = await t.db
      .insert(reagents)
      .values({ code: unique('RE'), name: 'Reagent' })
      .returning();
    await t.db.insert(procedures).values({
      labId: lab.id,
      code: 'NA1',
      analyteId: analyte.id,
      instrumentModelId: model.id,
      methodId: method.id,
      reagentId: reagent.id,
      unit: 'mmol/L',
    });
    const res = await patch(`/catalogue/analytes/${analyte.id}`, { unit: 'umol/L' });
    expect(res.status).toBe(409);
    expect(res.body.error.details[0].path).toBe('unit');
  });

  it('when the id is unknown or malformed, then 404', async () => {
    expect(
      (await patch('/catalogue/analytes/00000000-0000-4000-8000-000000000000', { name: 'X' })).status,
    ).toBe(404);
    expect((await patch('/catalogue/analytes/not-an-id', { name: 'X' })).status).toBe(404);
  });

  it('when an analyte is retired and restored, then its state follows, both are audited, and repeating is a 409', async () => {
    const created = (await post('/catalogue/analytes', analyteBody())).body;
    const retired = await post(`/catalogue/analytes/${created.id}/retire`, { reason: 'no longer offered' });
    expect(retired.status).toBe(200);
    expect(retired.body.retired).toBe(true);
    expect(retired.body.retiredAt).toEqual(expect.any(String));
    expect((await post(`/catalogue/analytes/${created.id}/retire`, {})).status).toBe(409);
    const [event] = await auditFor('catalogue.analyte.retire', created.id);
    expect(event.details).toMatchObject({ reason: 'no longer offered' });

    const restored = await post(`/catalogue/analytes/${created.id}/restore`, {});
    expect(restored.status).toBe(200);
    expect(restored.body.retired).toBe(false);
    expect((await post(`/catalogue/analytes/${created.id}/restore`, {})).status).toBe(409);
    expect(await auditFor('catalogue.analyte.restore', created.id)).toHaveLength(1);
  });
});

describe('catalogue lists', () => {
  it('when the coordinator filters, sorts and pages a list, then total and items follow the query', async () => {
    const tag = randomBytes(3).toString('hex');
    for (const name of ['Charlie', 'Alpha', 'Bravo']) {
      expect(
        (await post('/catalogue/methods', { code: `${tag}-${name}`, name: `${name} ${tag}` })).status,
      ).toBe(201);
    }
    const first = await get(`/catalogue/methods?q=${tag}&sort=name&order=desc&limit=2&offset=0`);
    expect(first.status).toBe(200);
    expect(first.body.total).toBe(3);
    expect(first.body.items.map((i: { name: string }) => i.name)).toEqual([`Charlie ${tag}`, `Bravo ${tag}`]);
    const second = await get(`/catalogue/methods?q=${tag}&sort=name&order=desc&limit=2&offset=2`);
    expect(second.body.items.map((i: { name: string }) => i.name)).toEqual([`Alpha ${tag}`]);
  });

  it('when the state filter is used, then retired entries are kept apart', async () => {
    const tag = randomBytes(3).toString('hex');
    const kept = (await post('/catalogue/reagents', { code: `${tag}-A`, name: 'Kept' })).body;
    const gone = (await post('/catalogue/reagents', { code: `${tag}-B`, name: 'Gone' })).body;
    await post(`/catalogue/reagents/${gone.id}/retire`, {});
    const active = await get(`/catalogue/reagents?q=${tag}&state=active`);
    expect(active.body.items.map((i: { id: string }) => i.id)).toEqual([kept.id]);
    const retired = await get(`/catalogue/reagents?q=${tag}&state=retired`);
    expect(retired.body.items.map((i: { id: string }) => i.id)).toEqual([gone.id]);
    expect((await get(`/catalogue/reagents?q=${tag}`)).body.total).toBe(2);
  });

  it('when the sort column or paging is not allowed, then 400 naming the field', async () => {
    const badSort = await get('/catalogue/methods?sort=colour');
    expect(badSort.status).toBe(400);
    expect(badSort.body.error.details[0].path).toBe('sort');
    const badLimit = await get('/catalogue/methods?limit=0');
    expect(badLimit.status).toBe(400);
    expect(badLimit.body.error.details[0].path).toBe('limit');
  });

  it('when a search text holds % or _, then they match literally', async () => {
    const tag = randomBytes(3).toString('hex');
    await post('/catalogue/instrument-models', { code: `${tag}-1`, name: `100% ${tag}` });
    await post('/catalogue/instrument-models', { code: `${tag}-2`, name: `100 ${tag}` });
    const res = await get(`/catalogue/instrument-models?q=${encodeURIComponent(`100% ${tag}`)}`);
    expect(res.body.total).toBe(1);
  });

  it('when the coordinator creates, edits and retires a method, an instrument model, a reagent and a control material, then each is audited', async () => {
    const cases = [
      ['methods', 'method', { principle: 'ion-selective electrode' }],
      ['instrument-models', 'instrument-model', { manufacturer: 'Example Instruments' }],
      ['reagents', 'reagent', { manufacturer: 'Example Reagents' }],
      ['control-materials', 'control-material', { manufacturer: 'Example Controls', matrix: 'human serum' }],
    ] as const;
    for (const [list, entity, extra] of cases) {
      const created = await post(`/catalogue/${list}`, { code: unique('C'), name: 'First name', ...extra });
      expect(created.status).toBe(201);
      expect(created.body).toMatchObject(extra);
      const edited = await patch(`/catalogue/${list}/${created.body.id}`, { name: 'Second name' });
      expect(edited.status).toBe(200);
      expect(edited.body.name).toBe('Second name');
      expect((await post(`/catalogue/${list}/${created.body.id}/retire`, {})).body.retired).toBe(true);
      for (const verb of ['create', 'update', 'retire']) {
        expect(await auditFor(`catalogue.${entity}.${verb}`, created.body.id)).toHaveLength(1);
      }
      const duplicate = await post(`/catalogue/${list}`, { code: created.body.code, name: 'Again' });
      expect(duplicate.status).toBe(409);
    }
  });
});

describe('control lots', () => {
  it('when the coordinator creates a lot with per-level details, then it comes back with its material and levels', async () => {
    const material = await makeMaterial();
    const lotNumber = unique('LOT');
    const res = await post('/catalogue/control-lots', {
      materialId: material.id,
      lotNumber,
      expiresOn: '2027-06-30',
      levels: [
        { level: 2, description: 'pathological' },
        { level: 1, description: 'normal' },
      ],
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({
      lotNumber,
      expiresOn: '2027-06-30',
      state: 'active',
      expired: false,
      material: { id: material.id, code: material.code },
      levels: [
        { level: 1, description: 'normal' },
        { level: 2, description: 'pathological' },
      ],
    });
    expect(await auditFor('catalogue.control-lot.create', res.body.id)).toHaveLength(1);
    const listed = await get(`/catalogue/control-lots?q=${lotNumber}`);
    expect(listed.body.items).toHaveLength(1);
    expect(listed.body.items[0].levels).toHaveLength(2);
  });

  it('when a lot lists a level twice, has no levels or an unknown material, then 400 with field errors', async () => {
    const material = await makeMaterial();
    const twice = await post('/catalogue/control-lots', {
      materialId: material.id,
      lotNumber: unique('LOT'),
      expiresOn: '2027-06-30',
      levels: [{ level: 1 }, { level: 1 }],
    });
    expect(twice.status).toBe(400);
    expect(twice.body.error.details[0].path).toBe('levels.1.level');
    const none = await post('/catalogue/control-lots', {
      materialId: material.id,
      lotNumber: unique('LOT'),
      expiresOn: '30/06/2027',
      levels: [],
    });
    expect(none.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual([
      'expiresOn',
      'levels',
    ]);
    const unknown = await post('/catalogue/control-lots', {
      materialId: '00000000-0000-4000-8000-000000000000',
      lotNumber: unique('LOT'),
      expiresOn: '2027-06-30',
      levels: [{ level: 1 }],
    });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details).toEqual([
      { path: 'materialId', message: 'no control material has this id' },
    ]);
  });

  it('when a lot number is taken, then 409', async () => {
    const material = await makeMaterial();
    const body = {
      materialId: material.id,
      lotNumber: unique('LOT'),
      expiresOn: '2027-06-30',
      levels: [{ level: 1 }],
    };
    expect((await post('/catalogue/control-lots', body)).status).toBe(201);
    const res = await post('/catalogue/control-lots', body);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toContain(body.lotNumber);
  });

  it('when an edit drops a level that has QC data, then 409; other edits go through and are audited', async () => {
    const material = await makeMaterial();
    const lot = (
      await post('/catalogue/control-lots', {
        materialId: material.id,
        lotNumber: unique('LOT'),
        expiresOn: '2027-06-30',
        levels: [{ level: 1 }, { level: 2 }, { level: 3 }],
      })
    ).body;
    const analyte = (await post('/catalogue/analytes', analyteBody())).body;
    const lab = await t.makeLab();
    const [model] = await t.db
      .insert(instrumentModels)
      .values({ code: unique('IM'), name: 'Analyser' })
      .returning();
    const [method] = await t.db
      .insert(methods)
      .values({ code: unique('ME'), name: 'Method' })
      .returning();
    const [reagent] = await t.db
      .insert(reagents)
      .values({ code: unique('RE'), name: 'Reagent' })
      .returning();
    const [procedure] = await t.db
      .insert(procedures)
      .values({
        labId: lab.id,
        code: 'NA1',
        analyteId: analyte.id,
        instrumentModelId: model.id,
        methodId: method.id,
        reagentId: reagent.id,
        unit: 'mmol/L',
      })
      .returning();
    await t.db
      .insert(periods)
      .values({ period: '2025-03', deadline: new Date('2025-04-10T00:00:00Z') })
      .onConflictDoNothing();
    await t.db.insert(qcSummaries).values({
      labId: lab.id,
      procedureId: procedure.id,
      controlLotId: lot.id,
      level: 2,
      period: '2025-03',
      n: 20,
      mean: 140,
      sd: 1.2,
    });
    const refused = await patch(`/catalogue/control-lots/${lot.id}`, { levels: [{ level: 1 }] });
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toContain('Levels 2');
    const allowed = await patch(`/catalogue/control-lots/${lot.id}`, {
      levels: [{ level: 1 }, { level: 2, description: 'high' }],
      expiresOn: '2027-12-31',
    });
    expect(allowed.status).toBe(200);
    expect(allowed.body.levels).toEqual([
      { level: 1, description: null },
      { level: 2, description: 'high' },
    ]);
    const [event] = await auditFor('catalogue.control-lot.update', lot.id);
    expect(Object.keys(event.details.changes as object).sort()).toEqual(['expiresOn', 'levels']);
  });

  it('when a lot is retired and restored, then its state changes and a second retire is 409', async () => {
    const material = await makeMaterial();
    const lot = (
      await post('/catalogue/control-lots', {
        materialId: material.id,
        lotNumber: unique('LOT'),
        expiresOn: '2020-01-31',
        levels: [{ level: 1 }],
      })
    ).body;
    expect(lot.expired).toBe(true);
    const retired = await post(`/catalogue/control-lots/${lot.id}/retire`, { reason: 'expired' });
    expect(retired.body).toMatchObject({ state: 'retired', retired: true });
    expect((await post(`/catalogue/control-lots/${lot.id}/retire`, {})).status).toBe(409);
    expect((await post(`/catalogue/control-lots/${lot.id}/restore`, {})).body.state).toBe('active');
    expect(await auditFor('catalogue.control-lot.retire', lot.id)).toHaveLength(1);
    expect(await auditFor('catalogue.control-lot.restore', lot.id)).toHaveLength(1);
  });
});
