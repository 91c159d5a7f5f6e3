import { sql } from 'drizzle-orm';
import { recordAudit, type Database, type Executor } from '@plumbline/db';
import type { Comment, CommentCreate, PeriodSignoff, Signoff, SignoffCreate } from '@plumbline/contracts';
import type { Principal } from '../../auth/principal.ts';
import { actorOf } from '../../auth/principal.ts';
import { conflict, forbidden, notFound, validationFailed } from '../../errors/app-error.ts';
import { UUID, existingPeriod, findSignoff, labMember, visibleLab } from './lab-scope.ts';
import * as repo from './lab-review.repository.ts';

export function toComment(row: repo.CommentRow): Comment {
  return {
    id: row.id,
    labId: row.labId,
    period: row.period,
    procedure: { id: row.procedureId, code: row.procedureCode },
    analyte: { code: row.analyteCode, name: row.analyteName },
    controlLot: { id: row.controlLotId, lotNumber: row.lotNumber },
    level: row.level,
    body: row.body,
    author: { id: row.authorId, name: row.authorName },
    createdAt: row.createdAt.toISOString(),
  };
}

export function toSignoff(row: repo.SignoffRow): Signoff {
  return {
    labId: row.labId,
    period: row.period,
    statement: row.statement,
    signedBy: { id: row.signerId, name: row.signerName },
    signedAt: row.signedAt.toISOString(),
  };
}

/**
 * Serialises the sign-off of a lab's period with edits of that period's comments, so an edit cannot slip
 * in between "is it signed?" and the sign-off being written.
 */
async function lockLabPeriod(tx: Executor, labId: string, period: string) {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`signoff:${labId}:${period}`}))`);
}

export async function listComments(
  db: Database,
  principal: Principal,
  labId: string,
  period?: string,
): Promise<Comment[]> {
  await visibleLab(db, principal, labId);
  return (await repo.listComments(db, labId, period)).map(toComment);
}

/** A corrective-action comment on a report row; allowed after sign-off too (new comments only). */
export async function addComment(
  db: Database,
  principal: Principal,
  labId: string,
  input: CommentCreate,
): Promise<Comment> {
  const member = labMember(principal, labId);
  await visibleLab(db, principal, labId);
  await existingPeriod(db, input.period);
  const procedure = await repo.findLabProcedure(db, labId, input.procedureId);
  if (!procedure) throw notFound('Procedure');
  const lot = await repo.findControlLot(db, input.controlLotId);
  if (!lot) throw notFound('Control lot');
  if (!lot.levels.includes(input.level)) {
    throw validationFailed(
      `Control lot ${lot.lotNumber} has no level ${input.level} (its levels: ${lot.levels.join(', ')}).`,
      [{ path: 'level', message: `not a level of lot ${lot.lotNumber}` }],
    );
  }
  const id = await db.transaction(async (tx) => {
    const created = await repo.insertComment(tx, {
      labId,
      period: input.period,
      procedureId: input.procedureId,
      controlLotId: input.controlLotId,
      level: input.level,
      body: input.body,
      authorId: member.userId,
    });
    await recordAudit(tx, {
      kind: 'review-comment.created',
      ...actorOf(principal),
      labId,
      entity: 'review-comment',
      entityId: created,
      details: {
        period: input.period,
        procedure: procedure.code,
        lot: lot.lotNumber,
        level: input.level,
        body: input.body,
      },
    });
    return created;
  });
  return toComment((await repo.findComment(db, labId, id))!);
}

/** The comment a member may change: its author, or the lab's supervisor. */
async function changeableComment(db: Database, principal: Principal, labId: string, commentId: string) {
  const member = labMember(principal, labId);
  await visibleLab(db, principal, labId);
  const comment = UUID.test(commentId) ? await repo.findComment(db, labId, commentId) : null;
  if (!comment) throw notFound('Comment');
  if (comment.authorId !== member.userId && member.role !== 'supervisor') {
    throw forbidden('Only the author of a comment or the lab’s supervisor can change it.');
  }
  return comment;
}

function signedConflict(period: string) {
  return conflict(
    `Period ${period} is signed off: its comments can no longer be edited or deleted (new comments are still welcome).`,
  );
}

export async function editComment(
  db: Database,
  principal: Principal,
  labId: string,
  commentId: string,
  body: string,
): Promise<Comment> {
  const comment = await changeableComment(db, principal, labId, commentId);
  await db.transaction(async (tx) => {
    await lockLabPeriod(tx, labId, comment.period);
    if (await findSignoff(tx, labId, comment.period)) throw signedConflict(comment.period);
    await repo.updateCommentBody(tx, commentId, body);
    await recordAudit(tx, {
      kind: 'review-comment.edited',
      ...actorOf(principal),
      labId,
      entity: 'review-comment',
      entityId: commentId,
      details: { period: comment.period, changes: { body: { from: comment.body, to: body } } },
    });
  });
  return toComment((await repo.findComment(db, labId, commentId))!);
}

export async function removeComment(
  db: Database,
  principal: Principal,
  labId: string,
  commentId: string,
): Promise<void> {
  const comment = await changeableComment(db, principal, labId, commentId);
  await db.transaction(async (tx) => {
    await lockLabPeriod(tx, labId, comment.period);
    if (await findSignoff(tx, labId, comment.period)) throw signedConflict(comment.period);
    await repo.deleteComment(tx, commentId);
    await recordAudit(tx, {
      kind: 'review-comment.deleted',
      ...actorOf(principal),
      labId,
      entity: 'review-comment',
      entityId: commentId,
      details: {
        period: comment.period,
        procedure: comment.procedureCode,
        level: comment.level,
        body: comment.body,
      },
    });
  });
}

export async function listSignoffs(db: Database, principal: Principal, labId: string): Promise<Signoff[]> {
  await visibleLab(db, principal, labId);
  return (await repo.listSignoffs(db, labId)).map(toSignoff);
}

export async function getPeriodSignoff(
  db: Database,
  principal: Principal,
  labId: string,
  period: string,
): Promise<PeriodSignoff> {
  await visibleLab(db, principal, labId);
  await existingPeriod(db, period);
  const row = await repo.findSignoffWithSigner(db, labId, period);
  return { period, signoff: row ? toSignoff(row) : null };
}

/** The supervisor signs the lab's review of a period (who, when, a statement); once only. */
export async function signPeriod(
  db: Database,
  principal: Principal,
  labId: string,
  input: SignoffCreate,
): Promise<Signoff> {
  const member = labMember(principal, labId);
  if (member.role !== 'supervisor') throw forbidden('Only the lab’s supervisor can sign a period off.');
  await visibleLab(db, principal, labId);
  await existingPeriod(db, input.period);
  const signed = await db.transaction(async (tx) => {
    await lockLabPeriod(tx, labId, input.period);
    const inserted = await repo.insertSignoff(tx, {
      labId,
      period: input.period,
      signedBy: member.userId,
      statement: input.statement,
    });
    if (!inserted) return false;
    await recordAudit(tx, {
      kind: 'period.signed-off',
      ...actorOf(principal),
      labId,
      entity: 'period-signoff',
      entityId: input.period,
      details: { period: input.period, statement: input.statement },
    });
    return true;
  });
  const row = await repo.findSignoffWithSigner(db, labId, input.period);
  if (!signed) {
    throw conflict(
      `Period ${input.period} was already signed off by ${row?.signerName ?? 'a supervisor'} on ${row?.signedAt.toISOString().slice(0, 10) ?? 'an earlier date'}.`,
    );
  }
  return toSignoff(row!);
}
