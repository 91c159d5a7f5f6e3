import { and, asc, eq, inArray, isNull, or, sql } from 'drizzle-orm';
import { analytes, labs, periods, procedures, qcSummaries, type Executor } from '@plumbline/db';

export type PeriodRow = typeof periods.$inferSelect;

export async function findPeriod(db: Executor, period: string): Promise<PeriodRow | null> {
  const [row] = await db.select().from(periods).where(eq(periods.period, period)).limit(1);
  return row ?? null;
}

export async function insertPeriod(
  db: Executor,
  values: { period: string; deadline: Date },
): Promise<PeriodRow> {
  const [row] = await db.insert(periods).values(values).returning();
  return row;
}

export async function updatePeriod(
  db: Executor,
  period: string,
  values: Partial<Omit<PeriodRow, 'period'>>,
): Promise<PeriodRow> {
  const [row] = await db.update(periods).set(values).where(eq(periods.period, period)).returning();
  return row;
}

/** Moves a period from one state to another only if it is still in the expected state (no lost updates). */
export async function transitionPeriod(
  db: Executor,
  period: string,
  from: PeriodRow['state'],
  values: Partial<Omit<PeriodRow, 'period'>>,
): Promise<PeriodRow | null> {
  const [row] = await db
    .update(periods)
    .set(values)
    .where(and(eq(periods.period, period), eq(periods.state, from)))
    .returning();
  return row ?? null;
}

// ---------- participation ----------

export type ParticipationLabRow = { id: string; code: string; name: string; active: boolean };
export type ParticipationProcedureRow = {
  id: string;
  labId: string;
  code: string;
  retired: boolean;
  analyte: { code: string; name: string };
};
export type SubmittedProcedureRow = { labId: string; procedureId: string; late: boolean };

/** Active labs, plus any inactive lab that nevertheless has data for the period. */
export async function participationLabs(db: Executor, period: string): Promise<ParticipationLabRow[]> {
  const withData = db
    .selectDistinct({ labId: qcSummaries.labId })
    .from(qcSummaries)
    .where(eq(qcSummaries.period, period));
  return db
    .select({ id: labs.id, code: labs.code, name: labs.name, active: labs.active })
    .from(labs)
    .where(or(eq(labs.active, true), inArray(labs.id, withData)))
    .orderBy(asc(labs.code));
}

/** Procedures registered and not retired, plus retired ones that still have data for the period. */
export async function participationProcedures(
  db: Executor,
  period: string,
  labIds: string[],
): Promise<ParticipationProcedureRow[]> {
  if (labIds.length === 0) return [];
  const withData = db
    .selectDistinct({ procedureId: qcSummaries.procedureId })
    .from(qcSummaries)
    .where(eq(qcSummaries.period, period));
  const rows = await db
    .select({
      id: procedures.id,
      labId: procedures.labId,
      code: procedures.code,
      retiredAt: procedures.retiredAt,
      analyte: { code: analytes.code, name: analytes.name },
    })
    .from(procedures)
    .innerJoin(analytes, eq(analytes.id, procedures.analyteId))
    .where(
      and(
        inArray(procedures.labId, labIds),
        or(isNull(procedures.retiredAt), inArray(procedures.id, withData)),
      ),
    )
    .orderBy(asc(analytes.code), asc(procedures.code));
  return rows.map(({ retiredAt, ...row }) => ({ ...row, retired: retiredAt !== null }));
}

/** Each procedure with monthly summaries for the period, and whether any of them arrived late. */
export async function submittedProcedures(db: Executor, period: string): Promise<SubmittedProcedureRow[]> {
  return db
    .select({
      labId: qcSummaries.labId,
      procedureId: qcSummaries.procedureId,
      late: sql<boolean>`bool_or(${qcSummaries.late})`,
    })
    .from(qcSummaries)
    .where(eq(qcSummaries.period, period))
    .groupBy(qcSummaries.labId, qcSummaries.procedureId);
}
