import { and, asc, eq, ne, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { analytes, instrumentModels, methods, procedures, reagents, type Executor } from '@plumbline/db';

const model = alias(instrumentModels, 'model');
const method = alias(methods, 'method');
const reagent = alias(reagents, 'reagent');

function menuQuery(db: Executor) {
  return db
    .select({
      id: procedures.id,
      labId: procedures.labId,
      code: procedures.code,
      unit: procedures.unit,
      createdAt: procedures.createdAt,
      retiredAt: procedures.retiredAt,
      analyte: {
        id: analytes.id,
        code: analytes.code,
        name: analytes.name,
        loinc: analytes.loinc,
        unit: analytes.unit,
        conventionalUnit: analytes.conventionalUnit,
      },
      instrumentModel: { id: model.id, code: model.code, name: model.name },
      method: { id: method.id, code: method.code, name: method.name },
      reagent: { id: reagent.id, code: reagent.code, name: reagent.name },
    })
    .from(procedures)
    .innerJoin(analytes, eq(analytes.id, procedures.analyteId))
    .innerJoin(model, eq(model.id, procedures.instrumentModelId))
    .innerJoin(method, eq(method.id, procedures.methodId))
    .innerJoin(reagent, eq(reagent.id, procedures.reagentId));
}

export type MenuRow = Awaited<ReturnType<typeof listMenu>>[number];

/** Every procedure of the lab, retired ones included, by code. */
export async function listMenu(db: Executor, labId: string) {
  return menuQuery(db).where(eq(procedures.labId, labId)).orderBy(asc(procedures.code));
}

export async function findMenuItem(db: Executor, labId: string, procedureId: string) {
  const [row] = await menuQuery(db)
    .where(and(eq(procedures.labId, labId), eq(procedures.id, procedureId)))
    .limit(1);
  return row ?? null;
}

/** Another procedure of the lab with the same code, compared without regard to case (files are matched that way). */
export async function findCodeTaken(db: Executor, labId: string, code: string, exceptId?: string) {
  const [row] = await db
    .select({ id: procedures.id, code: procedures.code })
    .from(procedures)
    .where(
      and(
        eq(procedures.labId, labId),
        sql`upper(${procedures.code}) = upper(${code})`,
        exceptId ? ne(procedures.id, exceptId) : undefined,
      ),
    )
    .limit(1);
  return row ?? null;
}

export async function findAnalyte(db: Executor, id: string) {
  const [row] = await db.select().from(analytes).where(eq(analytes.id, id)).limit(1);
  return row ?? null;
}

export async function findCatalogueEntry(
  db: Executor,
  list: 'instrumentModel' | 'method' | 'reagent',
  id: string,
) {
  const table = list === 'instrumentModel' ? instrumentModels : list === 'method' ? methods : reagents;
  const [row] = await db
    .select({ id: table.id, code: table.code, name: table.name, retiredAt: table.retiredAt })
    .from(table)
    .where(eq(table.id, id))
    .limit(1);
  return row ?? null;
}

export async function insertProcedure(db: Executor, values: typeof procedures.$inferInsert) {
  const [row] = await db.insert(procedures).values(values).returning({ id: procedures.id });
  return row.id;
}

export async function updateProcedure(
  db: Executor,
  procedureId: string,
  values: Partial<Pick<typeof procedures.$inferInsert, 'code' | 'unit' | 'retiredAt'>>,
) {
  await db.update(procedures).set(values).where(eq(procedures.id, procedureId));
}
