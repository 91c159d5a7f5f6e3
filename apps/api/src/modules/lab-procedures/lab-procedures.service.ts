import { recordAudit, type Database, type Executor } from '@plumbline/db';
import type { FieldError, ProcedureCreate, ProcedureUpdate, TestMenuItem } from '@plumbline/contracts';
import type { Principal } from '../../auth/principal.ts';
import { actorOf } from '../../auth/principal.ts';
import { AppError, badRequest, conflict, forbidden, notFound } from '../../errors/app-error.ts';
import { ucumConversion } from '../../units/convert.ts';
import { UUID, visibleLab } from '../lab-review/lab-scope.ts';
import { uniqueViolation } from '../catalogue-admin/unique-violation.ts';
import * as repo from './lab-procedures.repository.ts';

export function toMenuItem(row: repo.MenuRow): TestMenuItem {
  return {
    id: row.id,
    code: row.code,
    analyte: row.analyte,
    instrumentModel: row.instrumentModel,
    method: row.method,
    reagent: row.reagent,
    unit: row.unit,
    createdAt: row.createdAt.toISOString(),
    retiredAt: row.retiredAt?.toISOString() ?? null,
  };
}

function invalidFields(errors: FieldError[]): AppError {
  return badRequest(`Invalid body: ${errors.map((e) => `${e.path}: ${e.message}`).join('; ')}`, errors);
}

/** The supervisor of the lab (or the coordinator); an analyst gets 403, another lab's supervisor 404. */
async function managedLab(db: Database, principal: Principal, labId: string) {
  const lab = await visibleLab(db, principal, labId);
  if (principal.role !== 'supervisor' && principal.role !== 'coordinator') {
    throw forbidden('Only the lab’s supervisor can change its test menu.');
  }
  return lab;
}

async function codeIsFree(db: Executor, labId: string, code: string, exceptId?: string) {
  const taken = await repo.findCodeTaken(db, labId, code, exceptId);
  if (taken)
    throw conflict(
      `The lab already has a procedure with the code "${taken.code}" (codes are compared without regard to case).`,
    );
}

/** Why the unit cannot be used for the analyte, or null (UCUM; mass ↔ substance needs the molar mass). */
function unitProblem(
  unit: string,
  analyte: { unit: string; molarMass: number | null; name: string },
): string | null {
  if (ucumConversion(unit, analyte.unit, analyte.molarMass)) return null;
  return (
    `"${unit}" cannot be converted to ${analyte.name}'s unit ${analyte.unit} with UCUM` +
    (analyte.molarMass
      ? ''
      : ' (the catalogue holds no molar mass for it, so mass ↔ substance units cannot be converted)')
  );
}

async function writeOrConflict<T>(db: Database, work: (tx: Executor) => Promise<T>): Promise<T> {
  try {
    return await db.transaction(work);
  } catch (err) {
    if (uniqueViolation(err) !== null) throw conflict('The lab already has a procedure with this code.');
    throw err;
  }
}

export async function testMenu(db: Database, principal: Principal, labId: string): Promise<TestMenuItem[]> {
  await visibleLab(db, principal, labId);
  return (await repo.listMenu(db, labId)).map(toMenuItem);
}

export async function registerProcedure(
  db: Database,
  principal: Principal,
  labId: string,
  input: ProcedureCreate,
): Promise<TestMenuItem> {
  await managedLab(db, principal, labId);
  const errors: FieldError[] = [];
  const analyte = await repo.findAnalyte(db, input.analyteId);
  if (!analyte) errors.push({ path: 'analyteId', message: 'no such analyte in the catalogue' });
  else if (analyte.retiredAt)
    errors.push({ path: 'analyteId', message: `${analyte.name} is retired from the catalogue` });
  for (const [field, list] of [
    ['instrumentModelId', 'instrumentModel'],
    ['methodId', 'method'],
    ['reagentId', 'reagent'],
  ] as const) {
    const entry = await repo.findCatalogueEntry(db, list, input[field]);
    if (!entry) errors.push({ path: field, message: 'no such entry in the catalogue' });
    else if (entry.retiredAt)
      errors.push({ path: field, message: `${entry.name} is retired from the catalogue` });
  }
  if (analyte) {
    const problem = unitProblem(input.unit, analyte);
    if (problem) errors.push({ path: 'unit', message: problem });
  }
  if (errors.length) throw invalidFields(errors);
  await codeIsFree(db, labId, input.code);

  const id = await writeOrConflict(db, async (tx) => {
    const created = await repo.insertProcedure(tx, {
      labId,
      code: input.code,
      analyteId: input.analyteId,
      instrumentModelId: input.instrumentModelId,
      methodId: input.methodId,
      reagentId: input.reagentId,
      unit: input.unit,
    });
    await recordAudit(tx, {
      kind: 'procedure.created',
      ...actorOf(principal),
      labId,
      entity: 'procedure',
      entityId: created,
      details: {
        code: input.code,
        analyteId: input.analyteId,
        instrumentModelId: input.instrumentModelId,
        methodId: input.methodId,
        reagentId: input.reagentId,
        unit: input.unit,
        ...(input.reason ? { reason: input.reason } : {}),
      },
    });
    return created;
  });
  return toMenuItem((await repo.findMenuItem(db, labId, id))!);
}

async function existingProcedure(db: Database, labId: string, procedureId: string) {
  const row = UUID.test(procedureId) ? await repo.findMenuItem(db, labId, procedureId) : null;
  if (!row) throw notFound('Procedure');
  return row;
}

export async function editProcedure(
  db: Database,
  principal: Principal,
  labId: string,
  procedureId: string,
  input: ProcedureUpdate,
): Promise<TestMenuItem> {
  await managedLab(db, principal, labId);
  const existing = await existingProcedure(db, labId, procedureId);
  const changes: Record<string, { from: string; to: string }> = {};
  if (input.code !== undefined && input.code !== existing.code) {
    await codeIsFree(db, labId, input.code, procedureId);
    changes.code = { from: existing.code, to: input.code };
  }
  if (input.unit !== undefined && input.unit !== existing.unit) {
    const analyte = (await repo.findAnalyte(db, existing.analyte.id))!;
    const problem = unitProblem(input.unit, analyte);
    if (problem) throw invalidFields([{ path: 'unit', message: problem }]);
    changes.unit = { from: existing.unit, to: input.unit };
  }
  if (Object.keys(changes).length === 0) return toMenuItem(existing);
  await writeOrConflict(db, async (tx) => {
    await repo.updateProcedure(tx, procedureId, {
      ...(changes.code ? { code: changes.code.to } : {}),
      ...(changes.unit ? { unit: changes.unit.to } : {}),
    });
    await recordAudit(tx, {
      kind: 'procedure.updated',
      ...actorOf(principal),
      labId,
      entity: 'procedure',
      entityId: procedureId,
      details: { changes, ...(input.reason ? { reason: input.reason } : {}) },
    });
  });
  return toMenuItem((await repo.findMenuItem(db, labId, procedureId))!);
}

/** Retires (no new data; history and reports stay) or restores a procedure. */
export async function setProcedureRetired(
  db: Database,
  principal: Principal,
  labId: string,
  procedureId: string,
  retire: boolean,
  reason: string | undefined,
): Promise<TestMenuItem> {
  await managedLab(db, principal, labId);
  const existing = await existingProcedure(db, labId, procedureId);
  if (retire && existing.retiredAt) throw conflict(`Procedure ${existing.code} is already retired.`);
  if (!retire && !existing.retiredAt) throw conflict(`Procedure ${existing.code} is not retired.`);
  await db.transaction(async (tx) => {
    await repo.updateProcedure(tx, procedureId, { retiredAt: retire ? new Date() : null });
    await recordAudit(tx, {
      kind: retire ? 'procedure.retired' : 'procedure.restored',
      ...actorOf(principal),
      labId,
      entity: 'procedure',
      entityId: procedureId,
      details: { code: existing.code, ...(reason ? { reason } : {}) },
    });
  });
  return toMenuItem((await repo.findMenuItem(db, labId, procedureId))!);
}
