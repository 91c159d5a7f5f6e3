import { index, pgTable, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core';
import { labs } from './labs.ts';
import { analytes, instrumentModels, methods, reagents } from './catalogue.ts';

/** A lab's measurement procedure: analyte + instrument model + method + reagent, in a unit, under the lab's own short code. */
export const procedures = pgTable(
  'procedures',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    code: text().notNull(),
    analyteId: uuid()
      .notNull()
      .references(() => analytes.id),
    instrumentModelId: uuid()
      .notNull()
      .references(() => instrumentModels.id),
    methodId: uuid()
      .notNull()
      .references(() => methods.id),
    reagentId: uuid()
      .notNull()
      .references(() => reagents.id),
    /** The UCUM unit the lab reports in (values are stored converted to the analyte's canonical unit). */
    unit: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    retiredAt: timestamp({ withTimezone: true }),
  },
  (t) => [unique().on(t.labId, t.code), index().on(t.analyteId)],
);
