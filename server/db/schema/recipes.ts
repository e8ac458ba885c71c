import { pgTable, text, uuid, integer, boolean, jsonb, numeric, uniqueIndex, index } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';

/** `entered` keeps the amount and unit as typed (display only); `grams` is the exact stored weight. */
export type StoredRecipeComponent =
  | { kind: 'ingredient'; ingredientId: string; grams: string; entered?: { amount: string; unit: 'g' | 'kg' | 'oz' | 'lb' } }
  | { kind: 'recipe'; recipeId: string; grams: string; entered?: { amount: string; unit: 'g' | 'kg' | 'oz' | 'lb' } };

export const recipes = pgTable(
  'recipes',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    ...timestamps,
  },
  (t) => [index('recipes_business_id_idx').on(t.businessId)],
);

/**
 * Append-only: saving a recipe makes a new immutable version; batches pin one. `labelSnapshot` keeps the
 * label text computed when the version was saved, so later ingredient edits show up as a change.
 */
export const recipeVersions = pgTable(
  'recipe_versions',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    recipeId: uuid().notNull().references(() => recipes.id),
    version: integer().notNull(),
    name: text().notNull(),
    /** Sellable product (labels, batches) or an in-between recipe such as a frosting. */
    isSellable: boolean().notNull().default(true),
    components: jsonb().$type<StoredRecipeComponent[]>().notNull(),
    /** Weight of the finished batch, grams (exact decimal, unbounded scale: 1 oz = 28.349523125 g); null = sum of components. */
    yieldGrams: numeric(),
    yieldPieces: integer(),
    pieceGrams: numeric(),
    piecesPerPackage: integer(),
    shelfLifeDays: integer(),
    ph: numeric({ precision: 4, scale: 2 }),
    waterActivity: numeric({ precision: 4, scale: 3 }),
    isHeatTreatedAndPackaged: boolean().notNull().default(true),
    holdingPolicy: text(),
    notes: text().notNull().default(''),
    labelSnapshot: jsonb().$type<unknown>(),
    reason: text(),
    createdByUserId: uuid().references(() => users.id),
    isArchived: boolean().notNull().default(false),
    ...timestamps,
  },
  (t) => [
    uniqueIndex('recipe_versions_recipe_id_version_key').on(t.recipeId, t.version),
    index('recipe_versions_business_id_idx').on(t.businessId),
  ],
);
