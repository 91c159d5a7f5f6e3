import { recordAudit, type Database } from '@plumbline/db';
import {
  participationQuerySchema,
  periodCloseSchema,
  periodCreateSchema,
  periodKeySchema,
  periodReopenSchema,
  periodUpdateSchema,
  type ParticipationBoard,
  type ParticipationLab,
  type ParticipationQuery,
  type PeriodDetail,
} from '@plumbline/contracts';
import { actorOf, type Principal } from '../../auth/principal.ts';
import { badRequest, conflict, notFound } from '../../errors/app-error.ts';
import { parseInput } from '../../http/validate.ts';
import { writeOrConflict } from '../catalogue-admin/catalogue-admin.service.ts';
import {
  findPeriod,
  insertPeriod,
  participationLabs,
  participationProcedures,
  submittedProcedures,
  transitionPeriod,
  updatePeriod,
  type PeriodRow,
} from './cycles.repository.ts';
import { participationFlags } from './participation-flags.ts';

export function periodDetail(row: PeriodRow): PeriodDetail {
  return {
    period: row.period,
    state: row.state,
    deadline: row.deadline.toISOString(),
    closedAt: row.closedAt?.toISOString() ?? null,
    publishedAt: row.publishedAt?.toISOString() ?? null,
  };
}

function periodKeyOf(raw: string): string {
  return parseInput(periodKeySchema, raw, 'period');
}

async function loadPeriod(db: Database, raw: string): Promise<PeriodRow> {
  const key = periodKeyOf(raw);
  const row = await findPeriod(db, key);
  if (!row) throw notFound(`Period ${key}`);
  return row;
}

/** A month's data is complete only once the month is over, so its deadline must come after that. */
function assertDeadlineAfterPeriod(period: string, deadline: Date) {
  const [year, month] = period.split('-').map(Number);
  const periodEnd = new Date(Date.UTC(year, month, 1)); // first instant of the next month, UTC
  if (deadline.getTime() <= periodEnd.getTime()) {
    throw badRequest(`Invalid body: deadline: must fall after ${period} has ended`, [
      {
        path: 'deadline',
        message: `must fall after the period has ended (after ${periodEnd.toISOString()})`,
      },
    ]);
  }
}

export async function createPeriod(db: Database, principal: Principal, body: unknown): Promise<PeriodDetail> {
  const { period, deadline, reason } = parseInput(periodCreateSchema, body);
  const deadlineAt = new Date(deadline);
  assertDeadlineAfterPeriod(period, deadlineAt);
  const row = await writeOrConflict(db, `The period ${period} already exists.`, async (tx) => {
    const created = await insertPeriod(tx, { period, deadline: deadlineAt });
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: 'period.create',
      entity: 'period',
      entityId: period,
      details: { deadline: deadlineAt.toISOString(), reason: reason ?? null },
    });
    return created;
  });
  return periodDetail(row);
}

export async function changeDeadline(
  db: Database,
  principal: Principal,
  rawPeriod: string,
  body: unknown,
): Promise<PeriodDetail> {
  const { deadline, reason } = parseInput(periodUpdateSchema, body);
  const existing = await loadPeriod(db, rawPeriod);
  if (existing.state === 'published') {
    throw conflict(`The period ${existing.period} is published; its deadline can no longer change.`);
  }
  const deadlineAt = new Date(deadline);
  assertDeadlineAfterPeriod(existing.period, deadlineAt);
  if (deadlineAt.getTime() === existing.deadline.getTime()) return periodDetail(existing);
  const row = await db.transaction(async (tx) => {
    const updated = await updatePeriod(tx, existing.period, { deadline: deadlineAt });
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: 'period.update',
      entity: 'period',
      entityId: existing.period,
      details: {
        changes: { deadline: { from: existing.deadline.toISOString(), to: deadlineAt.toISOString() } },
        reason: reason ?? null,
      },
    });
    return updated;
  });
  return periodDetail(row);
}

const transitionRefusal: Record<'close' | 'reopen', Record<PeriodRow['state'], string>> = {
  close: {
    open: '',
    closed: 'is already closed',
    published: 'is published; a published period stays closed',
  },
  reopen: {
    open: 'is open already',
    closed: '',
    published: 'is published; a published period cannot be reopened',
  },
};

/** open → closed (later uploads are then marked late) and back; anything else is a 409. */
async function movePeriod(
  db: Database,
  principal: Principal,
  rawPeriod: string,
  action: 'close' | 'reopen',
  reason: string | null,
): Promise<PeriodDetail> {
  const existing = await loadPeriod(db, rawPeriod);
  const from: PeriodRow['state'] = action === 'close' ? 'open' : 'closed';
  const values =
    action === 'close'
      ? { state: 'closed' as const, closedAt: new Date() }
      : { state: 'open' as const, closedAt: null };
  const row = await db.transaction(async (tx) => {
    const moved = await transitionPeriod(tx, existing.period, from, values);
    if (!moved) return null;
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: `period.${action}`,
      entity: 'period',
      entityId: existing.period,
      details: { from, to: values.state, reason },
    });
    return moved;
  });
  if (!row) {
    const current = (await findPeriod(db, existing.period)) ?? existing;
    throw conflict(
      `The period ${existing.period} cannot be ${action === 'close' ? 'closed' : 'reopened'}: it ${transitionRefusal[action][current.state]}.`,
    );
  }
  return periodDetail(row);
}

export async function closePeriod(db: Database, principal: Principal, rawPeriod: string, body: unknown) {
  const { reason } = parseInput(periodCloseSchema, body ?? {});
  return movePeriod(db, principal, rawPeriod, 'close', reason ?? null);
}

export async function reopenPeriod(db: Database, principal: Principal, rawPeriod: string, body: unknown) {
  const { reason } = parseInput(periodReopenSchema, body ?? {});
  return movePeriod(db, principal, rawPeriod, 'reopen', reason);
}

// ---------- participation board ----------

const sortValue: Record<ParticipationQuery['sort'], (l: ParticipationLab) => string | number> = {
  code: (l) => l.lab.code,
  name: (l) => l.lab.name,
  registered: (l) => l.proceduresRegistered,
  submitted: (l) => l.proceduresWithData,
  missing: (l) => l.missing.length,
  late: (l) => l.lateCount,
  flags: (l) => l.flags.length,
};

export async function participationBoard(
  db: Database,
  rawPeriod: string,
  rawQuery: unknown,
): Promise<ParticipationBoard> {
  const query = parseInput(participationQuerySchema, rawQuery, 'query');
  const period = await loadPeriod(db, rawPeriod);
  const labRows = await participationLabs(db, period.period);
  const labIds = labRows.map((l) => l.id);
  const [procedureRows, submitted, flags] = await Promise.all([
    participationProcedures(db, period.period, labIds),
    submittedProcedures(db, period.period),
    participationFlags(db, period.period, labIds),
  ]);
  const submittedById = new Map(submitted.map((s) => [s.procedureId, s]));

  const labsOut: ParticipationLab[] = labRows.map((lab) => {
    const own = procedureRows.filter((p) => p.labId === lab.id);
    const withData = own.filter((p) => submittedById.has(p.id));
    const missing = own.filter((p) => !p.retired && !submittedById.has(p.id));
    const lateCount = withData.filter((p) => submittedById.get(p.id)?.late).length;
    return {
      lab,
      proceduresRegistered: own.length,
      proceduresWithData: withData.length,
      lateCount,
      status: withData.length === 0 ? 'none' : missing.length === 0 ? 'complete' : 'partial',
      missing: missing.map((p) => ({ procedureId: p.id, code: p.code, analyte: p.analyte })),
      flags: flags.get(lab.id) ?? [],
    };
  });

  const direction = query.order === 'desc' ? -1 : 1;
  const key = sortValue[query.sort];
  labsOut.sort((a, b) => {
    const x = key(a);
    const y = key(b);
    const compared =
      typeof x === 'number' && typeof y === 'number' ? x - y : String(x).localeCompare(String(y));
    return compared * direction || a.lab.code.localeCompare(b.lab.code);
  });

  return {
    period: periodDetail(period),
    totals: {
      labs: labsOut.length,
      complete: labsOut.filter((l) => l.status === 'complete').length,
      partial: labsOut.filter((l) => l.status === 'partial').length,
      none: labsOut.filter((l) => l.status === 'none').length,
      late: labsOut.filter((l) => l.lateCount > 0).length,
    },
    labs: labsOut,
  };
}
