import { pgTable, text, uuid, integer, numeric, timestamp, uniqueIndex, index } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';
import { batches } from './batches';

// All holding tables are append-only evidence: a period is a start fact plus later readings, one stop
// and the corrective actions; nothing is ever updated. Who acted is kept by name and role because an
// enrolled kitchen device has no user id.

/**
 * The business's written procedure for time as a public health control (FDA Food Code 2022
 * 3-501.19(A)); each save is a new version, the highest is current.
 */
export const writtenProcedures = pgTable(
  'written_procedures',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    topic: text().notNull(),
    version: integer().notNull(),
    title: text().notNull(),
    body: text().notNull(),
    createdByUserId: uuid().references(() => users.id),
    createdByName: text().notNull(),
    ...timestamps,
  },
  (t) => [uniqueIndex('written_procedures_business_id_topic_version_key').on(t.businessId, t.topic, t.version)],
);
export type WrittenProcedureRow = typeof writtenProcedures.$inferSelect;

/** A period out of temperature control, with the policy as it stood at the start. */
export const holdingPeriods = pgTable(
  'holding_periods',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    batchId: uuid().notNull().references(() => batches.id),
    kind: text().notNull(),
    label: text().notNull().default(''),
    policy: text().notNull(),
    /** Custom (quality) limit in minutes; null for other policies. */
    customLimitMinutes: integer(),
    /** The limit in force at the start, in minutes (TPHC 240/360, cooling 360 in all); null for none. */
    limitMinutes: integer(),
    /** Where the policy came from: 'recipe', 'rule_profile' or 'chosen'. */
    policySource: text().notNull(),
    ruleProfileId: text().notNull(),
    writtenProcedureId: uuid().references(() => writtenProcedures.id),
    startedAt: timestamp({ withTimezone: true }).notNull(),
    startedByUserId: uuid().references(() => users.id),
    startedByName: text().notNull(),
    startedByRole: text().notNull(),
    ...timestamps,
  },
  (t) => [index('holding_periods_business_id_started_at_idx').on(t.businessId, t.startedAt), index('holding_periods_batch_id_idx').on(t.batchId)],
);
export type HoldingPeriodRow = typeof holdingPeriods.$inferSelect;

/** A temperature reading as entered (value in its own unit, exact decimal). */
export const holdingReadings = pgTable(
  'holding_readings',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    periodId: uuid().notNull().references(() => holdingPeriods.id),
    value: numeric({ precision: 7, scale: 2 }).notNull(),
    unit: text().notNull(),
    takenAt: timestamp({ withTimezone: true }).notNull(),
    takenByUserId: uuid().references(() => users.id),
    takenByName: text().notNull(),
    takenByRole: text().notNull(),
    ...timestamps,
  },
  (t) => [index('holding_readings_period_id_idx').on(t.periodId)],
);
export type HoldingReadingRow = typeof holdingReadings.$inferSelect;

/** The end of a period; at most one per period. */
export const holdingStops = pgTable(
  'holding_stops',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    periodId: uuid().notNull().references(() => holdingPeriods.id),
    stoppedAt: timestamp({ withTimezone: true }).notNull(),
    stoppedByUserId: uuid().references(() => users.id),
    stoppedByName: text().notNull(),
    stoppedByRole: text().notNull(),
    note: text().notNull().default(''),
    ...timestamps,
  },
  (t) => [uniqueIndex('holding_stops_period_id_key').on(t.periodId)],
);
export type HoldingStopRow = typeof holdingStops.$inferSelect;

/** A corrective action: 'discarded', 'reheated', or 'reason' (a custom limit closed with a reason). */
export const holdingActions = pgTable(
  'holding_actions',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    periodId: uuid().notNull().references(() => holdingPeriods.id),
    action: text().notNull(),
    reason: text().notNull().default(''),
    recordedAt: timestamp({ withTimezone: true }).notNull(),
    recordedByUserId: uuid().references(() => users.id),
    recordedByName: text().notNull(),
    recordedByRole: text().notNull(),
    ...timestamps,
  },
  (t) => [index('holding_actions_period_id_idx').on(t.periodId)],
);
export type HoldingActionRow = typeof holdingActions.$inferSelect;
