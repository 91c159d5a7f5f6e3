import { bigserial, index, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { labs } from './labs.ts';
import { users } from './users.ts';

/** Who did what, when, to which lab, and why. Never holds patient data. */
export const auditEvents = pgTable(
  'audit_events',
  {
    id: bigserial({ mode: 'number' }).primaryKey(),
    at: timestamp({ withTimezone: true }).notNull().defaultNow(),
    actorId: uuid().references(() => users.id),
    /** For machine actors (lab API tokens, the worker). */
    actorLabel: text(),
    labId: uuid().references(() => labs.id),
    kind: text().notNull(),
    entity: text(),
    entityId: text(),
    details: jsonb().$type<Record<string, unknown>>().notNull().default({}),
  },
  (t) => [index().on(t.at), index().on(t.actorId), index().on(t.labId), index().on(t.kind)],
);
