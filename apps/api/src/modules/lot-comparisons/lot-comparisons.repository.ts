import { and, eq, gte, inArray, lt } from 'drizzle-orm';
import {
  analytes,
  controlLots,
  procedureEvents,
  procedures,
  qcSummaries,
  type Executor,
} from '@plumbline/db';

export async function findAnalyte(db: Executor, id: string) {
  const [row] = await db
    .select({ id: analytes.id, code: analytes.code, name: analytes.name, unit: analytes.unit })
    .from(analytes)
    .where(eq(analytes.id, id))
    .limit(1);
  return row ?? null;
}

/** Monthly lab means of every procedure of the analyte in the given periods, with the lot number. */
export async function analyteSummaries(db: Executor, analyteId: string, periodKeys: string[]) {
  return db
    .select({
      procedureId: qcSummaries.procedureId,
      controlLotId: qcSummaries.controlLotId,
      lotNumber: controlLots.lotNumber,
      level: qcSummaries.level,
      period: qcSummaries.period,
      mean: qcSummaries.mean,
    })
    .from(qcSummaries)
    .innerJoin(procedures, eq(procedures.id, qcSummaries.procedureId))
    .innerJoin(controlLots, eq(controlLots.id, qcSummaries.controlLotId))
    .where(and(eq(procedures.analyteId, analyteId), inArray(qcSummaries.period, periodKeys)));
}

/** Procedures of the analyte with a reagent-lot change recorded on a day in [from, to). */
export async function reagentLotChangeProcedures(db: Executor, analyteId: string, from: string, to: string) {
  const rows = await db
    .selectDistinct({ procedureId: procedureEvents.procedureId })
    .from(procedureEvents)
    .innerJoin(procedures, eq(procedures.id, procedureEvents.procedureId))
    .where(
      and(
        eq(procedures.analyteId, analyteId),
        eq(procedureEvents.kind, 'reagent-lot'),
        gte(procedureEvents.occurredOn, from),
        lt(procedureEvents.occurredOn, to),
      ),
    );
  return new Set(rows.map((r) => r.procedureId));
}
