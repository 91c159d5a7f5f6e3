import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { lotComparisonsSchema } from '@plumbline/contracts';
import { controlLots, procedureEvents, qcSummaries } from '@plumbline/db';
import { createQcCatalogue, type QcCatalogue } from '@plumbline/db/testing';
import { pairedMeanDifference, welchMeanDifference } from '@plumbline/stats';
import { createTestApp, type TestApp } from '../../testing/test-app.ts';

// An invented network: six labs change glucose control lot between 2026-02 and 2026-03. Labs differ
// from one another by up to ±0.3 mmol/L; at level 1 every lab's mean moves up by about 0.2 mmol/L with
// the new lot (a lot effect), at level 2 the moves are small and in both directions (no common shift).
// A seventh lab stays on the old lot and is not paired. Every figure is made up.
const offsets = [-0.3, -0.18, -0.05, 0.07, 0.19, 0.3];
const level1Moves = [0.21, 0.18, 0.2, 0.23, 0.19, 0.22];
const level2Moves = [0.05, -0.06, 0.02, -0.04, 0.03, -0.01];
const base = { 1: 5.5, 2: 15.2 } as const;

let t: TestApp;
let catalogue: QcCatalogue;
let newLotId: string;
let coordinator: { auth: string };
let analyst: { auth: string };

beforeAll(async () => {
  t = await createTestApp('lot-comparisons');
  catalogue = await createQcCatalogue(t.db);
  const [newLot] = await t.db
    .insert(controlLots)
    .values({
      materialId: catalogue.material.id,
      lotNumber: `${catalogue.lot.lotNumber}-NEW`,
      levels: [1, 2],
      expiresOn: '2028-06-30',
    })
    .returning();
  newLotId = newLot!.id;
  const rows: (typeof qcSummaries.$inferInsert)[] = [];
  for (let i = 0; i < 7; i++) {
    const { lab, procedures } = await catalogue.makeLabWithProcedures([{ code: 'GLU1' }]);
    if (i === 0) analyst = await t.makeUser('analyst', lab.id);
    // Lab 0 changed reagent lot inside the two months, lab 1 before them (not counted).
    if (i < 2) {
      await t.db.insert(procedureEvents).values({
        labId: lab.id,
        procedureId: procedures[0]!.id,
        occurredOn: i === 0 ? '2026-03-05' : '2026-01-15',
        kind: 'reagent-lot',
      });
    }
    for (const level of [1, 2] as const) {
      const offset = i < 6 ? offsets[i]! : 0.1;
      const before = base[level] + offset;
      const move = i < 6 ? (level === 1 ? level1Moves : level2Moves)[i]! : 0;
      const common = { labId: lab.id, procedureId: procedures[0]!.id, level, n: 20, sd: 0.1 };
      rows.push({ ...common, controlLotId: catalogue.lot.id, period: '2026-02', mean: before });
      rows.push({
        ...common,
        controlLotId: i < 6 ? newLotId : catalogue.lot.id,
        period: '2026-03',
        mean: before + move,
      });
    }
  }
  await t.db.insert(qcSummaries).values(rows);
  coordinator = await t.makeUser('coordinator', null);
});
afterAll(async () => {
  await t?.close();
});

function url(period = '2026-03') {
  return `/api/lot-comparisons?analyteId=${catalogue.analytes.glucose.id}&period=${period}`;
}

function meanSd(values: number[]) {
  const mean = values.reduce((s, v) => s + v, 0) / values.length;
  const sd = Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (values.length - 1));
  return { mean, sd, labs: values.length };
}

describe('GET /api/lot-comparisons', () => {
  it('when six labs change lot with a common shift at level 1, then the paired and Welch differences equal the stats functions and the verdict is a lot effect', async () => {
    const res = await request(t.app).get(url()).set('Authorization', coordinator.auth);
    expect(res.status).toBe(200);
    const body = lotComparisonsSchema.parse(res.body);
    expect(body.previousPeriod).toBe('2026-02');
    const level1 = body.comparisons.find((c) => c.level === 1)!;
    expect(level1.fromLot.controlLotId).toBe(catalogue.lot.id);
    expect(level1.toLot.controlLotId).toBe(newLotId);
    expect(level1.pairedLabs).toBe(6);
    expect(level1.labsHigher).toBe(6);

    // Expected values from @plumbline/stats on the same seeded inputs (Student paired t; Welch 1947).
    const expectedPaired = pairedMeanDifference(
      offsets.map((o, i) => base[1] + o + level1Moves[i]! - (base[1] + o)),
    );
    expect(level1.paired!.difference).toBeCloseTo(expectedPaired.difference, 10);
    expect(level1.paired!.low).toBeCloseTo(expectedPaired.low, 10);
    expect(level1.paired!.high).toBeCloseTo(expectedPaired.high, 10);
    const fromMeans = [...offsets.map((o) => base[1] + o), base[1] + 0.1];
    const toMeans = offsets.map((o, i) => base[1] + o + level1Moves[i]!);
    const expectedWelch = welchMeanDifference(meanSd(fromMeans), meanSd(toMeans));
    expect(level1.fromLot.labs).toBe(7);
    expect(level1.welch!.difference).toBeCloseTo(expectedWelch.difference, 10);
    expect(level1.welch!.low).toBeCloseTo(expectedWelch.low, 10);
    expect(level1.paired!.differencePct).toBeCloseTo(
      (100 * expectedPaired.difference) / meanSd(fromMeans).mean,
      10,
    );

    expect(level1.verdict).toBe('lot-effect');
    expect(level1.explanation).toMatch(/reads higher in 6 of 6 labs/);
    expect(level1.reagentLotChanges).toBe(1);
    expect(level1.explanation).toMatch(/1 of 6 labs also recorded a reagent-lot change/);
    // The labs differ more than the lot moved, so only the paired interval sees the shift.
    expect(level1.welch!.low).toBeLessThan(0);
    expect(level1.paired!.low).toBeGreaterThan(0);
    expect(body.caution).toMatch(/laboratory director/);
  });

  it('when the moves at level 2 go both ways, then no shift common to the labs', async () => {
    const body = lotComparisonsSchema.parse(
      (await request(t.app).get(url()).set('Authorization', coordinator.auth)).body,
    );
    const level2 = body.comparisons.find((c) => c.level === 2)!;
    const expected = pairedMeanDifference(level2Moves);
    expect(level2.paired!.difference).toBeCloseTo(expected.difference, 10);
    expect(level2.verdict).toBe('no-common-shift');
    expect(level2.labDifferences).toHaveLength(6);
  });

  it('when a lab user asks, then 403; a malformed query gets 400 naming the field', async () => {
    expect((await request(t.app).get(url()).set('Authorization', analyst.auth)).status).toBe(403);
    const bad = await request(t.app).get(url('2026-13')).set('Authorization', coordinator.auth);
    expect(bad.status).toBe(400);
    expect(JSON.stringify(bad.body)).toMatch(/period/);
  });

  it('when no lab changed lot in the month, then the list is empty', async () => {
    const body = lotComparisonsSchema.parse(
      (await request(t.app).get(url('2026-02')).set('Authorization', coordinator.auth)).body,
    );
    expect(body.comparisons).toEqual([]);
  });
});
