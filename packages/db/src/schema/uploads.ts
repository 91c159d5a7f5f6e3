import {
  bigint,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  real,
  text,
  timestamp,
  unique,
  uuid,
} from 'drizzle-orm/pg-core';
import { labs } from './labs.ts';
import { labApiTokens, users } from './users.ts';

export const uploadKindEnum = pgEnum('upload_kind', [
  'qc-summary',
  'qc-values',
  'patient-results',
  'fhir-bundle',
]);
export const uploadStatusEnum = pgEnum('upload_status', [
  'queued',
  'processing',
  'needs-review',
  'stored',
  'failed',
  'cancelled',
]);

export type RowError = { row: number; column: string | null; code: string; message: string };

export const uploads = pgTable(
  'uploads',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    uploadedBy: uuid().references(() => users.id),
    tokenId: uuid().references(() => labApiTokens.id),
    kind: uploadKindEnum().notNull(),
    filename: text().notNull(),
    size: bigint({ mode: 'number' }).notNull(),
    sha256: text().notNull(),
    storageKey: text().notNull(),
    /** Column mapping applied to this file: canonical name -> the file's own header. */
    columnMapping: jsonb().$type<Record<string, string>>(),
    status: uploadStatusEnum().notNull().default('queued'),
    progress: real().notNull().default(0),
    rowsTotal: integer().notNull().default(0),
    rowsAccepted: integer().notNull().default(0),
    rowsRejected: integer().notNull().default(0),
    /** The first row errors (at most the INGEST_MAX_ROW_ERRORS threshold), each message bounded. */
    errors: jsonb().$type<RowError[]>().notNull().default([]),
    /** Every row error found, also those not kept in `errors`. */
    errorsTotal: integer().notNull().default(0),
    failureMessage: text(),
    /** An earlier upload of the same lab with identical content, when there is one. */
    duplicateOf: uuid(),
    attempts: integer().notNull().default(0),
    /** Set when a user chose to store the valid rows of a file that had rejected rows. */
    confirmedAt: timestamp({ withTimezone: true }),
    confirmedBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    storedAt: timestamp({ withTimezone: true }),
  },
  (t) => [index().on(t.labId, t.createdAt), index().on(t.status), index().on(t.labId, t.sha256)],
);

/** A lab's saved column mapping for a file kind, offered again on its next upload. */
export const columnMappings = pgTable(
  'column_mappings',
  {
    id: uuid().primaryKey().defaultRandom(),
    labId: uuid()
      .notNull()
      .references(() => labs.id),
    kind: uploadKindEnum().notNull(),
    mapping: jsonb().$type<Record<string, string>>().notNull(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique().on(t.labId, t.kind)],
);
