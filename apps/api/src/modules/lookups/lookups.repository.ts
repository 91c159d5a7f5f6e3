import { and, asc, desc, eq, isNull } from 'drizzle-orm';
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
  type Executor,
} from '@plumbline/db';

export async function listPeriods(db: Executor) {
  return db
    .select({ period: periods.period, state: periods.state, deadline: periods.deadline })
    .from(periods)
    .orderBy(desc(periods.period));
}

export async function labExists(db: Executor, labId: string): Promise<boolean> {
  const rows = await db.select({ id: labs.id }).from(labs).where(eq(labs.id, labId)).limit(1);
  return rows.length === 1;
}

/** A lab's current (not retired) measurement procedures with their catalogue entries. */
export async function listLabProcedures(db: Executor, labId: string) {
  return db
    .select({
      id: procedures.id,
      code: procedures.code,
      unit: procedures.unit,
      analyte: { code: analytes.code, name: analytes.name, loinc: analytes.loinc, unit: analytes.unit },
      instrumentModel: { id: instrumentModels.id, name: instrumentModels.name },
      method: { id: methods.id, name: methods.name },
      reagent: { id: reagents.id, name: reagents.name },
    })
    .from(procedures)
    .innerJoin(analytes, eq(analytes.id, procedures.analyteId))
    .innerJoin(instrumentModels, eq(instrumentModels.id, procedures.instrumentModelId))
    .innerJoin(methods, eq(methods.id, procedures.methodId))
    .innerJoin(reagents, eq(reagents.id, procedures.reagentId))
    .where(and(eq(procedures.labId, labId), isNull(procedures.retiredAt)))
    .orderBy(asc(procedures.code));
}

/** Control lots in use (not retired). */
export async function listControlLots(db: Executor) {
  return db
    .select({
      id: controlLots.id,
      lotNumber: controlLots.lotNumber,
      levels: controlLots.levels,
      expiresOn: controlLots.expiresOn,
      material: { id: controlMaterials.id, name: controlMaterials.name },
    })
    .from(controlLots)
    .innerJoin(controlMaterials, eq(controlMaterials.id, controlLots.materialId))
    .where(eq(controlLots.state, 'active'))
    .orderBy(asc(controlLots.lotNumber));
}
