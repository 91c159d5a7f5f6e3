import {
  bigint,
  bigserial,
  boolean,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  unique,
  uuid,
} from 'drizzle-orm/pg-core';
import { analytes, controlLots } from './catalogue.ts';
import { procedures } from './procedures.ts';
import { users } from './users.ts';

/** Narrowest first: same instrument model + method + reagent; same method; every procedure for the analyte. */
export const peerTierEnum = pgEnum('peer_tier', ['instrument', 'method', 'analyte']);

/**
 * A peer group for one control lot and analyte at one tier. `key` identifies the grouping rule
 * (e.g. "instrument:<modelId>:<methodId>:<reagentId>"); merged groups point at the surviving group.
 */
export const peerGroups = pgTable(
  'peer_groups',
  {
    id: uuid().primaryKey().defaultRandom(),
    controlLotId: uuid()
      .notNull()
      .references(() => controlLots.id),
    analyteId: uuid()
      .notNull()
      .references(() => analytes.id),
    tier: peerTierEnum().notNull(),
    key: text().notNull(),
    label: text().notNull(),
    mergedIntoId: uuid(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique().on(t.controlLotId, t.analyteId, t.tier, t.key), index().on(t.controlLotId, t.analyteId)],
);

/** A coordinator's move of one procedure into another group at a tier (overrides the derived key). */
export const peerGroupAssignments = pgTable(
  'peer_group_assignments',
  {
    id: uuid().primaryKey().defaultRandom(),
    procedureId: uuid()
      .notNull()
      .references(() => procedures.id),
    controlLotId: uuid()
      .notNull()
      .references(() => controlLots.id),
    tier: peerTierEnum().notNull(),
    peerGroupId: uuid()
      .notNull()
      .references(() => peerGroups.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique().on(t.procedureId, t.controlLotId, t.tier)],
);

export type ExcludedLab = { id: string; reason: 'outlier' | 'manual'; note?: string };

/**
 * Peer statistics of one group, level and period. `scope` is 'period' or 'cumulative' (lot to date);
 * `version` 0 is the provisional figure, 1.. the published snapshots.
 */
export const peerStatistics = pgTable(
  'peer_statistics',
  {
    id: bigserial({ mode: 'number' }).primaryKey(),
    peerGroupId: uuid()
      .notNull()
      .references(() => peerGroups.id),
    level: integer().notNull(),
    period: text().notNull(),
    scope: text().notNull().default('period'),
    version: integer().notNull().default(0),
    labs: integer().notNull(),
    n: integer().notNull(),
    mean: doublePrecision(),
    sd: doublePrecision(),
    cv: doublePrecision(),
    withinSd: doublePrecision(),
    withinCv: doublePrecision(),
    robustMean: doublePrecision(),
    robustSd: doublePrecision(),
    sufficient: boolean().notNull(),
    excluded: jsonb().$type<ExcludedLab[]>().notNull().default([]),
    /** Procedure ids whose data entered (or was excluded from) the figures. */
    members: jsonb().$type<string[]>().notNull().default([]),
    computedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [unique().on(t.peerGroupId, t.level, t.period, t.scope, t.version), index().on(t.period, t.version)],
);

/**
 * The members of each published (version ≥ 1) peer statistics row, one procedure per row: a report finds
 * the snapshot rows that list its procedures through the procedure index, without reading the member
 * lists of every group of the network. Written with the snapshot; never changed afterwards.
 */
export const publishedStatisticsMembers = pgTable(
  'published_statistics_members',
  {
    procedureId: uuid().notNull(),
    peerStatisticsId: bigint({ mode: 'number' })
      .notNull()
      .references(() => peerStatistics.id, { onDelete: 'cascade' }),
  },
  (t) => [primaryKey({ columns: [t.procedureId, t.peerStatisticsId] }), index().on(t.peerStatisticsId)],
);

/** A coordinator's exclusion of one procedure's data from peer figures for a period, with a reason. */
export const peerExclusions = pgTable(
  'peer_exclusions',
  {
    id: uuid().primaryKey().defaultRandom(),
    procedureId: uuid()
      .notNull()
      .references(() => procedures.id),
    controlLotId: uuid()
      .notNull()
      .references(() => controlLots.id),
    /** Null excludes every level. */
    level: integer(),
    period: text().notNull(),
    reason: text().notNull(),
    createdBy: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    revokedAt: timestamp({ withTimezone: true }),
    revokedBy: uuid().references(() => users.id),
  },
  (t) => [index().on(t.controlLotId, t.period)],
);

/**
 * Peer statistics waiting to be recomputed. An upload adds its (lot, analyte, level, period) keys in the
 * transaction that stores its data, so a crash between storing and recomputing loses nothing; one
 * recompute at a time drains the list (concurrent uploads are folded into a single pass).
 */
export const peerStatisticsRequests = pgTable(
  'peer_statistics_requests',
  {
    controlLotId: uuid()
      .notNull()
      .references(() => controlLots.id),
    analyteId: uuid()
      .notNull()
      .references(() => analytes.id),
    level: integer().notNull(),
    period: text().notNull(),
    requestedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.controlLotId, t.analyteId, t.level, t.period] })],
);

/**
 * A peer group whose provisional figures for one level, period and scope could not be computed on the
 * last recompute, with the reason. The other groups of that recompute were still computed; the next
 * recompute that computes the group removes the row. Shown to the coordinator.
 */
export const peerStatisticsFailures = pgTable(
  'peer_statistics_failures',
  {
    peerGroupId: uuid()
      .notNull()
      .references(() => peerGroups.id),
    level: integer().notNull(),
    period: text().notNull(),
    scope: text().notNull(),
    reason: text().notNull(),
    failedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.peerGroupId, t.level, t.period, t.scope] }), index().on(t.period)],
);
