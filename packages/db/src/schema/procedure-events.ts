import { sql } from 'drizzle-orm';
import { check, date, index, integer, pgTable, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core';
import { labs } from './labs.ts';
import { procedures } from './procedures.ts';
import { users } from './users.ts';

/**
 * Something that changed a procedure on a day (a new reagent or calibrator lot, maintenance, ...),
 * recorded by the lab so that a shift of its results can be matched with a cause.
 */
export const procedureEvents = pgTable(
  'procedure_events',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    procedureId: uuid()
      .notNull()
      .references(() => procedures.id),
    occurredOn: date({ mode: 'string' }).notNull(),
    kind: text().notNull(),
    note: text().notNull().default(''),
    /** The person who recorded it, or null for a lab API token (named in `recordedByLabel`). */
    recordedBy: uuid().references(() => users.id),
    recordedByLabel: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index().on(t.labId, t.procedureId, t.occurredOn),
    check(
      'procedure_events_kind_known',
      sql`${t.kind} in ('reagent-lot', 'calibrator-lot', 'control-lot', 'maintenance', 'recalibration', 'software-update', 'other')`,
    ),
    check('procedure_events_note_length', sql`char_length(${t.note}) <= 1000`),
  ],
);

/** The QC plan a lab uses for a procedure and control level: rejection rules, controls per run, runs. */
export const qcPlans = pgTable(
  'qc_plans',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    procedureId: uuid()
      .notNull()
      .references(() => procedures.id),
    level: integer().notNull(),
    /** Rule names joined by '/', e.g. '1-3s/2-2s/R-4s'. */
    rules: text().notNull(),
    n: integer().notNull(),
    runs: integer().notNull().default(1),
    updatedBy: uuid().references(() => users.id),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique().on(t.procedureId, t.level),
    check('qc_plans_n_range', sql`${t.n} between 1 and 10`),
    check('qc_plans_runs_range', sql`${t.runs} between 1 and 10`),
  ],
);
