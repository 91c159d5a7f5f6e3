import { and, asc, desc, eq } from 'drizzle-orm';
import {
  analytes,
  controlLots,
  periodSignoffs,
  procedures,
  reviewComments,
  users,
  type Executor,
} from '@plumbline/db';

const commentColumns = {
  id: reviewComments.id,
  labId: reviewComments.labId,
  period: reviewComments.period,
  procedureId: procedures.id,
  procedureCode: procedures.code,
  analyteCode: analytes.code,
  analyteName: analytes.name,
  controlLotId: controlLots.id,
  lotNumber: controlLots.lotNumber,
  level: reviewComments.level,
  body: reviewComments.body,
  authorId: users.id,
  authorName: users.name,
  createdAt: reviewComments.createdAt,
};

function commentQuery(db: Executor) {
  return db
    .select(commentColumns)
    .from(reviewComments)
    .innerJoin(procedures, eq(procedures.id, reviewComments.procedureId))
    .innerJoin(analytes, eq(analytes.id, procedures.analyteId))
    .innerJoin(controlLots, eq(controlLots.id, reviewComments.controlLotId))
    .innerJoin(users, eq(users.id, reviewComments.authorId));
}

export type CommentRow = Awaited<ReturnType<typeof listComments>>[number];

/** The lab's comments (of one period, or all), oldest first. */
export async function listComments(db: Executor, labId: string, period?: string) {
  return commentQuery(db)
    .where(and(eq(reviewComments.labId, labId), period ? eq(reviewComments.period, period) : undefined))
    .orderBy(asc(reviewComments.period), asc(reviewComments.createdAt), asc(reviewComments.id));
}

export async function findComment(db: Executor, labId: string, commentId: string) {
  const [row] = await commentQuery(db)
    .where(and(eq(reviewComments.labId, labId), eq(reviewComments.id, commentId)))
    .limit(1);
  return row ?? null;
}

export async function insertComment(db: Executor, values: typeof reviewComments.$inferInsert) {
  const [row] = await db.insert(reviewComments).values(values).returning({ id: reviewComments.id });
  return row.id;
}

export async function updateCommentBody(db: Executor, commentId: string, body: string) {
  await db.update(reviewComments).set({ body }).where(eq(reviewComments.id, commentId));
}

export async function deleteComment(db: Executor, commentId: string) {
  await db.delete(reviewComments).where(eq(reviewComments.id, commentId));
}

/** A procedure of the lab (retired ones included: their past rows can still be commented). */
export async function findLabProcedure(db: Executor, labId: string, procedureId: string) {
  const [row] = await db
    .select({ id: procedures.id, code: procedures.code })
    .from(procedures)
    .where(and(eq(procedures.id, procedureId), eq(procedures.labId, labId)))
    .limit(1);
  return row ?? null;
}

export async function findControlLot(db: Executor, controlLotId: string) {
  const [row] = await db
    .select({ id: controlLots.id, lotNumber: controlLots.lotNumber, levels: controlLots.levels })
    .from(controlLots)
    .where(eq(controlLots.id, controlLotId))
    .limit(1);
  return row ?? null;
}

const signoffColumns = {
  labId: periodSignoffs.labId,
  period: periodSignoffs.period,
  statement: periodSignoffs.statement,
  signedAt: periodSignoffs.signedAt,
  signerId: users.id,
  signerName: users.name,
};

export type SignoffRow = Awaited<ReturnType<typeof listSignoffs>>[number];

export async function listSignoffs(db: Executor, labId: string) {
  return db
    .select(signoffColumns)
    .from(periodSignoffs)
    .innerJoin(users, eq(users.id, periodSignoffs.signedBy))
    .where(eq(periodSignoffs.labId, labId))
    .orderBy(desc(periodSignoffs.period));
}

export async function findSignoffWithSigner(db: Executor, labId: string, period: string) {
  const [row] = await db
    .select(signoffColumns)
    .from(periodSignoffs)
    .innerJoin(users, eq(users.id, periodSignoffs.signedBy))
    .where(and(eq(periodSignoffs.labId, labId), eq(periodSignoffs.period, period)))
    .limit(1);
  return row ?? null;
}

/** Inserts the sign-off unless one exists (the unique (lab, period) constraint settles a race); false when it existed. */
export async function insertSignoff(
  db: Executor,
  values: typeof periodSignoffs.$inferInsert,
): Promise<boolean> {
  const rows = await db
    .insert(periodSignoffs)
    .values(values)
    .onConflictDoNothing()
    .returning({ id: periodSignoffs.id });
  return rows.length === 1;
}
