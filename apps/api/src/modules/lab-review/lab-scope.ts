import { and, eq } from 'drizzle-orm';
import { labs, periodSignoffs, periods, type Executor } from '@plumbline/db';
import type { Principal } from '../../auth/principal.ts';
import { assertLabAccess } from '../../auth/authenticate.ts';
import { forbidden, notFound } from '../../errors/app-error.ts';

export const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

export type LabRecord = {
  id: string;
  code: string;
  name: string;
  active: boolean;
  preferredUnits: 'si' | 'conventional';
};

/**
 * The lab a lab-workspace request is about, after the scoping rule: the coordinator reaches every lab,
 * everyone else only their own (another lab, or an id that is not a lab, answers 404).
 */
export async function visibleLab(db: Executor, principal: Principal, labId: string): Promise<LabRecord> {
  assertLabAccess(principal, labId);
  const [lab] = UUID.test(labId)
    ? await db
        .select({
          id: labs.id,
          code: labs.code,
          name: labs.name,
          active: labs.active,
          preferredUnits: labs.preferredUnits,
        })
        .from(labs)
        .where(eq(labs.id, labId))
        .limit(1)
    : [];
  if (!lab) throw notFound('Lab');
  return { ...lab, preferredUnits: lab.preferredUnits === 'conventional' ? 'conventional' : 'si' };
}

/** A signed-in member (analyst or supervisor) of the lab; the coordinator and machine tokens are refused. */
export function labMember(
  principal: Principal,
  labId: string,
): { userId: string; role: 'analyst' | 'supervisor' } {
  assertLabAccess(principal, labId);
  if (principal.kind !== 'user' || principal.role === 'coordinator') {
    throw forbidden('Only a member of the lab (analyst or supervisor) can do this.');
  }
  return { userId: principal.userId, role: principal.role };
}

/** An existing period, or 404. */
export async function existingPeriod(db: Executor, period: string) {
  const [row] = await db.select().from(periods).where(eq(periods.period, period)).limit(1);
  if (!row) throw notFound(`Period ${period}`);
  return row;
}

/** The lab's sign-off of a period, or null while it is not signed. */
export async function findSignoff(db: Executor, labId: string, period: string) {
  const [row] = await db
    .select()
    .from(periodSignoffs)
    .where(and(eq(periodSignoffs.labId, labId), eq(periodSignoffs.period, period)))
    .limit(1);
  return row ?? null;
}
