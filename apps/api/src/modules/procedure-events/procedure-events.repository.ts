import { and, asc, desc, eq, gte, lte, max } from 'drizzle-orm';
import { procedureEvents, procedures, qcSummaries, users, type Executor } from '@plumbline/db';

/** The lab's procedure (id and code), or null when it is not the lab's. */
export async function findProcedure(db: Executor, labId: string, procedureId: string) {
  const [row] = await db
    .select({ id: procedures.id, code: procedures.code })
    .from(procedures)
    .where(and(eq(procedures.id, procedureId), eq(procedures.labId, labId)))
    .limit(1);
  return row ?? null;
}

/** The lab's procedures by code (for CSV rows that name a procedure by its code). */
export async function proceduresByCode(db: Executor, labId: string) {
  const rows = await db
    .select({ id: procedures.id, code: procedures.code })
    .from(procedures)
    .where(eq(procedures.labId, labId));
  return new Map(rows.map((r) => [r.code.toLowerCase(), r]));
}

export type NewEvent = {
  labId: string;
  procedureId: string;
  occurredOn: string;
  kind: string;
  note: string;
  recordedBy: string | null;
  recordedByLabel: string | null;
};

export async function insertEvent(db: Executor, event: NewEvent): Promise<string> {
  const [row] = await db.insert(procedureEvents).values(event).returning({ id: procedureEvents.id });
  return row.id;
}

const eventColumns = {
  id: procedureEvents.id,
  procedureId: procedureEvents.procedureId,
  procedureCode: procedures.code,
  occurredOn: procedureEvents.occurredOn,
  kind: procedureEvents.kind,
  note: procedureEvents.note,
  recordedByName: users.name,
  recordedByLabel: procedureEvents.recordedByLabel,
  createdAt: procedureEvents.createdAt,
};
export type EventRow = {
  id: string;
  procedureId: string;
  procedureCode: string;
  occurredOn: string;
  kind: string;
  note: string;
  recordedByName: string | null;
  recordedByLabel: string | null;
  createdAt: Date;
};

/** Events of the lab (of one procedure when given), newest first; optionally within [from, to]. */
export async function listEvents(
  db: Executor,
  labId: string,
  filter: { procedureId?: string; from?: string; to?: string } = {},
): Promise<EventRow[]> {
  return db
    .select(eventColumns)
    .from(procedureEvents)
    .innerJoin(procedures, eq(procedures.id, procedureEvents.procedureId))
    .leftJoin(users, eq(users.id, procedureEvents.recordedBy))
    .where(
      and(
        eq(procedureEvents.labId, labId),
        filter.procedureId ? eq(procedureEvents.procedureId, filter.procedureId) : undefined,
        filter.from ? gte(procedureEvents.occurredOn, filter.from) : undefined,
        filter.to ? lte(procedureEvents.occurredOn, filter.to) : undefined,
      ),
    )
    .orderBy(desc(procedureEvents.occurredOn), desc(procedureEvents.createdAt));
}

/** The control lots and levels a procedure has monthly data for, with the latest period of each. */
export async function seriesKeys(db: Executor, procedureId: string) {
  return db
    .select({
      controlLotId: qcSummaries.controlLotId,
      level: qcSummaries.level,
      latest: max(qcSummaries.period).as('latest'),
    })
    .from(qcSummaries)
    .where(eq(qcSummaries.procedureId, procedureId))
    .groupBy(qcSummaries.controlLotId, qcSummaries.level)
    .orderBy(asc(qcSummaries.controlLotId), asc(qcSummaries.level));
}

/** The lab's procedure ids that have monthly data. */
export async function proceduresWithData(db: Executor, labId: string) {
  const rows = await db
    .selectDistinct({ id: procedures.id, code: procedures.code })
    .from(procedures)
    .innerJoin(qcSummaries, eq(qcSummaries.procedureId, procedures.id))
    .where(eq(procedures.labId, labId))
    .orderBy(asc(procedures.code));
  return rows;
}
