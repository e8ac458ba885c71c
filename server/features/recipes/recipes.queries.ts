import { and, desc, eq, inArray, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { recipeVersions } from '../../db/schema/recipes';
import { notFound } from '../../lib/http-error';
import { loadIngredientDecls } from '../ingredients/ingredients.queries';
import { businessRuleProfile } from '../rule-profiles/rule-profiles.service';
import type { RuleProfile } from '../../../shared/contracts/rule-profiles';
import type { LabelText } from '../../../shared/domain/label-text';
import type { IngredientDecl, RecipeInput } from '../../../shared/domain/recipe-flatten';
import { labelTextForRecipe, recipeInputOf, type RecipeVersionForLabel } from '../../../shared/domain/recipe-label';

export type RecipeVersionRow = typeof recipeVersions.$inferSelect;

/** The current (highest) version of each recipe of a business, optionally only the given ids. */
export async function currentRecipeVersions(db: DbOrTx, businessId: string, ids?: readonly string[]): Promise<RecipeVersionRow[]> {
  if (ids && ids.length === 0) return [];
  const where: SQL[] = [eq(recipeVersions.businessId, businessId)];
  if (ids) where.push(inArray(recipeVersions.recipeId, [...ids]));
  return db
    .selectDistinctOn([recipeVersions.recipeId])
    .from(recipeVersions)
    .where(and(...where))
    .orderBy(recipeVersions.recipeId, desc(recipeVersions.version));
}

const num = (v: string | null) => (v === null ? null : Number(v));

/** What the label engine reads from a stored version. */
export function toRecipeForLabel(v: RecipeVersionRow): RecipeVersionForLabel {
  return {
    recipeId: v.recipeId,
    name: v.name,
    isSellable: v.isSellable,
    components: v.components.map((c) => (c.kind === 'ingredient' ? { kind: c.kind, ingredientId: c.ingredientId, grams: c.grams } : { kind: c.kind, recipeId: c.recipeId, grams: c.grams })),
    yieldGrams: v.yieldGrams,
    pieceGrams: v.pieceGrams,
    piecesPerPackage: v.piecesPerPackage,
    ph: num(v.ph),
    waterActivity: num(v.waterActivity),
    isHeatTreatedAndPackaged: v.isHeatTreatedAndPackaged,
  };
}

export interface LabelSources {
  /** Current version of every recipe of the business, by recipe id. */
  rows: Map<string, RecipeVersionRow>;
  recipes: Map<string, RecipeInput>;
  ingredients: Map<string, IngredientDecl>;
}

/** Everything the label engine may need for the business's recipes: current recipes and ingredient declarations. */
export async function loadLabelSources(db: DbOrTx, businessId: string): Promise<LabelSources> {
  const [rows, ingredients] = await Promise.all([currentRecipeVersions(db, businessId), loadIngredientDecls(db, businessId)]);
  return {
    rows: new Map(rows.map((r) => [r.recipeId, r])),
    recipes: new Map(rows.map((r) => [r.recipeId, recipeInputOf(toRecipeForLabel(r))])),
    ingredients,
  };
}

/** One stored version by its row id, scoped to the business; 404 otherwise. */
export async function getRecipeVersionById(db: DbOrTx, businessId: string, recipeVersionId: string): Promise<RecipeVersionRow> {
  const [row] = await db.select().from(recipeVersions).where(and(eq(recipeVersions.businessId, businessId), eq(recipeVersions.id, recipeVersionId)));
  if (!row) throw notFound('That recipe version');
  return row;
}

/**
 * The version a new batch pins: the given version number, or the current one. 404 for another business's
 * recipe; 400-worthy states (archived, not sellable) are left to the caller, which knows its rules.
 */
export async function getRecipeVersionForBatch(db: DbOrTx, businessId: string, recipeId: string, version?: number): Promise<RecipeVersionRow> {
  const where: SQL[] = [eq(recipeVersions.businessId, businessId), eq(recipeVersions.recipeId, recipeId)];
  if (version !== undefined) where.push(eq(recipeVersions.version, version));
  const [row] = await db.select().from(recipeVersions).where(and(...where)).orderBy(desc(recipeVersions.version)).limit(1);
  if (!row) throw notFound('That recipe');
  return row;
}

/**
 * Label text for a stored recipe version, computed now: that version's own components and figures, with the
 * current sub-recipes and ingredient declarations, under `profile` (default: the business's rule profile).
 * The saved `labelSnapshot` of the version is what it was when saved; this is what it would print today.
 */
export async function computeLabelText(db: DbOrTx, businessId: string, recipeVersionId: string, profile?: RuleProfile): Promise<LabelText> {
  const row = await getRecipeVersionById(db, businessId, recipeVersionId);
  const [sources, rules] = await Promise.all([loadLabelSources(db, businessId), profile ? Promise.resolve(profile) : businessRuleProfile(db, businessId)]);
  return labelTextForRecipe(toRecipeForLabel(row), sources.recipes, sources.ingredients, rules);
}
