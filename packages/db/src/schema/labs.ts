import { boolean, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';

/** A member laboratory. `code` is the de-identifying code other labs may see on coordinator screens. */
export const labs = pgTable('labs', {
  id: uuid().primaryKey().defaultRandom(),
  code: text().notNull().unique(),
  name: text().notNull(),
  active: boolean().notNull().default(true),
  /** 'si' or 'conventional': the units the lab prefers to read its report in. */
  preferredUnits: text().notNull().default('si'),
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
});
