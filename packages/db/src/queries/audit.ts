import { auditEvents } from '../schema/index.ts';
import type { Executor } from '../client.ts';

export type AuditInput = {
  kind: string;
  actorId?: string | null;
  actorLabel?: string | null;
  labId?: string | null;
  entity?: string | null;
  entityId?: string | null;
  details?: Record<string, unknown>;
};

/** Appends one audit event. Callers pass the transaction that made the change, so both commit together. */
export async function recordAudit(db: Executor, event: AuditInput): Promise<void> {
  await db.insert(auditEvents).values({
    kind: event.kind,
    actorId: event.actorId ?? null,
    actorLabel: event.actorLabel ?? null,
    labId: event.labId ?? null,
    entity: event.entity ?? null,
    entityId: event.entityId ?? null,
    details: event.details ?? {},
  });
}
