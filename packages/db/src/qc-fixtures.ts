import { randomBytes } from 'node:crypto';
import {
  analytes,
  controlLots,
  controlMaterials,
  instrumentModels,
  labs,
  methods,
  periods,
  procedures,
  reagents,
} from './schema/index.ts';
import type { Database } from './client.ts';

/**
 * Test support: a small invented QC network (catalogue entries, one control lot, periods) and helpers
 * to add labs with procedures. Every name is made up; method names are the trade's generic principles.
 */
export async function createQcCatalogue(db: Database) {
  const tag = randomBytes(3).toString('hex');
  const [glucose] = await db
    .insert(analytes)
    .values({
      code: `GLU-${tag}`,
      name: 'Glucose',
      loinc: '15074-8',
      unit: 'mmol/L',
      conventionalUnit: 'mg/dL',
      molarMass: 180.16,
      decimals: 2,
      teaPct: 8,
      teaSource: 'test value (US CLIA 2024 rule, percent part, from memory)',
    })
    .returning();
  const [creatinine] = await db
    .insert(analytes)
    .values({
      code: `CREA-${tag}`,
      name: 'Creatinine',
      loinc: '14682-9',
      unit: 'umol/L',
      conventionalUnit: 'mg/dL',
      molarMass: 113.12,
      decimals: 0,
      teaPct: 10,
      teaSource: 'test value (US CLIA 2024 rule, percent part, from memory)',
    })
    .returning();
  const [methodA, methodB] = await db
    .insert(methods)
    .values([
      { code: `HK-${tag}`, name: 'Hexokinase', principle: 'enzymatic' },
      { code: `GOD-${tag}`, name: 'Glucose oxidase', principle: 'enzymatic' },
    ])
    .returning();
  const [modelX, modelY] = await db
    .insert(instrumentModels)
    .values([
      { code: `TX1-${tag}`, name: 'Testline X1', manufacturer: 'Invented Instruments' },
      { code: `TY2-${tag}`, name: 'Testline Y2', manufacturer: 'Invented Instruments' },
    ])
    .returning();
  const [reagentR, reagentS] = await db
    .insert(reagents)
    .values([
      { code: `RR-${tag}`, name: 'Reagent kit R', manufacturer: 'Invented Reagents' },
      { code: `RS-${tag}`, name: 'Reagent kit S', manufacturer: 'Invented Reagents' },
    ])
    .returning();
  const [material] = await db
    .insert(controlMaterials)
    .values({ code: `CM-${tag}`, name: 'Chemistry control (test)', manufacturer: 'Invented Controls' })
    .returning();
  const [lot] = await db
    .insert(controlLots)
    .values({ materialId: material.id, lotNumber: `LOT-${tag}`, levels: [1, 2], expiresOn: '2027-12-31' })
    .returning();
  await db
    .insert(periods)
    .values(
      ['2026-01', '2026-02', '2026-03', '2026-04'].map((period) => ({
        period,
        state: 'open' as const,
        deadline: new Date(`${period}-28T23:59:00Z`),
      })),
    )
    .onConflictDoNothing();

  async function makeLabWithProcedures(
    specs: {
      code: string;
      analyte?: typeof glucose;
      model?: typeof modelX;
      method?: typeof methodA;
      reagent?: typeof reagentR;
      unit?: string;
    }[],
    labCode = `L-${randomBytes(3).toString('hex')}`,
  ) {
    const [lab] = await db
      .insert(labs)
      .values({ code: labCode, name: `Test lab ${labCode}` })
      .returning();
    const created = [];
    for (const spec of specs) {
      const analyte = spec.analyte ?? glucose;
      const [procedure] = await db
        .insert(procedures)
        .values({
          labId: lab.id,
          code: spec.code,
          analyteId: analyte.id,
          instrumentModelId: (spec.model ?? modelX).id,
          methodId: (spec.method ?? methodA).id,
          reagentId: (spec.reagent ?? reagentR).id,
          unit: spec.unit ?? analyte.unit,
        })
        .returning();
      created.push(procedure);
    }
    return { lab, procedures: created };
  }

  return {
    analytes: { glucose, creatinine },
    methods: { hexokinase: methodA, oxidase: methodB },
    models: { x1: modelX, y2: modelY },
    reagents: { r: reagentR, s: reagentS },
    material,
    lot,
    makeLabWithProcedures,
  };
}
export type QcCatalogue = Awaited<ReturnType<typeof createQcCatalogue>>;
