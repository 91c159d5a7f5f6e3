import { index, integer, pgTable, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core';
import { labs } from './labs.ts';
import { users } from './users.ts';
import { procedures } from './procedures.ts';
import { controlLots } from './catalogue.ts';
import { periods } from './periods.ts';

/** A corrective-action comment on one report row. */
export const reviewComments = pgTable(
  'review_comments',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    period: text()
      .notNull()
      .references(() => periods.period),
    procedureId: uuid()
      .notNull()
      .references(() => procedures.id),
    controlLotId: uuid()
      .notNull()
      .references(() => controlLots.id),
    level: integer().notNull(),
    body: text().notNull(),
    authorId: uuid()
      .notNull()
      .references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index().on(t.labId, t.period)],
);

/** A supervisor's sign-off of a lab's monthly review; a signed period is read-only except for comments. */
export const periodSignoffs = pgTable(
  'period_signoffs',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    period: text()
      .notNull()
      .references(() => periods.period),
    signedBy: uuid()
      .notNull()
      .references(() => users.id),
    statement: text().notNull(),
    signedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique().on(t.labId, t.period)],
);
