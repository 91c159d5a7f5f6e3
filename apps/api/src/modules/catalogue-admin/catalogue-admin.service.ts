import { recordAudit, type Database, type Executor } from '@plumbline/db';
import {
  catalogueListQuerySchema,
  catalogueSortColumns,
  catalogueStateChangeSchema,
  controlLotCreateSchema,
  controlLotUpdateSchema,
  type CatalogueList,
  type CataloguePage,
  type ControlLotItem,
  type FieldError,
} from '@plumbline/contracts';
import { actorOf, type Principal } from '../../auth/principal.ts';
import { AppError, badRequest, conflict, notFound } from '../../errors/app-error.ts';
import { parseInput } from '../../http/validate.ts';
import {
  simpleItem,
  simpleListSpecs,
  type CatalogueRecord,
  type SimpleList,
  type SimpleListSpec,
} from './catalogue-lists.ts';
import {
  analyteHasProcedures,
  findLotRow,
  findMaterial,
  findSimpleRow,
  insertLot,
  insertSimpleRow,
  levelsWithData,
  listLotRows,
  listSimpleRows,
  setLotState,
  updateLot,
  updateSimpleRow,
  type LotRow,
  type LotValues,
} from './catalogue-admin.repository.ts';
import { uniqueViolation } from './unique-violation.ts';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export const isSimpleList = (list: CatalogueList): list is SimpleList => list !== 'control-lots';

/** Extra checks failed: the same 400 shape as a contract failure. */
export function invalidFields(errors: FieldError[]): AppError {
  return badRequest(`Invalid body: ${errors.map((e) => `${e.path}: ${e.message}`).join('; ')}`, errors);
}

/** Runs a write in a transaction; a broken unique constraint becomes 409 with the caller's message. */
export async function writeOrConflict<T>(
  db: Database,
  conflictMessage: string,
  work: (tx: Executor) => Promise<T>,
): Promise<T> {
  try {
    return await db.transaction(work);
  } catch (err) {
    if (uniqueViolation(err) !== null) throw conflict(conflictMessage);
    throw err;
  }
}

/** Only the fields a request actually gave (undefined means "leave alone"). */
function givenFields(spec: { fields: readonly string[] }, input: CatalogueRecord): CatalogueRecord {
  const values: CatalogueRecord = {};
  for (const field of spec.fields) if (input[field] !== undefined) values[field] = input[field];
  return values;
}

/** Field-by-field differences between a stored record and the values a request gives. */
export function changesBetween(
  existing: CatalogueRecord,
  values: CatalogueRecord,
): Record<string, { from: unknown; to: unknown }> {
  const changes: Record<string, { from: unknown; to: unknown }> = {};
  for (const [field, to] of Object.entries(values)) {
    const from = existing[field] ?? null;
    if (JSON.stringify(from) !== JSON.stringify(to ?? null)) changes[field] = { from, to: to ?? null };
  }
  return changes;
}

const todayIso = () => new Date().toISOString().slice(0, 10);

export function lotItem(row: LotRow): ControlLotItem {
  return {
    id: row.id,
    material: row.material,
    lotNumber: row.lotNumber,
    expiresOn: row.expiresOn,
    expired: row.expiresOn < todayIso(),
    state: row.state === 'retired' ? 'retired' : 'active',
    levels: row.levels,
    retired: row.state === 'retired',
  };
}

// ---------- reading ----------

export async function listCatalogue(
  db: Database,
  list: CatalogueList,
  rawQuery: unknown,
): Promise<CataloguePage<unknown>> {
  const query = parseInput(catalogueListQuerySchema, rawQuery, 'query');
  const allowed: readonly string[] = catalogueSortColumns[list];
  const sort = query.sort ?? allowed[0];
  if (!allowed.includes(sort)) {
    throw badRequest(`Invalid query: sort: use one of ${allowed.join(', ')}`, [
      { path: 'sort', message: `use one of ${allowed.join(', ')}` },
    ]);
  }
  if (!isSimpleList(list)) {
    const { total, rows } = await listLotRows(db, { ...query, sort });
    return { total, items: rows.map(lotItem) };
  }
  const spec = simpleListSpecs[list];
  const { total, rows } = await listSimpleRows(db, spec, { ...query, sort });
  return { total, items: rows.map((row) => simpleItem(spec, row)) };
}

// ---------- analytes, methods, instrument models, reagents, control materials ----------

async function loadSimple(db: Executor, spec: SimpleListSpec, id: string): Promise<CatalogueRecord> {
  const row = UUID.test(id) ? await findSimpleRow(db, spec, id) : null;
  if (!row) throw notFound(spec.article.replace(/^An? /, '').replace(/^./, (c) => c.toUpperCase()));
  return row;
}

const duplicateCodeMessage = (spec: SimpleListSpec, code: unknown) =>
  `${spec.article} with the code "${String(code)}" already exists; codes must be unique.`;

/** The values a new entry gets, checked; throws 400 with field errors. */
export function newSimpleValues(
  spec: SimpleListSpec,
  input: CatalogueRecord,
): { values: CatalogueRecord; errors: FieldError[] } {
  const values = { ...spec.defaults, ...givenFields(spec, input) };
  return { values, errors: spec.check?.(values, 'all') ?? [] };
}

/** What an edit changes, checked against the whole edited record. */
export async function editedSimpleValues(
  db: Executor,
  spec: SimpleListSpec,
  existing: CatalogueRecord,
  input: CatalogueRecord,
): Promise<{
  values: CatalogueRecord;
  changes: Record<string, { from: unknown; to: unknown }>;
  errors: FieldError[];
  unitLocked: boolean;
}> {
  const changes = changesBetween(existing, givenFields(spec, input));
  const values = Object.fromEntries(Object.entries(changes).map(([field, c]) => [field, c.to]));
  const errors = spec.check?.({ ...existing, ...values }, Object.keys(changes)) ?? [];
  // Values are stored in the canonical unit, so it is fixed once procedures use the analyte.
  const unitLocked =
    spec.list === 'analytes' && 'unit' in changes && (await analyteHasProcedures(db, existing.id as string));
  return { values, changes, errors, unitLocked };
}

export const UNIT_LOCKED_MESSAGE =
  'measurement procedures already use this analyte and its values are stored in its canonical unit, so the unit cannot change';

async function createSimple(db: Database, principal: Principal, spec: SimpleListSpec, body: unknown) {
  const { reason, ...input } = parseInput(spec.createSchema, body) as CatalogueRecord;
  const { values, errors } = newSimpleValues(spec, input);
  if (errors.length) throw invalidFields(errors);
  const row = await writeOrConflict(db, duplicateCodeMessage(spec, values.code), async (tx) => {
    const created = await insertSimpleRow(tx, spec, values);
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: `catalogue.${spec.entity}.create`,
      entity: spec.entity,
      entityId: created.id as string,
      details: { values, reason: reason ?? null },
    });
    return created;
  });
  return simpleItem(spec, row);
}

async function updateSimple(
  db: Database,
  principal: Principal,
  spec: SimpleListSpec,
  id: string,
  body: unknown,
) {
  const { reason, ...input } = parseInput(spec.updateSchema, body) as CatalogueRecord;
  const existing = await loadSimple(db, spec, id);
  const { values, changes, errors, unitLocked } = await editedSimpleValues(db, spec, existing, input);
  if (errors.length) throw invalidFields(errors);
  if (unitLocked) {
    throw conflict(`The unit of analyte "${String(existing.code)}" cannot change: ${UNIT_LOCKED_MESSAGE}.`, [
      { path: 'unit', message: UNIT_LOCKED_MESSAGE },
    ]);
  }
  if (Object.keys(changes).length === 0) return simpleItem(spec, existing);
  const row = await writeOrConflict(db, duplicateCodeMessage(spec, values.code), async (tx) => {
    const updated = await updateSimpleRow(tx, spec, id, values);
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: `catalogue.${spec.entity}.update`,
      entity: spec.entity,
      entityId: id,
      details: { code: updated.code, changes, reason: reason ?? null },
    });
    return updated;
  });
  return simpleItem(spec, row);
}

async function setSimpleRetired(
  db: Database,
  principal: Principal,
  spec: SimpleListSpec,
  id: string,
  body: unknown,
  retire: boolean,
) {
  const { reason } = parseInput(catalogueStateChangeSchema, body ?? {});
  const existing = await loadSimple(db, spec, id);
  const isRetired = existing.retiredAt !== null;
  if (retire && isRetired) throw conflict(`${spec.article} "${String(existing.code)}" is already retired.`);
  if (!retire && !isRetired) throw conflict(`${spec.article} "${String(existing.code)}" is not retired.`);
  const row = await db.transaction(async (tx) => {
    const updated = await updateSimpleRow(tx, spec, id, { retiredAt: retire ? new Date() : null });
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: `catalogue.${spec.entity}.${retire ? 'retire' : 'restore'}`,
      entity: spec.entity,
      entityId: id,
      details: { code: existing.code, reason: reason ?? null },
    });
    return updated;
  });
  return simpleItem(spec, row);
}

// ---------- control lots ----------

async function loadLot(db: Executor, id: string): Promise<LotRow> {
  const row = UUID.test(id) ? await findLotRow(db, id) : null;
  if (!row) throw notFound('Control lot');
  return row;
}

const duplicateLotMessage = (lotNumber: string) =>
  `A control lot with the number "${lotNumber}" already exists; lot numbers must be unique.`;

/** The lot's material must exist and, for a lot being created or moved, must not be retired. */
export async function materialProblem(db: Executor, materialId: string): Promise<string | null> {
  const material = await findMaterial(db, materialId);
  if (!material) return 'no control material has this id';
  if (material.retiredAt) return `the control material "${material.code}" is retired`;
  return null;
}

/** Levels an edit would drop although data already refers to them. */
export async function droppedLevelsWithData(
  db: Executor,
  existing: LotRow,
  levels: LotValues['levels'],
): Promise<number[]> {
  const kept = new Set(levels.map((l) => l.level));
  const dropped = existing.levels.map((l) => l.level).filter((level) => !kept.has(level));
  return levelsWithData(db, existing.id, dropped);
}

export function normaliseLevels(
  levels: Array<{ level: number; description?: string | null }>,
): LotValues['levels'] {
  return [...levels]
    .sort((a, b) => a.level - b.level)
    .map((l) => ({ level: l.level, description: l.description ?? null }));
}

async function createLot(db: Database, principal: Principal, body: unknown): Promise<ControlLotItem> {
  const { reason, ...input } = parseInput(controlLotCreateSchema, body);
  const problem = await materialProblem(db, input.materialId);
  if (problem) throw invalidFields([{ path: 'materialId', message: problem }]);
  const values: LotValues = { ...input, levels: normaliseLevels(input.levels) };
  const id = await writeOrConflict(db, duplicateLotMessage(values.lotNumber), async (tx) => {
    const lotId = await insertLot(tx, values);
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: 'catalogue.control-lot.create',
      entity: 'control-lot',
      entityId: lotId,
      details: { values, reason: reason ?? null },
    });
    return lotId;
  });
  return lotItem(await loadLot(db, id));
}

function lotValuesOf(row: LotRow): LotValues {
  return {
    materialId: row.material.id,
    lotNumber: row.lotNumber,
    expiresOn: row.expiresOn,
    levels: row.levels,
  };
}

async function updateLotEntry(
  db: Database,
  principal: Principal,
  id: string,
  body: unknown,
): Promise<ControlLotItem> {
  const { reason, ...input } = parseInput(controlLotUpdateSchema, body);
  const existing = await loadLot(db, id);
  const current = lotValuesOf(existing);
  const next: LotValues = {
    materialId: input.materialId ?? current.materialId,
    lotNumber: input.lotNumber ?? current.lotNumber,
    expiresOn: input.expiresOn ?? current.expiresOn,
    levels: input.levels ? normaliseLevels(input.levels) : current.levels,
  };
  const changes = changesBetween(current, next);
  if (Object.keys(changes).length === 0) return lotItem(existing);
  if (changes.materialId) {
    const problem = await materialProblem(db, next.materialId);
    if (problem) throw invalidFields([{ path: 'materialId', message: problem }]);
  }
  const dropped = await droppedLevelsWithData(db, existing, next.levels);
  if (dropped.length) {
    throw conflict(
      `Levels ${dropped.join(', ')} of lot "${existing.lotNumber}" already have QC data and cannot be removed.`,
      [{ path: 'levels', message: `levels with data: ${dropped.join(', ')}` }],
    );
  }
  await writeOrConflict(db, duplicateLotMessage(next.lotNumber), async (tx) => {
    await updateLot(tx, id, next);
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: 'catalogue.control-lot.update',
      entity: 'control-lot',
      entityId: id,
      details: { lotNumber: next.lotNumber, changes, reason: reason ?? null },
    });
  });
  return lotItem(await loadLot(db, id));
}

async function setLotRetired(db: Database, principal: Principal, id: string, body: unknown, retire: boolean) {
  const { reason } = parseInput(catalogueStateChangeSchema, body ?? {});
  const existing = await loadLot(db, id);
  const isRetired = existing.state === 'retired';
  if (retire && isRetired) throw conflict(`The control lot "${existing.lotNumber}" is already retired.`);
  if (!retire && !isRetired) throw conflict(`The control lot "${existing.lotNumber}" is not retired.`);
  await db.transaction(async (tx) => {
    await setLotState(tx, id, retire ? 'retired' : 'active');
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: `catalogue.control-lot.${retire ? 'retire' : 'restore'}`,
      entity: 'control-lot',
      entityId: id,
      details: { lotNumber: existing.lotNumber, reason: reason ?? null },
    });
  });
  return lotItem(await loadLot(db, id));
}

// ---------- one entry point per verb ----------

export function createCatalogueEntry(db: Database, principal: Principal, list: CatalogueList, body: unknown) {
  return isSimpleList(list)
    ? createSimple(db, principal, simpleListSpecs[list], body)
    : createLot(db, principal, body);
}

export function updateCatalogueEntry(
  db: Database,
  principal: Principal,
  list: CatalogueList,
  id: string,
  body: unknown,
) {
  return isSimpleList(list)
    ? updateSimple(db, principal, simpleListSpecs[list], id, body)
    : updateLotEntry(db, principal, id, body);
}

export function setCatalogueEntryRetired(
  db: Database,
  principal: Principal,
  list: CatalogueList,
  id: string,
  body: unknown,
  retire: boolean,
) {
  return isSimpleList(list)
    ? setSimpleRetired(db, principal, simpleListSpecs[list], id, body, retire)
    : setLotRetired(db, principal, id, body, retire);
}
