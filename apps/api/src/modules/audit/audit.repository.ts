import { and, count, desc, eq, gte, lt, type SQL } from 'drizzle-orm';
import { auditEvents, labs, users, type Executor } from '@plumbline/db';
import type { AuditEvent, AuditQuery } from '@plumbline/contracts';

function filters(query: AuditQuery): SQL | undefined {
  const conditions: SQL[] = [];
  if (query.actorId) conditions.push(eq(auditEvents.actorId, query.actorId));
  if (query.labId) conditions.push(eq(auditEvents.labId, query.labId));
  if (query.kind) conditions.push(eq(auditEvents.kind, query.kind));
  if (query.from) conditions.push(gte(auditEvents.at, new Date(`${query.from}T00:00:00Z`)));
  if (query.to)
    conditions.push(lt(auditEvents.at, new Date(new Date(`${query.to}T00:00:00Z`).getTime() + 86_400_000)));
  return conditions.length ? and(...conditions) : undefined;
}

export async function listAuditEvents(
  db: Executor,
  query: AuditQuery,
): Promise<{ total: number; items: AuditEvent[] }> {
  const where = filters(query);
  const [{ total }] = await db.select({ total: count() }).from(auditEvents).where(where);
  const rows = await db
    .select({
      event: auditEvents,
      actor: { id: users.id, name: users.name, email: users.email },
      lab: { id: labs.id, code: labs.code },
    })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId))
    .leftJoin(labs, eq(labs.id, auditEvents.labId))
    .where(where)
    .orderBy(desc(auditEvents.at), desc(auditEvents.id))
    .limit(query.limit)
    .offset(query.offset);
  return {
    total,
    items: rows.map(({ event, actor, lab }) => ({
      id: event.id,
      at: event.at.toISOString(),
      actor: actor?.id ? actor : null,
      actorLabel: event.actorLabel,
      lab: lab?.id ? lab : null,
      kind: event.kind,
      entity: event.entity,
      entityId: event.entityId,
      details: event.details,
    })),
  };
}
