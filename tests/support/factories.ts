import type { TestApp } from './app';
import { uniqueSuffix } from './db';
import { ingredients, ingredientVersions, supplierLots } from '../../server/db/schema/ingredients';
import { recipes, recipeVersions, type StoredRecipeComponent } from '../../server/db/schema/recipes';
import { createBatch as createBatchService } from '../../server/features/batches/batches.service';
import type { Actor } from '../../server/lib/actor';
import type { AllergenDecl } from '../../shared/domain/allergens';
import type { BatchDetail, CreateBatchInput } from '../../shared/contracts/batches';

// Small row factories for tests of features that point at ingredients, recipes, lots and batches.
// They insert rows directly (no record events), so they suit arranging data, not testing those features.

export interface IngredientFactoryInput {
  labelName?: string;
  subIngredients?: string[];
  allergens?: AllergenDecl[];
  allergensConfirmed?: boolean;
  needsTimeTemperatureControl?: boolean;
  supplierName?: string;
  verified?: boolean;
}

/** An ingredient with one version; answers { id, labelName }. */
export async function createIngredient(t: TestApp, businessId: string, input: IngredientFactoryInput = {}) {
  const labelName = input.labelName ?? `Ingredient ${uniqueSuffix()}`;
  const [ingredient] = await t.db.insert(ingredients).values({ businessId }).returning();
  await t.db.insert(ingredientVersions).values({
    businessId,
    ingredientId: ingredient!.id,
    version: 1,
    labelName,
    subIngredients: input.subIngredients ?? [],
    allergens: input.allergens ?? [],
    allergensConfirmed: input.allergensConfirmed ?? true,
    needsTimeTemperatureControl: input.needsTimeTemperatureControl ?? false,
    supplierName: input.supplierName ?? '',
    verifiedAt: input.verified === false ? null : new Date(),
  });
  return { id: ingredient!.id, labelName };
}

export interface SupplierLotFactoryInput {
  ingredientId: string;
  lotCode?: string;
  receivedOn?: string;
  bestBy?: string | null;
}

/** A received supplier lot of an ingredient; answers the row. */
export async function createSupplierLot(t: TestApp, businessId: string, input: SupplierLotFactoryInput) {
  const [lot] = await t.db
    .insert(supplierLots)
    .values({ businessId, ingredientId: input.ingredientId, lotCode: input.lotCode ?? `SL-${uniqueSuffix()}`, receivedOn: input.receivedOn ?? '2026-11-20', bestBy: input.bestBy ?? null })
    .returning();
  return lot!;
}

export interface RecipeVersionFactoryInput {
  /** Adds a version to this recipe; without it a new recipe is made. */
  recipeId?: string;
  name?: string;
  version?: number;
  components: StoredRecipeComponent[];
  isSellable?: boolean;
  shelfLifeDays?: number | null;
  yieldGrams?: string | null;
  yieldPieces?: number | null;
  pieceGrams?: string | null;
  piecesPerPackage?: number | null;
  holdingPolicy?: string | null;
  isHeatTreatedAndPackaged?: boolean;
}

/** A recipe version (and its recipe unless recipeId is given); answers the version row (recipeId, id, ...). */
export async function createRecipeVersion(t: TestApp, businessId: string, input: RecipeVersionFactoryInput) {
  const recipeId = input.recipeId ?? (await t.db.insert(recipes).values({ businessId }).returning())[0]!.id;
  const [version] = await t.db
    .insert(recipeVersions)
    .values({
      businessId,
      recipeId,
      version: input.version ?? 1,
      name: input.name ?? `Recipe ${uniqueSuffix()}`,
      isSellable: input.isSellable ?? true,
      components: input.components,
      shelfLifeDays: input.shelfLifeDays === undefined ? 5 : input.shelfLifeDays,
      yieldGrams: input.yieldGrams ?? null,
      yieldPieces: input.yieldPieces ?? null,
      pieceGrams: input.pieceGrams ?? null,
      piecesPerPackage: input.piecesPerPackage ?? null,
      holdingPolicy: input.holdingPolicy ?? null,
      isHeatTreatedAndPackaged: input.isHeatTreatedAndPackaged ?? true,
    })
    .returning();
  return version!;
}

/** A recipe of one or more new ingredients, each with one received lot; handy default for batch tests. */
export async function createSimpleRecipe(t: TestApp, businessId: string, names: string[] = ['Flour', 'Sugar']) {
  const made = [];
  for (const name of names) {
    const ingredient = await createIngredient(t, businessId, { labelName: `${name} ${uniqueSuffix()}` });
    const lot = await createSupplierLot(t, businessId, { ingredientId: ingredient.id });
    made.push({ ingredient, lot });
  }
  const recipeVersion = await createRecipeVersion(t, businessId, {
    components: made.map((m) => ({ kind: 'ingredient' as const, ingredientId: m.ingredient.id, grams: '100' })),
  });
  return { recipeVersion, ingredients: made };
}

/**
 * A batch through the batches service (so lot code, inputs, state and record event are real). `actor`
 * defaults to an owner-like actor with no user; pass a member's userId to set "made by".
 */
export async function createBatch(t: TestApp, businessId: string, input: CreateBatchInput, actor: Partial<Actor> = {}): Promise<BatchDetail> {
  const who: Actor = { kind: 'member', businessId, userId: null, name: 'Test factory', role: 'owner', ...actor };
  return createBatchService(t.db, who, input, t.clock.now);
}
