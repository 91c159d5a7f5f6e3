import { and, asc, desc, eq, isNull, sql } from 'drizzle-orm';
import { periodSignoffs, periods, procedures, qcSummaries, type Executor } from '@plumbline/db';

export async function listPeriods(db: Executor) {
  return db.select().from(periods).orderBy(asc(periods.period));
}

/** Per period in which the lab has data: how many rows, how many arrived late, and whether it is signed. */
export async function labPeriodsWithData(db: Executor, labId: string) {
  return db
    .select({
      period: qcSummaries.period,
      rows: sql<number>`count(*)::int`,
      lateRows: sql<number>`count(*) filter (where ${qcSummaries.late})::int`,
      signedAt: sql<Date | null>`max(${periodSignoffs.signedAt})`,
    })
    .from(qcSummaries)
    .leftJoin(
      periodSignoffs,
      and(eq(periodSignoffs.labId, qcSummaries.labId), eq(periodSignoffs.period, qcSummaries.period)),
    )
    .where(eq(qcSummaries.labId, labId))
    .groupBy(qcSummaries.period)
    .orderBy(desc(qcSummaries.period));
}

/** The lab's active procedures and whether each has data in the period. */
export async function activeProceduresWithData(db: Executor, labId: string, period: string) {
  const active = await db
    .select({ id: procedures.id, code: procedures.code })
    .from(procedures)
    .where(and(eq(procedures.labId, labId), isNull(procedures.retiredAt)))
    .orderBy(asc(procedures.code));
  const withData = await db
    .selectDistinct({ procedureId: qcSummaries.procedureId })
    .from(qcSummaries)
    .where(and(eq(qcSummaries.labId, labId), eq(qcSummaries.period, period)));
  const ids = new Set(withData.map((r) => r.procedureId));
  return active.map((p) => ({ ...p, hasData: ids.has(p.id) }));
}
