import { and, desc, eq, isNull } from 'drizzle-orm';
import { labApiTokens, type Executor } from '@plumbline/db';

export type LabTokenRow = typeof labApiTokens.$inferSelect;

export async function listTokens(db: Executor, labId: string): Promise<LabTokenRow[]> {
  return db
    .select()
    .from(labApiTokens)
    .where(eq(labApiTokens.labId, labId))
    .orderBy(desc(labApiTokens.createdAt));
}

export async function insertToken(
  db: Executor,
  values: typeof labApiTokens.$inferInsert,
): Promise<LabTokenRow> {
  const [row] = await db.insert(labApiTokens).values(values).returning();
  return row;
}

export async function findToken(db: Executor, labId: string, id: string): Promise<LabTokenRow | null> {
  const [row] = await db
    .select()
    .from(labApiTokens)
    .where(and(eq(labApiTokens.labId, labId), eq(labApiTokens.id, id)))
    .limit(1);
  return row ?? null;
}

/** Revokes a live token; false when it was already revoked. */
export async function revokeToken(db: Executor, id: string): Promise<boolean> {
  const rows = await db
    .update(labApiTokens)
    .set({ revokedAt: new Date() })
    .where(and(eq(labApiTokens.id, id), isNull(labApiTokens.revokedAt)))
    .returning({ id: labApiTokens.id });
  return rows.length === 1;
}
