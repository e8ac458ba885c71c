import { pgTable, text, uuid, integer, jsonb, date, timestamp, uniqueIndex, index } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';
import { recipes, recipeVersions } from './recipes';
import { ingredients, supplierLots } from './ingredients';

/** One production run of one recipe version. Identity fields never change. */
export const batches = pgTable(
  'batches',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    lotCode: text().notNull(),
    /** Unguessable code (>= 128 random bits) in the label's QR URL; never the lot code. */
    publicCode: text().notNull(),
    recipeId: uuid().notNull().references(() => recipes.id),
    recipeVersionId: uuid().notNull().references(() => recipeVersions.id),
    madeOn: date({ mode: 'string' }).notNull(),
    daySequence: integer().notNull(),
    /** Mirrors the latest batch_state_changes row (written in the same transaction) so lists filter by index. */
    state: text().notNull().default('in_progress'),
    /** Mirrors the highest batch_versions.version. */
    currentVersion: integer().notNull().default(1),
    createdByUserId: uuid().references(() => users.id),
    ...timestamps,
  },
  (t) => [
    uniqueIndex('batches_business_id_lot_code_key').on(t.businessId, t.lotCode),
    uniqueIndex('batches_business_id_made_on_day_sequence_key').on(t.businessId, t.madeOn, t.daySequence),
    index('batches_business_id_state_idx').on(t.businessId, t.state),
    uniqueIndex('batches_public_code_key').on(t.publicCode),
    index('batches_business_id_made_on_idx').on(t.businessId, t.madeOn),
  ],
);

/** Append-only: the batch's details; a correction is a new version with a reason. */
export const batchVersions = pgTable(
  'batch_versions',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    batchId: uuid().notNull().references(() => batches.id),
    version: integer().notNull(),
    madeByUserId: uuid().references(() => users.id),
    quantityPieces: integer(),
    quantityPackages: integer(),
    shelfLifeDays: integer(),
    bestBy: date({ mode: 'string' }),
    notes: text().notNull().default(''),
    /** Label text of the pinned recipe version as it stood when this version was saved. */
    labelSnapshot: jsonb().$type<unknown>(),
    reason: text(),
    createdByUserId: uuid().references(() => users.id),
    ...timestamps,
  },
  (t) => [uniqueIndex('batch_versions_batch_id_version_key').on(t.batchId, t.version)],
);

/**
 * What went in (append-only, per batch version): for an ingredient the supplier lot used, for a
 * sub-recipe another batch (e.g. a frosting made once for several batches). Trace walks these rows.
 */
export const batchInputs = pgTable(
  'batch_inputs',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    batchId: uuid().notNull().references(() => batches.id),
    batchVersionId: uuid().notNull().references(() => batchVersions.id),
    ingredientId: uuid().references(() => ingredients.id),
    supplierLotId: uuid().references(() => supplierLots.id),
    subRecipeId: uuid().references(() => recipes.id),
    sourceBatchId: uuid().references(() => batches.id),
    ...timestamps,
  },
  (t) => [
    index('batch_inputs_batch_version_id_idx').on(t.batchVersionId),
    index('batch_inputs_supplier_lot_id_idx').on(t.supplierLotId),
    index('batch_inputs_source_batch_id_idx').on(t.sourceBatchId),
  ],
);

/** Append-only state history: in progress → released → sold out; held; discarded; recalled. */
export const batchStateChanges = pgTable(
  'batch_state_changes',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    batchId: uuid().notNull().references(() => batches.id),
    fromState: text(),
    toState: text().notNull(),
    reason: text().notNull().default(''),
    changedByUserId: uuid().references(() => users.id),
    changedByName: text().notNull(),
    changedAt: timestamp({ withTimezone: true }).notNull(),
    details: jsonb().$type<Record<string, unknown>>().notNull().default({}),
    ...timestamps,
  },
  (t) => [index('batch_state_changes_batch_id_idx').on(t.batchId)],
);
