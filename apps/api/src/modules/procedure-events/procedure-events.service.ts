import { parse } from 'csv-parse/sync';
import { recordAudit, type Database } from '@plumbline/db';
import {
  procedureEventCreateSchema,
  type FieldError,
  type ProcedureEvent,
  type ProcedureEventCreate,
  type ProcedureEventKind,
} from '@plumbline/contracts';
import type { Principal } from '../../auth/principal.ts';
import { actorOf } from '../../auth/principal.ts';
import { assertLabAccess } from '../../auth/authenticate.ts';
import { badRequest, forbidden, notFound } from '../../errors/app-error.ts';
import { UUID, visibleLab } from '../lab-review/lab-scope.ts';
import * as repo from './procedure-events.repository.ts';

/** Rows one CSV of events may hold (common practice: a middleware batch is a few events). */
export const MAX_EVENT_ROWS = 1000;

export function toEvent(row: repo.EventRow): ProcedureEvent {
  return {
    id: row.id,
    procedureId: row.procedureId,
    procedureCode: row.procedureCode,
    occurredOn: row.occurredOn,
    kind: row.kind as ProcedureEventKind,
    note: row.note,
    recordedBy: row.recordedByName ?? 'API token',
    createdAt: row.createdAt.toISOString(),
  };
}

/** Who may record: an analyst or supervisor of the lab, or the lab's API token (not the coordinator). */
function recorder(principal: Principal, labId: string) {
  assertLabAccess(principal, labId);
  if (principal.kind === 'user' && principal.role === 'coordinator') {
    throw forbidden('Only the lab’s analysts and supervisors record events of its procedures.');
  }
  return principal.kind === 'user'
    ? { recordedBy: principal.userId, recordedByLabel: null }
    : { recordedBy: null, recordedByLabel: `lab-token:${principal.tokenId}` };
}

async function existingProcedure(db: Database, labId: string, procedureId: string) {
  const row = UUID.test(procedureId) ? await repo.findProcedure(db, labId, procedureId) : null;
  if (!row) throw notFound('Procedure');
  return row;
}

export async function listProcedureEvents(
  db: Database,
  principal: Principal,
  labId: string,
  procedureId?: string,
): Promise<ProcedureEvent[]> {
  await visibleLab(db, principal, labId);
  if (procedureId !== undefined) await existingProcedure(db, labId, procedureId);
  return (await repo.listEvents(db, labId, { procedureId })).map(toEvent);
}

export async function recordProcedureEvent(
  db: Database,
  principal: Principal,
  labId: string,
  procedureId: string,
  input: ProcedureEventCreate,
): Promise<ProcedureEvent> {
  const who = recorder(principal, labId);
  await visibleLab(db, principal, labId);
  const procedure = await existingProcedure(db, labId, procedureId);
  const id = await db.transaction(async (tx) => {
    const created = await repo.insertEvent(tx, { labId, procedureId: procedure.id, ...input, ...who });
    await recordAudit(tx, {
      kind: 'procedure-event.recorded',
      ...actorOf(principal),
      labId,
      entity: 'procedure-event',
      entityId: created,
      details: { procedureId: procedure.id, occurredOn: input.occurredOn, kind: input.kind },
    });
    return created;
  });
  const [row] = (await repo.listEvents(db, labId, { procedureId: procedure.id })).filter((e) => e.id === id);
  return toEvent(row);
}

const CSV_COLUMNS = ['procedure', 'date', 'kind', 'note'] as const;

/**
 * Events from a CSV with the header `procedure,date,kind,note` (procedure = the lab's procedure code).
 * Every row is checked first; any problem refuses the whole file with each row, column and reason, so
 * nothing is half stored.
 */
export async function importProcedureEvents(
  db: Database,
  principal: Principal,
  labId: string,
  text: unknown,
): Promise<{ created: number }> {
  const who = recorder(principal, labId);
  await visibleLab(db, principal, labId);
  if (typeof text !== 'string' || text.trim() === '') {
    throw badRequest('Send the events as text/csv with the header procedure,date,kind,note.');
  }
  let records: string[][];
  try {
    records = parse(text.replace(/^\uFEFF/, ''), {
      relax_column_count: false,
      skip_empty_lines: true,
      trim: true,
    });
  } catch (err) {
    throw badRequest(`The CSV cannot be read: ${(err as Error).message}`);
  }
  const header = (records[0] ?? []).map((h) => h.toLowerCase());
  if (header.join(',') !== CSV_COLUMNS.join(',')) {
    throw badRequest(
      `Line 1: the header must be ${CSV_COLUMNS.join(',')}, got ${header.join(',').slice(0, 200)}`,
    );
  }
  const rows = records.slice(1);
  if (rows.length === 0) throw badRequest('The CSV holds no events after its header.');
  if (rows.length > MAX_EVENT_ROWS) {
    throw badRequest(`The CSV holds ${rows.length} events; at most ${MAX_EVENT_ROWS} are accepted at once.`);
  }
  const byCode = await repo.proceduresByCode(db, labId);
  const errors: FieldError[] = [];
  const valid: repo.NewEvent[] = [];
  rows.forEach((cells, i) => {
    const line = i + 2;
    const procedure = byCode.get(cells[0].toLowerCase());
    if (!procedure)
      errors.push({
        path: `line ${line}, procedure`,
        message: `no procedure of the lab has the code "${cells[0].slice(0, 40)}"`,
      });
    const parsed = procedureEventCreateSchema.safeParse({
      occurredOn: cells[1],
      kind: cells[2],
      note: cells[3],
    });
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const column =
          { occurredOn: 'date', kind: 'kind', note: 'note' }[String(issue.path[0])] ?? String(issue.path[0]);
        errors.push({ path: `line ${line}, ${column}`, message: issue.message });
      }
    }
    if (procedure && parsed.success) valid.push({ labId, procedureId: procedure.id, ...parsed.data, ...who });
  });
  if (errors.length > 0) {
    const shown = errors
      .slice(0, 20)
      .map((e) => `${e.path}: ${e.message}`)
      .join('; ');
    throw badRequest(`No event was stored; ${errors.length} problem(s): ${shown}`, errors.slice(0, 200));
  }
  await db.transaction(async (tx) => {
    for (const event of valid) {
      const id = await repo.insertEvent(tx, event);
      await recordAudit(tx, {
        kind: 'procedure-event.recorded',
        ...actorOf(principal),
        labId,
        entity: 'procedure-event',
        entityId: id,
        details: {
          procedureId: event.procedureId,
          occurredOn: event.occurredOn,
          kind: event.kind,
          via: 'csv',
        },
      });
    }
  });
  return { created: valid.length };
}
