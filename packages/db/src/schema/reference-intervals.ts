import { sql } from 'drizzle-orm';
import {
  bigserial,
  boolean,
  check,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  real,
  smallint,
  text,
  timestamp,
  unique,
  uuid,
} from 'drizzle-orm/pg-core';
import { labs } from './labs.ts';
import { analytes } from './catalogue.ts';
import { uploads } from './uploads.ts';
import { users } from './users.ts';

/**
 * One de-identified patient result: canonical unit, whole-year age, month of collection, and a salted
 * hash of the lab's own sample key (used only to drop repeats of the same person within a study).
 */
export const patientResults = pgTable(
  'patient_results',
  {
    id: bigserial({ mode: 'number' }).primaryKey(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    /** The upload the result came in with (null for the invented demo results the seed writes). */
    uploadId: uuid().references(() => uploads.id),
    analyteId: uuid()
      .notNull()
      .references(() => analytes.id),
    value: doublePrecision().notNull(),
    sex: text().notNull(),
    ageYears: smallint().notNull(),
    collectedMonth: text().notNull(),
    setting: text().notNull(),
    sampleHash: text(),
    /**
     * True when no other result of the lab and analyte has this sample key, so a study reads the row
     * without deduplicating it (ingest stores true for rows with a key and then unmarks every key it
     * repeats). False (the default) is always safe: the row's key is then deduplicated when read.
     */
    sampleUnique: boolean().notNull().default(false),
  },
  (t) => [
    index().on(t.labId, t.analyteId),
    index().on(t.labId, t.analyteId, t.sampleHash),
    // The few rows a study must deduplicate, found without scanning the table.
    index('patient_results_sample_not_unique_index')
      .on(t.labId, t.analyteId)
      .where(sql`${t.sampleHash} is not null and not ${t.sampleUnique}`),
    index().on(t.uploadId),
    check('patient_results_sex', sql`${t.sex} in ('female', 'male')`),
    check('patient_results_age', sql`${t.ageYears} between 0 and 130`),
    check('patient_results_month', sql`${t.collectedMonth} ~ '^[0-9]{4}-(0[1-9]|1[0-2])$'`),
  ],
);

/** A reference-interval study: what it reads, how it partitions, and how it computes. */
export const riStudies = pgTable(
  'ri_studies',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    analyteId: uuid()
      .notNull()
      .references(() => analytes.id),
    name: text().notNull(),
    selection: jsonb().notNull(),
    partitioning: jsonb().notNull(),
    method: text().notNull(),
    screening: text().notNull(),
    status: text().notNull().default('draft'),
    progress: real().notNull().default(0),
    failureMessage: text(),
    createdBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index().on(t.labId, t.createdAt),
    check('ri_studies_status', sql`${t.status} in ('draft', 'queued', 'running', 'done', 'failed')`),
  ],
);

/** Every run of a study is a new version; an approved version is never changed. */
export const riStudyResults = pgTable(
  'ri_study_results',
  {
    id: uuid().primaryKey().defaultRandom(),
    studyId: uuid()
      .notNull()
      .references(() => riStudies.id),
    version: integer().notNull(),
    result: jsonb().notNull(),
    computedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    approvedAt: timestamp({ withTimezone: true }),
    approvedBy: uuid().references(() => users.id),
    approvalStatement: text(),
  },
  (t) => [unique().on(t.studyId, t.version)],
);

/** The interval a lab prints on its reports today, per analyte and partition, with its source. */
export const currentIntervals = pgTable(
  'current_intervals',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    analyteId: uuid()
      .notNull()
      .references(() => analytes.id),
    sex: text().notNull(),
    ageLow: smallint().notNull(),
    ageHigh: smallint().notNull(),
    lower: doublePrecision().notNull(),
    upper: doublePrecision().notNull(),
    source: text().notNull(),
    adoptedFromResultId: uuid().references(() => riStudyResults.id),
    updatedBy: uuid().references(() => users.id),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    unique().on(t.labId, t.analyteId, t.sex, t.ageLow, t.ageHigh),
    check('current_intervals_order', sql`${t.lower} < ${t.upper}`),
    check('current_intervals_sex', sql`${t.sex} in ('all', 'female', 'male')`),
  ],
);

/** Verification of a transferred interval with 20 local results (and 20 more when the first fail). */
export const intervalVerifications = pgTable(
  'interval_verifications',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    analyteId: uuid()
      .notNull()
      .references(() => analytes.id),
    /** The interval verified, copied so later edits of the current interval do not change the record. */
    interval: jsonb().notNull(),
    rounds: jsonb().notNull(),
    accepted: boolean().notNull(),
    createdBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    approvedAt: timestamp({ withTimezone: true }),
    approvedBy: uuid().references(() => users.id),
    approvalStatement: text(),
  },
  (t) => [index().on(t.labId, t.createdAt)],
);
