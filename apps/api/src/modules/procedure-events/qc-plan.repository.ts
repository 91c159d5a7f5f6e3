import { and, desc, eq } from 'drizzle-orm';
import { qcPlans, qcSummaries, type Executor } from '@plumbline/db';

export async function listPlans(db: Executor, labId: string) {
  return db.select().from(qcPlans).where(eq(qcPlans.labId, labId));
}

export async function upsertPlan(
  db: Executor,
  plan: {
    labId: string;
    procedureId: string;
    level: number;
    rules: string;
    n: number;
    runs: number;
    updatedBy: string;
  },
) {
  await db
    .insert(qcPlans)
    .values(plan)
    .onConflictDoUpdate({
      target: [qcPlans.procedureId, qcPlans.level],
      set: {
        rules: plan.rules,
        n: plan.n,
        runs: plan.runs,
        updatedBy: plan.updatedBy,
        updatedAt: new Date(),
      },
    });
}

export async function findPlan(db: Executor, procedureId: string, level: number) {
  const [row] = await db
    .select()
    .from(qcPlans)
    .where(and(eq(qcPlans.procedureId, procedureId), eq(qcPlans.level, level)))
    .limit(1);
  return row ?? null;
}

/** The latest period in which the lab has monthly data, or null. */
export async function latestPeriodWithData(db: Executor, labId: string): Promise<string | null> {
  const [row] = await db
    .select({ period: qcSummaries.period })
    .from(qcSummaries)
    .where(eq(qcSummaries.labId, labId))
    .orderBy(desc(qcSummaries.period))
    .limit(1);
  return row?.period ?? null;
}
