import { and, asc, eq, isNull, sql, type SQL } from 'drizzle-orm';
import { invitations, labs, users, type Executor } from '@plumbline/db';
import type { NetworkProcedure, NetworkProceduresQuery } from '@plumbline/contracts';

// ---------- labs ----------

export type LabRow = typeof labs.$inferSelect;

export async function findLab(db: Executor, id: string): Promise<LabRow | null> {
  const [row] = await db.select().from(labs).where(eq(labs.id, id)).limit(1);
  return row ?? null;
}

export async function insertLab(
  db: Executor,
  values: { code: string; name: string; preferredUnits?: string },
): Promise<LabRow> {
  const [row] = await db.insert(labs).values(values).returning();
  return row;
}

export async function updateLab(
  db: Executor,
  id: string,
  values: Partial<Omit<LabRow, 'id' | 'createdAt'>>,
): Promise<LabRow> {
  const [row] = await db.update(labs).set(values).where(eq(labs.id, id)).returning();
  return row;
}

// ---------- users and invitations ----------

export type UserRow = typeof users.$inferSelect;
export type InvitationRow = typeof invitations.$inferSelect;

export async function findUserByEmail(db: Executor, email: string): Promise<UserRow | null> {
  const [row] = await db.select().from(users).where(eq(users.email, email)).limit(1);
  return row ?? null;
}

export async function findLabUser(db: Executor, labId: string, userId: string): Promise<UserRow | null> {
  const [row] = await db
    .select()
    .from(users)
    .where(and(eq(users.id, userId), eq(users.labId, labId)))
    .limit(1);
  return row ?? null;
}

export async function listLabUsers(db: Executor, labId: string) {
  const pendingIds = await db
    .selectDistinct({ userId: invitations.userId })
    .from(invitations)
    .where(and(eq(invitations.labId, labId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)));
  const pending = new Set(pendingIds.map((r) => r.userId));
  const rows = await db
    .select()
    .from(users)
    .where(eq(users.labId, labId))
    .orderBy(asc(users.name), asc(users.email));
  return rows.map((user) => ({
    user,
    invitationPending: pending.has(user.id) && user.passwordHash === null,
  }));
}

export async function insertUser(db: Executor, values: typeof users.$inferInsert): Promise<UserRow> {
  const [row] = await db.insert(users).values(values).returning();
  return row;
}

export async function updateUser(
  db: Executor,
  id: string,
  values: Partial<typeof users.$inferInsert>,
): Promise<UserRow> {
  const [row] = await db.update(users).set(values).where(eq(users.id, id)).returning();
  return row;
}

export async function revokeOpenInvitations(db: Executor, userId: string): Promise<void> {
  await db
    .update(invitations)
    .set({ revokedAt: new Date() })
    .where(
      and(eq(invitations.userId, userId), isNull(invitations.acceptedAt), isNull(invitations.revokedAt)),
    );
}

export async function insertInvitation(
  db: Executor,
  values: typeof invitations.$inferInsert,
): Promise<InvitationRow> {
  const [row] = await db.insert(invitations).values(values).returning();
  return row;
}

/** The invitation with its user and lab; `lock` holds the row until the transaction ends. */
export async function findInvitationByHash(db: Executor, tokenHash: string, lock = false) {
  const query = db
    .select({ invitation: invitations, user: users, lab: labs })
    .from(invitations)
    .innerJoin(users, eq(users.id, invitations.userId))
    .innerJoin(labs, eq(labs.id, invitations.labId))
    .where(eq(invitations.tokenHash, tokenHash))
    .limit(1);
  const [row] = lock ? await query.for('update', { of: invitations }) : await query;
  return row ?? null;
}

export async function markInvitationAccepted(db: Executor, id: string): Promise<void> {
  await db.update(invitations).set({ acceptedAt: new Date() }).where(eq(invitations.id, id));
}

// ---------- procedures across the network ----------

type ProcedureSqlRow = {
  id: string;
  code: string;
  unit: string;
  lab_id: string;
  lab_code: string;
  lab_name: string;
  lab_active: boolean;
  analyte_id: string;
  analyte_code: string;
  analyte_name: string;
  model_id: string;
  model_code: string;
  model_name: string;
  method_id: string;
  method_code: string;
  method_name: string;
  reagent_id: string;
  reagent_code: string;
  reagent_name: string;
  instrument_labs: number;
  method_labs: number;
  analyte_labs: number;
};

/**
 * Every registered (not retired) procedure with, per peer tier, how many active labs share its key:
 * instrument tier = analyte + instrument model + method + reagent; method tier = analyte + method;
 * analyte tier = analyte. A lab counts once per key however many procedures it has there.
 */
function listedProcedures(query: NetworkProceduresQuery): SQL {
  const filters: SQL[] = [sql`p.retired_at is null`];
  if (query.analyteId) filters.push(sql`p.analyte_id = ${query.analyteId}`);
  if (query.instrumentModelId) filters.push(sql`p.instrument_model_id = ${query.instrumentModelId}`);
  if (query.methodId) filters.push(sql`p.method_id = ${query.methodId}`);
  if (query.labId) filters.push(sql`p.lab_id = ${query.labId}`);
  return sql`
    with live as (
      select p.lab_id, p.analyte_id, p.instrument_model_id, p.method_id, p.reagent_id
      from procedures p join labs l on l.id = p.lab_id
      where p.retired_at is null and l.active
    ),
    instrument_tier as (
      select analyte_id, instrument_model_id, method_id, reagent_id, count(distinct lab_id)::int as labs
      from live group by analyte_id, instrument_model_id, method_id, reagent_id
    ),
    method_tier as (
      select analyte_id, method_id, count(distinct lab_id)::int as labs from live group by analyte_id, method_id
    ),
    analyte_tier as (
      select analyte_id, count(distinct lab_id)::int as labs from live group by analyte_id
    ),
    listed as (
      select p.id, p.code, p.unit,
        l.id as lab_id, l.code as lab_code, l.name as lab_name, l.active as lab_active,
        a.id as analyte_id, a.code as analyte_code, a.name as analyte_name,
        im.id as model_id, im.code as model_code, im.name as model_name,
        m.id as method_id, m.code as method_code, m.name as method_name,
        r.id as reagent_id, r.code as reagent_code, r.name as reagent_name,
        coalesce(it.labs, 0) as instrument_labs,
        coalesce(mt.labs, 0) as method_labs,
        coalesce(att.labs, 0) as analyte_labs
      from procedures p
      join labs l on l.id = p.lab_id
      join analytes a on a.id = p.analyte_id
      join instrument_models im on im.id = p.instrument_model_id
      join methods m on m.id = p.method_id
      join reagents r on r.id = p.reagent_id
      left join instrument_tier it on it.analyte_id = p.analyte_id and it.instrument_model_id = p.instrument_model_id
        and it.method_id = p.method_id and it.reagent_id = p.reagent_id
      left join method_tier mt on mt.analyte_id = p.analyte_id and mt.method_id = p.method_id
      left join analyte_tier att on att.analyte_id = p.analyte_id
      where ${sql.join(filters, sql` and `)}
    )`;
}

export async function listNetworkProcedures(
  db: Executor,
  query: NetworkProceduresQuery,
): Promise<{ total: number; items: NetworkProcedure[] }> {
  // The analyte tier is the broadest, so a procedure is unpeerable exactly when it falls short there.
  const unpeerableFilter =
    query.unpeerable === undefined
      ? sql`true`
      : query.unpeerable
        ? sql`analyte_labs < ${query.minLabs}`
        : sql`analyte_labs >= ${query.minLabs}`;
  const base = listedProcedures(query);
  const counted = await db.execute<{ total: number }>(
    sql`${base} select count(*)::int as total from listed where ${unpeerableFilter}`,
  );
  const result = await db.execute<ProcedureSqlRow>(
    sql`${base} select * from listed where ${unpeerableFilter}
        order by analyte_code, lab_code, code, id limit ${query.limit} offset ${query.offset}`,
  );
  const tier = (labsCount: number) => ({ labs: labsCount, enough: labsCount >= query.minLabs });
  return {
    total: counted.rows[0]?.total ?? 0,
    items: result.rows.map((r) => ({
      id: r.id,
      code: r.code,
      unit: r.unit,
      lab: { id: r.lab_id, code: r.lab_code, name: r.lab_name, active: r.lab_active },
      analyte: { id: r.analyte_id, code: r.analyte_code, name: r.analyte_name },
      instrumentModel: { id: r.model_id, code: r.model_code, name: r.model_name },
      method: { id: r.method_id, code: r.method_code, name: r.method_name },
      reagent: { id: r.reagent_id, code: r.reagent_code, name: r.reagent_name },
      peerable: {
        instrument: tier(r.instrument_labs),
        method: tier(r.method_labs),
        analyte: tier(r.analyte_labs),
      },
      unpeerable: r.analyte_labs < query.minLabs,
    })),
  };
}
