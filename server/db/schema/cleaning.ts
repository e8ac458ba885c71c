import { pgTable, text, uuid, integer, numeric, boolean, jsonb, date, timestamp, uniqueIndex, index } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';
import { batches } from './batches';

/** A template step as stored: its key is stable within the template (entries point at it). */
export interface StoredCleaningStep {
  key: string;
  kind: 'wash' | 'rinse' | 'sanitise' | 'air_dry' | 'custom';
  label: string;
}

// Equipment, sanitiser products and templates are mutable settings (each change writes a record event).
// Runs, their versions, step entries and signatures are append-only evidence.

export const equipment = pgTable(
  'equipment',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    name: text().notNull(),
    kind: text().notNull(),
    isFoodContact: boolean().notNull(),
    location: text().notNull().default(''),
    archivedAt: timestamp({ withTimezone: true }),
    ...timestamps,
  },
  (t) => [index('equipment_business_id_idx').on(t.businessId)],
);
export type EquipmentRow = typeof equipment.$inferSelect;

/** A sanitiser product with the ranges printed on its label (ppm = mg/L). */
export const sanitiserProducts = pgTable(
  'sanitiser_products',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    name: text().notNull(),
    sanitiser: text().notNull(),
    labelMinPpm: numeric({ precision: 8, scale: 2 }).notNull(),
    labelMaxPpm: numeric({ precision: 8, scale: 2 }).notNull(),
    labelMinTempC: numeric({ precision: 5, scale: 1 }),
    labelContactSeconds: integer(),
    labelMaxHardnessPpm: integer(),
    archivedAt: timestamp({ withTimezone: true }),
    ...timestamps,
  },
  (t) => [index('sanitiser_products_business_id_idx').on(t.businessId)],
);
export type SanitiserProductRow = typeof sanitiserProducts.$inferSelect;

export const cleaningTemplates = pgTable(
  'cleaning_templates',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    name: text().notNull(),
    /** 'daily' or 'per_batch'. */
    frequency: text().notNull(),
    steps: jsonb().$type<StoredCleaningStep[]>().notNull(),
    equipmentIds: jsonb().$type<string[]>().notNull().default([]),
    archivedAt: timestamp({ withTimezone: true }),
    ...timestamps,
  },
  (t) => [index('cleaning_templates_business_id_idx').on(t.businessId)],
);
export type CleaningTemplateRow = typeof cleaningTemplates.$inferSelect;

/** One cleaning run: the template as it stood at the start; identity never changes. */
export const cleaningRuns = pgTable(
  'cleaning_runs',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    templateId: uuid().notNull().references(() => cleaningTemplates.id),
    templateName: text().notNull(),
    frequency: text().notNull(),
    steps: jsonb().$type<StoredCleaningStep[]>().notNull(),
    equipmentIds: jsonb().$type<string[]>().notNull(),
    batchId: uuid().references(() => batches.id),
    /** Calendar date in the business's zone. */
    runDate: date({ mode: 'string' }).notNull(),
    startedAt: timestamp({ withTimezone: true }).notNull(),
    startedByUserId: uuid().references(() => users.id),
    startedByName: text().notNull(),
    startedByRole: text().notNull(),
    ...timestamps,
  },
  (t) => [index('cleaning_runs_business_id_run_date_idx').on(t.businessId, t.runDate), index('cleaning_runs_batch_id_idx').on(t.batchId)],
);
export type CleaningRunRow = typeof cleaningRuns.$inferSelect;

/** A version of a run; a correction is the next version with a reason. The highest is current. */
export const cleaningRunVersions = pgTable(
  'cleaning_run_versions',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    runId: uuid().notNull().references(() => cleaningRuns.id),
    version: integer().notNull(),
    notes: text().notNull().default(''),
    reason: text(),
    createdAt: timestamp({ withTimezone: true }).notNull(),
    createdByUserId: uuid().references(() => users.id),
    createdByName: text().notNull(),
    createdByRole: text().notNull(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('cleaning_run_versions_run_id_version_key').on(t.runId, t.version)],
);
export type CleaningRunVersionRow = typeof cleaningRunVersions.$inferSelect;

/**
 * One step done (or an explanation of a failed check), in one run version. A correction carries the
 * earlier version's entries over as new rows (carriedFromEntryId) so every version is complete.
 */
export const cleaningStepEntries = pgTable(
  'cleaning_step_entries',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    runId: uuid().notNull().references(() => cleaningRuns.id),
    runVersionId: uuid().notNull().references(() => cleaningRunVersions.id),
    stepKey: text().notNull(),
    /** 'step' (done) or 'explanation' (a reason for a failed check in explainsEntryId). */
    entryKind: text().notNull(),
    explainsEntryId: uuid(),
    doneAt: timestamp({ withTimezone: true }).notNull(),
    doneByUserId: uuid().references(() => users.id),
    doneByName: text().notNull(),
    doneByRole: text().notNull(),
    note: text().notNull().default(''),
    sanitiser: text(),
    sanitiserProductId: uuid().references(() => sanitiserProducts.id),
    /** The product's label as it stood when the step was recorded. */
    sanitiserLabel: jsonb().$type<Record<string, unknown> | null>(),
    concentrationPpm: numeric({ precision: 8, scale: 2 }),
    temperatureValue: numeric({ precision: 6, scale: 2 }),
    temperatureUnit: text(),
    ph: numeric({ precision: 4, scale: 2 }),
    contactSeconds: integer(),
    hardnessPpm: integer(),
    checkPassed: boolean(),
    checkProblems: jsonb().$type<Array<{ field: string; message: string }>>(),
    /** Why a failed check was accepted (given with the step, or later in an explanation entry). */
    failureReason: text(),
    carriedFromEntryId: uuid(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('cleaning_step_entries_run_version_id_idx').on(t.runVersionId), index('cleaning_step_entries_business_id_done_at_idx').on(t.businessId, t.doneAt)],
);
export type CleaningStepEntryRow = typeof cleaningStepEntries.$inferSelect;

/**
 * A signature (21 CFR 11.50/11.70 model): printed name, time, meaning and the SHA-256 of the signed
 * version's content. It shows as valid only while that hash matches the version's content.
 */
export const cleaningSignatures = pgTable(
  'cleaning_signatures',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    runId: uuid().notNull().references(() => cleaningRuns.id),
    runVersionId: uuid().notNull().references(() => cleaningRunVersions.id),
    version: integer().notNull(),
    recordHash: text().notNull(),
    signerUserId: uuid().notNull().references(() => users.id),
    printedName: text().notNull(),
    signerRole: text().notNull(),
    meaning: text().notNull(),
    signedAt: timestamp({ withTimezone: true }).notNull(),
    /** The kitchen device the signature was given on, if any. */
    deviceName: text(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('cleaning_signatures_run_version_id_key').on(t.runVersionId), index('cleaning_signatures_business_id_signed_at_idx').on(t.businessId, t.signedAt)],
);
export type CleaningSignatureRow = typeof cleaningSignatures.$inferSelect;
