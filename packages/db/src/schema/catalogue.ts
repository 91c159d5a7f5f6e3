import { sql } from 'drizzle-orm';
import {
  boolean,
  check,
  date,
  doublePrecision,
  integer,
  pgTable,
  primaryKey,
  text,
  timestamp,
  unique,
  uuid,
} from 'drizzle-orm/pg-core';

/** A measurand. Values are stored in `unit` (canonical UCUM); `conventionalUnit` is offered for display. */
export const analytes = pgTable(
  'analytes',
  {
    id: uuid().primaryKey().defaultRandom(),
    code: text().notNull().unique(),
    name: text().notNull(),
    loinc: text(),
    unit: text().notNull(),
    conventionalUnit: text(),
    /** g/mol, for mass <-> substance conversions. */
    molarMass: doublePrecision(),
    decimals: integer().notNull().default(2),
    /**
     * Total allowable error as published rules state it: "± teaAbsolute (in `unit`) or ± teaPct %,
     * whichever is greater" at the control's concentration. Either part may be absent.
     */
    teaPct: doublePrecision(),
    teaAbsolute: doublePrecision(),
    teaSource: text(),
    teaDate: date(),
    /**
     * Physiological/analytical plausibility limits in `unit`: a value outside them is a row error at
     * ingest. `plausibilitySource` names the source, or says "common practice".
     */
    plausibleLow: doublePrecision(),
    plausibleHigh: doublePrecision(),
    plausibilitySource: text(),
    /** Whether a result can be below zero (e.g. base excess); when false, a mean must be > 0. */
    allowsNegative: boolean().notNull().default(false),
    retiredAt: timestamp({ withTimezone: true }),
  },
  (t) => [
    check('analytes_tea_pct_positive', sql`${t.teaPct} is null or (${t.teaPct} > 0 and ${t.teaPct} < 100)`),
    check(
      'analytes_tea_absolute_positive',
      sql`${t.teaAbsolute} is null or (${t.teaAbsolute} > 0 and ${t.teaAbsolute} < 'Infinity'::float8)`,
    ),
    check(
      'analytes_plausible_range',
      sql`(${t.plausibleLow} is null or (${t.plausibleLow} > '-Infinity'::float8 and ${t.plausibleLow} < 'Infinity'::float8))
      and (${t.plausibleHigh} is null or (${t.plausibleHigh} > '-Infinity'::float8 and ${t.plausibleHigh} < 'Infinity'::float8))
      and (${t.plausibleLow} is null or ${t.plausibleHigh} is null or ${t.plausibleLow} < ${t.plausibleHigh})`,
    ),
  ],
);

export const methods = pgTable('methods', {
  id: uuid().primaryKey().defaultRandom(),
  code: text().notNull().unique(),
  name: text().notNull(),
  principle: text(),
  retiredAt: timestamp({ withTimezone: true }),
});

export const instrumentModels = pgTable('instrument_models', {
  id: uuid().primaryKey().defaultRandom(),
  code: text().notNull().unique(),
  name: text().notNull(),
  manufacturer: text(),
  retiredAt: timestamp({ withTimezone: true }),
});

export const reagents = pgTable('reagents', {
  id: uuid().primaryKey().defaultRandom(),
  code: text().notNull().unique(),
  name: text().notNull(),
  manufacturer: text(),
  retiredAt: timestamp({ withTimezone: true }),
});

export const controlMaterials = pgTable('control_materials', {
  id: uuid().primaryKey().defaultRandom(),
  code: text().notNull().unique(),
  name: text().notNull(),
  manufacturer: text(),
  matrix: text(),
  retiredAt: timestamp({ withTimezone: true }),
});

export const controlLots = pgTable(
  'control_lots',
  {
    id: uuid().primaryKey().defaultRandom(),
    materialId: uuid()
      .notNull()
      .references(() => controlMaterials.id),
    lotNumber: text().notNull().unique(),
    levels: integer().array().notNull(),
    expiresOn: date().notNull(),
    /** 'active' | 'retired' */
    state: text().notNull().default('active'),
  },
  (t) => [unique().on(t.materialId, t.lotNumber)],
);

/** Per-level details of a control lot (a description such as "normal" or "pathological"). */
export const controlLotLevels = pgTable(
  'control_lot_levels',
  {
    controlLotId: uuid()
      .notNull()
      .references(() => controlLots.id),
    level: integer().notNull(),
    description: text(),
  },
  (t) => [primaryKey({ columns: [t.controlLotId, t.level] })],
);
