import { and, desc, eq, inArray, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { recipeVersions } from '../../db/schema/recipes';
import { ingredientVersions, supplierLots } from '../../db/schema/ingredients';
import { batches, batchVersions } from '../../db/schema/batches';
import { businesses } from '../../db/schema/business';
import type { IngredientDecl, RecipeInput } from '../../../shared/domain/recipe-flatten';

// Reads of other features' tables (recipes, ingredients, supplier lots) until their services offer them.

export type RecipeVersionRow = typeof recipeVersions.$inferSelect;

export async function findBusiness(db: DbOrTx, businessId: string) {
  const [row] = await db.select().from(businesses).where(eq(businesses.id, businessId));
  return row;
}

export async function findRecipeVersion(db: DbOrTx, businessId: string, recipeVersionId: string): Promise<RecipeVersionRow | undefined> {
  const [row] = await db
    .select()
    .from(recipeVersions)
    .where(and(eq(recipeVersions.id, recipeVersionId), eq(recipeVersions.businessId, businessId)));
  return row;
}

/** The newest version of every recipe of the business (what a sub-recipe reference resolves to). */
export async function latestRecipeVersions(db: DbOrTx, businessId: string): Promise<RecipeVersionRow[]> {
  const rows = await db.execute<{ id: string }>(sql`
    select distinct on (recipe_id) id from recipe_versions where business_id = ${businessId} order by recipe_id, version desc`);
  const ids = rows.rows.map((r) => r.id);
  if (ids.length === 0) return [];
  return db.select().from(recipeVersions).where(inArray(recipeVersions.id, ids));
}

/** Every version of every recipe of the business, newest first. */
export async function allRecipeVersions(db: DbOrTx, businessId: string): Promise<RecipeVersionRow[]> {
  return db.select().from(recipeVersions).where(eq(recipeVersions.businessId, businessId)).orderBy(recipeVersions.name, desc(recipeVersions.version));
}

export function toRecipeInput(v: RecipeVersionRow): RecipeInput {
  return { id: v.recipeId, name: v.name, components: v.components, yieldGrams: v.yieldGrams };
}

/** Current declaration of each ingredient of the business (newest version). */
export async function currentIngredients(db: DbOrTx, businessId: string): Promise<Map<string, IngredientDecl>> {
  const rows = await db.execute<{ ingredient_id: string; label_name: string; needs_time_temperature_control: boolean; allergens_confirmed: boolean; verified_at: Date | null }>(sql`
    select distinct on (ingredient_id) ingredient_id, label_name, needs_time_temperature_control, allergens_confirmed, verified_at
    from ${ingredientVersions} where business_id = ${businessId} order by ingredient_id, version desc`);
  return new Map(
    rows.rows.map((r) => [
      r.ingredient_id,
      {
        id: r.ingredient_id,
        labelName: r.label_name,
        subIngredients: [],
        allergens: [],
        needsTimeTemperatureControl: r.needs_time_temperature_control,
        isVerified: r.verified_at != null,
        allergensConfirmed: r.allergens_confirmed,
      },
    ]),
  );
}

export async function supplierLotsFor(db: DbOrTx, businessId: string, ingredientIds: string[]) {
  if (ingredientIds.length === 0) return [];
  return db
    .select({ id: supplierLots.id, ingredientId: supplierLots.ingredientId, lotCode: supplierLots.lotCode, receivedOn: supplierLots.receivedOn, bestBy: supplierLots.bestBy })
    .from(supplierLots)
    .where(and(eq(supplierLots.businessId, businessId), inArray(supplierLots.ingredientId, ingredientIds)))
    .orderBy(desc(supplierLots.receivedOn), desc(supplierLots.createdAt));
}

/** Batches of the given recipes (for sub-recipe pickers), newest first. */
export async function batchesOfRecipes(db: DbOrTx, businessId: string, recipeIds: string[]) {
  if (recipeIds.length === 0) return [];
  return db
    .select({ id: batches.id, recipeId: batches.recipeId, lotCode: batches.lotCode, madeOn: batches.madeOn, state: batches.state, bestBy: batchVersions.bestBy })
    .from(batches)
    .innerJoin(batchVersions, and(eq(batchVersions.batchId, batches.id), eq(batchVersions.version, batches.currentVersion)))
    .where(and(eq(batches.businessId, businessId), inArray(batches.recipeId, recipeIds)))
    .orderBy(desc(batches.madeOn), desc(batches.daySequence))
    .limit(200);
}
