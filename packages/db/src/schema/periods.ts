import { integer, pgEnum, pgTable, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core';
import { users } from './users.ts';

export const periodStateEnum = pgEnum('period_state', ['open', 'closed', 'published']);

/** A monthly cycle, keyed by 'YYYY-MM'. */
export const periods = pgTable('periods', {
  period: text().primaryKey(),
  state: periodStateEnum().notNull().default('open'),
  deadline: timestamp({ withTimezone: true }).notNull(),
  closedAt: timestamp({ withTimezone: true }),
  publishedAt: timestamp({ withTimezone: true }),
});

/** Each publication of a period freezes a versioned snapshot of peer statistics. */
export const publications = pgTable(
  'publications',
  {
    id: uuid().primaryKey().defaultRandom(),
    period: text()
      .notNull()
      .references(() => periods.period),
    version: integer().notNull(),
    reason: text(),
    publishedBy: uuid().references(() => users.id),
    publishedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique().on(t.period, t.version)],
);
