import { sql } from 'drizzle-orm';
import {
  bigserial,
  boolean,
  check,
  doublePrecision,
  index,
  integer,
  pgTable,
  text,
  timestamp,
  unique,
  uuid,
} from 'drizzle-orm/pg-core';
import { labs } from './labs.ts';
import { procedures } from './procedures.ts';
import { controlLots } from './catalogue.ts';
import { periods } from './periods.ts';
import { uploads } from './uploads.ts';

/** One lab's monthly figures for a procedure, control lot and level (canonical unit). */
export const qcSummaries = pgTable(
  'qc_summaries',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    procedureId: uuid()
      .notNull()
      .references(() => procedures.id),
    controlLotId: uuid()
      .notNull()
      .references(() => controlLots.id),
    level: integer().notNull(),
    period: text()
      .notNull()
      .references(() => periods.period),
    n: integer().notNull(),
    mean: doublePrecision().notNull(),
    sd: doublePrecision().notNull(),
    /** 'summary' when uploaded as a monthly summary, 'values' when derived from daily values. */
    source: text().notNull().default('summary'),
    late: boolean().notNull().default(false),
    uploadId: uuid().references(() => uploads.id),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique().on(t.procedureId, t.controlLotId, t.level, t.period),
    index().on(t.controlLotId, t.level, t.period),
    index().on(t.labId, t.period),
    // The ingest checks, again in the database. double precision accepts 'Infinity' and 'NaN', and NaN
    // sorts above every number, so "> '-Infinity' and < 'Infinity'" keeps only finite values.
    check('qc_summaries_n_at_least_2', sql`${t.n} >= 2`),
    check('qc_summaries_level_positive', sql`${t.level} >= 1`),
    check(
      'qc_summaries_mean_finite',
      sql`${t.mean} > '-Infinity'::float8 and ${t.mean} < 'Infinity'::float8`,
    ),
    check('qc_summaries_sd_positive_finite', sql`${t.sd} > 0 and ${t.sd} < 'Infinity'::float8`),
  ],
);

/**
 * A daily control value (canonical unit) with its multirule result.
 *
 * No foreign keys on purpose: this table takes about a million rows a month, and PostgreSQL checks a
 * foreign key with a trigger per row, which made storing values about four times slower (measured:
 * COPY of 100,000 rows 3.1 s with the four keys, 0.8 s without). The ingest worker resolves every
 * lab, procedure, lot and upload before it writes a value, and none of those rows is ever deleted.
 */
export const qcValues = pgTable(
  'qc_values',
  {
    id: bigserial({ mode: 'number' }).primaryKey(),
    labId: uuid().notNull(),
    procedureId: uuid().notNull(),
    controlLotId: uuid().notNull(),
    level: integer().notNull(),
    period: text().notNull(),
    measuredAt: timestamp({ withTimezone: true }).notNull(),
    value: doublePrecision().notNull(),
    run: text(),
    comment: text(),
    z: doublePrecision(),
    rules: text().array().notNull().default([]),
    uploadId: uuid(),
  },
  (t) => [
    index().on(t.procedureId, t.controlLotId, t.period, t.measuredAt),
    index().on(t.uploadId),
    check('qc_values_level_positive', sql`${t.level} >= 1`),
    check(
      'qc_values_value_finite',
      sql`${t.value} > '-Infinity'::float8 and ${t.value} < 'Infinity'::float8`,
    ),
    check(
      'qc_values_z_finite',
      sql`${t.z} is null or (${t.z} > '-Infinity'::float8 and ${t.z} < 'Infinity'::float8)`,
    ),
  ],
);
