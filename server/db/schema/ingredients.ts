import { pgTable, text, uuid, integer, boolean, jsonb, numeric, timestamp, date, uniqueIndex, index } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';
import type { AllergenDecl } from '../../../shared/domain/allergens';

/** The stable identity of an ingredient; what it declares lives in its versions. */
export const ingredients = pgTable(
  'ingredients',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    ...timestamps,
  },
  (t) => [index('ingredients_business_id_idx').on(t.businessId)],
);

/** Append-only: an edit is a new version with a reason; the latest version is the current one. */
export const ingredientVersions = pgTable(
  'ingredient_versions',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    ingredientId: uuid().notNull().references(() => ingredients.id),
    version: integer().notNull(),
    labelName: text().notNull(),
    subIngredients: jsonb().$type<string[]>().notNull().default([]),
    allergens: jsonb().$type<AllergenDecl[]>().notNull().default([]),
    allergensConfirmed: boolean().notNull().default(false),
    sulphitesMgPerKg: numeric({ precision: 12, scale: 3 }),
    needsTimeTemperatureControl: boolean().notNull().default(false),
    supplierName: text().notNull().default(''),
    supplierItemCode: text().notNull().default(''),
    notes: text().notNull().default(''),
    isArchived: boolean().notNull().default(false),
    verifiedByUserId: uuid().references(() => users.id),
    verifiedAt: timestamp({ withTimezone: true }),
    reason: text(),
    createdByUserId: uuid().references(() => users.id),
    ...timestamps,
  },
  (t) => [
    uniqueIndex('ingredient_versions_ingredient_id_version_key').on(t.ingredientId, t.version),
    index('ingredient_versions_business_id_idx').on(t.businessId),
  ],
);

/** Photos or PDFs of the supplier's label, stored through the storage module under a random key. */
export const ingredientLabelFiles = pgTable(
  'ingredient_label_files',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    ingredientId: uuid().notNull().references(() => ingredients.id),
    storageKey: text().notNull(),
    originalName: text().notNull(),
    contentType: text().notNull(),
    byteSize: integer().notNull(),
    sha256: text().notNull(),
    uploadedByUserId: uuid().references(() => users.id),
    ...timestamps,
  },
  (t) => [index('ingredient_label_files_ingredient_id_idx').on(t.ingredientId)],
);

/** A lot of an ingredient as received from the supplier (append-only). */
export const supplierLots = pgTable(
  'supplier_lots',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    ingredientId: uuid().notNull().references(() => ingredients.id),
    lotCode: text().notNull(),
    receivedOn: date({ mode: 'string' }).notNull(),
    bestBy: date({ mode: 'string' }),
    quantity: text().notNull().default(''),
    notes: text().notNull().default(''),
    createdByUserId: uuid().references(() => users.id),
    ...timestamps,
  },
  (t) => [
    index('supplier_lots_business_id_idx').on(t.businessId),
    index('supplier_lots_ingredient_id_idx').on(t.ingredientId),
  ],
);

/** A person compared a new lot's package label with the stored one (suppliers change recipes). */
export const supplierLotLabelChecks = pgTable(
  'supplier_lot_label_checks',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    supplierLotId: uuid().notNull().references(() => supplierLots.id),
    outcome: text({ enum: ['matches', 'changed'] }).notNull(),
    notes: text().notNull().default(''),
    checkedByUserId: uuid().notNull().references(() => users.id),
    checkedAt: timestamp({ withTimezone: true }).notNull(),
    ...timestamps,
  },
  (t) => [index('supplier_lot_label_checks_supplier_lot_id_idx').on(t.supplierLotId)],
);
