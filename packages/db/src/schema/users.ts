import { boolean, index, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { labs } from './labs.ts';

export const roleEnum = pgEnum('role', ['analyst', 'supervisor', 'coordinator']);

export const users = pgTable(
  'users',
  {
    id: uuid().primaryKey().defaultRandom(),
    email: text().notNull().unique(),
    name: text().notNull(),
    passwordHash: text(),
    role: roleEnum().notNull(),
    /** Null only for coordinators, who belong to the network rather than a lab. */
    labId: uuid().references(() => labs.id),
    active: boolean().notNull().default(true),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index().on(t.labId)],
);

/** Signed-out JWTs (by their `jti`) until they would have expired anyway. */
export const revokedSessions = pgTable('revoked_sessions', {
  jti: text().primaryKey(),
  expiresAt: timestamp({ withTimezone: true }).notNull(),
});

/** Machine tokens a lab's middleware uses to push files; only a hash is stored. */
export const labApiTokens = pgTable(
  'lab_api_tokens',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    name: text().notNull(),
    /** First characters of the token, shown so a supervisor can tell tokens apart. */
    prefix: text().notNull(),
    tokenHash: text().notNull().unique(),
    createdBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    lastUsedAt: timestamp({ withTimezone: true }),
    revokedAt: timestamp({ withTimezone: true }),
  },
  (t) => [index().on(t.labId)],
);
