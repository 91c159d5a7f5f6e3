import {
  and,
  asc,
  count,
  desc,
  eq,
  getTableColumns,
  ilike,
  inArray,
  isNotNull,
  isNull,
  or,
  type SQL,
} from 'drizzle-orm';
import type { AnyPgColumn } from 'drizzle-orm/pg-core';
import {
  controlLotLevels,
  controlLots,
  controlMaterials,
  procedures,
  qcSummaries,
  qcValues,
  type Executor,
} from '@plumbline/db';
import type { CatalogueListQuery } from '@plumbline/contracts';
import type { CatalogueRecord, SimpleListSpec, SimpleTable } from './catalogue-lists.ts';

/** `%text%` for ILIKE, with the pattern characters in the search text taken literally. */
export const containsPattern = (text: string) => `%${text.replace(/[\\%_]/g, '\\$&')}%`;

function columnsOf(table: SimpleTable): Record<string, AnyPgColumn> {
  return getTableColumns(table) as unknown as Record<string, AnyPgColumn>;
}

function stateFilter(retiredAt: AnyPgColumn, state: CatalogueListQuery['state']): SQL | undefined {
  if (state === 'active') return isNull(retiredAt);
  if (state === 'retired') return isNotNull(retiredAt);
  return undefined;
}

// ---------- analytes, methods, instrument models, reagents, control materials ----------

export async function listSimpleRows(
  db: Executor,
  spec: SimpleListSpec,
  query: CatalogueListQuery & { sort: string },
): Promise<{ total: number; rows: CatalogueRecord[] }> {
  const columns = columnsOf(spec.table);
  const conditions: Array<SQL | undefined> = [stateFilter(columns.retiredAt, query.state)];
  if (query.q) {
    const pattern = containsPattern(query.q);
    conditions.push(or(...spec.searchFields.map((field) => ilike(columns[field], pattern))));
  }
  const where = and(...conditions);
  const [{ total }] = await db.select({ total: count() }).from(spec.table).where(where);
  const direction = query.order === 'desc' ? desc : asc;
  const rows = await db
    .select()
    .from(spec.table)
    .where(where)
    .orderBy(direction(columns[query.sort]), asc(columns.id))
    .limit(query.limit)
    .offset(query.offset);
  return { total, rows: rows as CatalogueRecord[] };
}

export async function findSimpleRow(
  db: Executor,
  spec: SimpleListSpec,
  id: string,
): Promise<CatalogueRecord | null> {
  const columns = columnsOf(spec.table);
  const [row] = await db.select().from(spec.table).where(eq(columns.id, id)).limit(1);
  return (row as CatalogueRecord | undefined) ?? null;
}

export async function findSimpleRowsByCode(
  db: Executor,
  spec: SimpleListSpec,
  codes: string[],
): Promise<Map<string, CatalogueRecord>> {
  if (codes.length === 0) return new Map();
  const columns = columnsOf(spec.table);
  const rows = (await db.select().from(spec.table).where(inArray(columns.code, codes))) as CatalogueRecord[];
  return new Map(rows.map((row) => [row.code as string, row]));
}

export async function insertSimpleRow(
  db: Executor,
  spec: SimpleListSpec,
  values: CatalogueRecord,
): Promise<CatalogueRecord> {
  // The values were checked against the list's contract; the cast only bridges the union of tables.
  const [row] = await db
    .insert(spec.table)
    .values(values as typeof spec.table.$inferInsert)
    .returning();
  return row as CatalogueRecord;
}

export async function updateSimpleRow(
  db: Executor,
  spec: SimpleListSpec,
  id: string,
  values: CatalogueRecord,
): Promise<CatalogueRecord> {
  const columns = columnsOf(spec.table);
  const [row] = await db
    .update(spec.table)
    .set(values as Partial<typeof spec.table.$inferInsert>)
    .where(eq(columns.id, id))
    .returning();
  return row as CatalogueRecord;
}

/** Whether any lab's measurement procedure names this analyte (its canonical unit is then fixed). */
export async function analyteHasProcedures(db: Executor, analyteId: string): Promise<boolean> {
  const rows = await db
    .select({ id: procedures.id })
    .from(procedures)
    .where(eq(procedures.analyteId, analyteId))
    .limit(1);
  return rows.length > 0;
}

// ---------- control lots ----------

export type LotRow = {
  id: string;
  lotNumber: string;
  expiresOn: string;
  state: string;
  material: { id: string; code: string; name: string };
  levels: Array<{ level: number; description: string | null }>;
};

const lotSortColumns: Record<string, AnyPgColumn> = {
  lotNumber: controlLots.lotNumber,
  expiresOn: controlLots.expiresOn,
  material: controlMaterials.code,
  state: controlLots.state,
};

async function levelsOf(db: Executor, lotIds: string[]): Promise<Map<string, LotRow['levels']>> {
  const byLot = new Map<string, LotRow['levels']>();
  if (lotIds.length === 0) return byLot;
  const rows = await db
    .select()
    .from(controlLotLevels)
    .where(inArray(controlLotLevels.controlLotId, lotIds))
    .orderBy(asc(controlLotLevels.level));
  for (const row of rows) {
    const list = byLot.get(row.controlLotId) ?? [];
    list.push({ level: row.level, description: row.description });
    byLot.set(row.controlLotId, list);
  }
  return byLot;
}

const lotSelection = {
  id: controlLots.id,
  lotNumber: controlLots.lotNumber,
  expiresOn: controlLots.expiresOn,
  state: controlLots.state,
  levelNumbers: controlLots.levels,
  material: { id: controlMaterials.id, code: controlMaterials.code, name: controlMaterials.name },
};

async function withLevels(
  db: Executor,
  rows: Array<Omit<LotRow, 'levels'> & { levelNumbers: number[] }>,
): Promise<LotRow[]> {
  const levels = await levelsOf(
    db,
    rows.map((r) => r.id),
  );
  return rows.map(({ levelNumbers, ...row }) => ({
    ...row,
    // A lot whose level rows were never written still lists its level numbers.
    levels: levels.get(row.id) ?? levelNumbers.map((level) => ({ level, description: null })),
  }));
}

export async function listLotRows(
  db: Executor,
  query: CatalogueListQuery & { sort: string },
): Promise<{ total: number; rows: LotRow[] }> {
  const conditions: Array<SQL | undefined> = [];
  if (query.state !== 'all') conditions.push(eq(controlLots.state, query.state));
  if (query.q) {
    const pattern = containsPattern(query.q);
    conditions.push(
      or(
        ilike(controlLots.lotNumber, pattern),
        ilike(controlMaterials.code, pattern),
        ilike(controlMaterials.name, pattern),
      ),
    );
  }
  const where = and(...conditions);
  const [{ total }] = await db
    .select({ total: count() })
    .from(controlLots)
    .innerJoin(controlMaterials, eq(controlMaterials.id, controlLots.materialId))
    .where(where);
  const direction = query.order === 'desc' ? desc : asc;
  const rows = await db
    .select(lotSelection)
    .from(controlLots)
    .innerJoin(controlMaterials, eq(controlMaterials.id, controlLots.materialId))
    .where(where)
    .orderBy(direction(lotSortColumns[query.sort]), asc(controlLots.id))
    .limit(query.limit)
    .offset(query.offset);
  return { total, rows: await withLevels(db, rows) };
}

export async function findLotRow(db: Executor, id: string): Promise<LotRow | null> {
  const rows = await db
    .select(lotSelection)
    .from(controlLots)
    .innerJoin(controlMaterials, eq(controlMaterials.id, controlLots.materialId))
    .where(eq(controlLots.id, id))
    .limit(1);
  const [row] = await withLevels(db, rows);
  return row ?? null;
}

export async function findLotRowsByNumber(db: Executor, lotNumbers: string[]): Promise<Map<string, LotRow>> {
  if (lotNumbers.length === 0) return new Map();
  const rows = await db
    .select(lotSelection)
    .from(controlLots)
    .innerJoin(controlMaterials, eq(controlMaterials.id, controlLots.materialId))
    .where(inArray(controlLots.lotNumber, lotNumbers));
  return new Map((await withLevels(db, rows)).map((row) => [row.lotNumber, row]));
}

export async function findMaterial(db: Executor, id: string) {
  const [row] = await db.select().from(controlMaterials).where(eq(controlMaterials.id, id)).limit(1);
  return row ?? null;
}

export async function findMaterialsByCode(db: Executor, codes: string[]) {
  if (codes.length === 0) return new Map<string, typeof controlMaterials.$inferSelect>();
  const rows = await db.select().from(controlMaterials).where(inArray(controlMaterials.code, codes));
  return new Map(rows.map((row) => [row.code, row]));
}

export type LotValues = {
  materialId: string;
  lotNumber: string;
  expiresOn: string;
  levels: Array<{ level: number; description: string | null }>;
};

async function writeLevels(db: Executor, lotId: string, levels: LotValues['levels']) {
  await db.delete(controlLotLevels).where(eq(controlLotLevels.controlLotId, lotId));
  await db
    .insert(controlLotLevels)
    .values(levels.map((l) => ({ controlLotId: lotId, level: l.level, description: l.description })));
}

const levelNumbers = (levels: LotValues['levels']) => levels.map((l) => l.level).sort((a, b) => a - b);

export async function insertLot(db: Executor, values: LotValues): Promise<string> {
  const [row] = await db
    .insert(controlLots)
    .values({
      materialId: values.materialId,
      lotNumber: values.lotNumber,
      expiresOn: values.expiresOn,
      levels: levelNumbers(values.levels),
    })
    .returning({ id: controlLots.id });
  await writeLevels(db, row.id, values.levels);
  return row.id;
}

export async function updateLot(db: Executor, id: string, values: LotValues): Promise<void> {
  await db
    .update(controlLots)
    .set({
      materialId: values.materialId,
      lotNumber: values.lotNumber,
      expiresOn: values.expiresOn,
      levels: levelNumbers(values.levels),
    })
    .where(eq(controlLots.id, id));
  await writeLevels(db, id, values.levels);
}

export async function setLotState(db: Executor, id: string, state: 'active' | 'retired'): Promise<void> {
  await db.update(controlLots).set({ state }).where(eq(controlLots.id, id));
}

/** Levels of a lot that monthly summaries or daily values already refer to. */
export async function levelsWithData(db: Executor, lotId: string, levels: number[]): Promise<number[]> {
  if (levels.length === 0) return [];
  const summaries = await db
    .selectDistinct({ level: qcSummaries.level })
    .from(qcSummaries)
    .where(and(eq(qcSummaries.controlLotId, lotId), inArray(qcSummaries.level, levels)));
  const values = await db
    .selectDistinct({ level: qcValues.level })
    .from(qcValues)
    .where(and(eq(qcValues.controlLotId, lotId), inArray(qcValues.level, levels)));
  return [...new Set([...summaries, ...values].map((r) => r.level))].sort((a, b) => a - b);
}
