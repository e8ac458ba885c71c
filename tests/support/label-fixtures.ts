import type { IngredientDecl, RecipeComponent, RecipeInput } from '../../shared/domain/recipe-flatten';

/** An invented ingredient with safe defaults (verified, confirmed, no allergens). */
export function ingredient(id: string, labelName: string, extra: Partial<IngredientDecl> = {}): IngredientDecl {
  return { id, labelName, subIngredients: [], allergens: [], needsTimeTemperatureControl: false, isVerified: true, allergensConfirmed: true, ...extra };
}

/** A recipe from [id, grams] pairs; ids starting with "r:" are sub-recipes. */
export function recipe(id: string, name: string, parts: Array<[string, string | number]>, yieldGrams?: string): RecipeInput {
  const components: RecipeComponent[] = parts.map(([ref, grams]) =>
    ref.startsWith('r:') ? { kind: 'recipe', recipeId: ref.slice(2), grams } : { kind: 'ingredient', ingredientId: ref, grams });
  return { id, name, components, yieldGrams };
}
