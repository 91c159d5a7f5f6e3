import { z } from 'zod';

export const auditQuerySchema = z.object({
  actorId: z.uuid().optional(),
  labId: z.uuid().optional(),
  kind: z.string().min(1).max(100).optional(),
  from: z.iso.date().optional(),
  to: z.iso.date().optional(),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  offset: z.coerce.number().int().min(0).default(0),
});
export type AuditQuery = z.infer<typeof auditQuerySchema>;

export const auditEventSchema = z.object({
  id: z.number(),
  at: z.string(),
  actor: z.object({ id: z.string(), name: z.string(), email: z.string() }).nullable(),
  actorLabel: z.string().nullable(),
  lab: z.object({ id: z.string(), code: z.string() }).nullable(),
  kind: z.string(),
  entity: z.string().nullable(),
  entityId: z.string().nullable(),
  details: z.record(z.string(), z.unknown()),
});
export type AuditEvent = z.infer<typeof auditEventSchema>;

export const auditPageSchema = z.object({ total: z.number(), items: z.array(auditEventSchema) });
export type AuditPage = z.infer<typeof auditPageSchema>;
