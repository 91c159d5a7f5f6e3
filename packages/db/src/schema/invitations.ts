import { index, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { labs } from './labs.ts';
import { users } from './users.ts';

/**
 * An invitation for a new lab user to choose a password. The user row exists (inactive, no password)
 * from the moment of the invitation; only a SHA-256 of the token is stored.
 */
export const invitations = pgTable(
  'invitations',
  {
    id: uuid().primaryKey().defaultRandom(),
    userId: uuid()
      .notNull()
      .references(() => users.id),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    tokenHash: text().notNull().unique(),
    createdBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    acceptedAt: timestamp({ withTimezone: true }),
    /** Set when a newer invitation for the same user replaces this one. */
    revokedAt: timestamp({ withTimezone: true }),
  },
  (t) => [index().on(t.userId)],
);
