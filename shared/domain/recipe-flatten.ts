import Decimal from 'decimal.js';
import type { AllergenDecl } from './allergens';

/**
 * Weights are decimal strings in grams as stored (e.g. "453.59237"); numbers are accepted too. All arithmetic
 * uses decimal.js at 40 significant digits, so exact conversions stay exact and sums do not drift.
 */
export type Grams = string | number;

/** A decimal.js clone used by the label engine, so nothing depends on the global Decimal settings. */
export const Dec = Decimal.clone({ precision: 40, rounding: Decimal.ROUND_HALF_EVEN });
export type Dec = InstanceType<typeof Dec>;

/** An ingredient as declared on its own package. */
export interface IngredientDecl {
  id: string;
  labelName: string;
  /** Ingredients of a compound ingredient, in the order the package declares them (21 CFR 101.4(b)(2)). */
  subIngredients: string[];
  allergens: AllergenDecl[];
  /** Total SO2 in the ingredient, mg/kg; null when unknown. */
  sulphitesMgPerKg?: number | null;
  needsTimeTemperatureControl: boolean;
  isVerified: boolean;
  allergensConfirmed: boolean;
}

export type RecipeComponent =
  | { kind: 'ingredient'; ingredientId: string; grams: Grams }
  | { kind: 'recipe'; recipeId: string; grams: Grams };

export interface RecipeInput {
  id: string;
  name: string;
  components: RecipeComponent[];
  /**
   * Weight of the finished batch (e.g. after baking). A sub-recipe used at `grams` contributes
   * grams / yieldGrams of each of its as-added weights. Defaults to the sum of its components.
   */
  yieldGrams?: Grams | null;
}

export type Lookup<T> = ReadonlyMap<string, T>;

/** Builds a lookup by id from a list. */
export function toLookup<T extends { id: string }>(items: readonly T[]): Lookup<T> {
  return new Map(items.map((i) => [i.id, i]));
}

/** One leaf ingredient of the flattened recipe, with its as-added weight in the top recipe's batch. */
export interface FlatLeaf {
  ingredient: IngredientDecl;
  grams: Dec;
}

export type FlattenErrorCode = 'recipe_loop' | 'recipe_missing' | 'ingredient_missing' | 'invalid_weight' | 'recipe_empty';

/** A recipe that cannot be flattened; `message` is written for the baker. */
export class RecipeFlattenError extends Error {
  constructor(readonly code: FlattenErrorCode, message: string) {
    super(message);
    this.name = 'RecipeFlattenError';
  }
}

const GRAMS_RE = /^\s*\d+(\.\d+)?\s*$/;

/** Parses a stored weight; throws RecipeFlattenError naming `where` when it is not a non-negative number. */
export function parseGrams(value: Grams, where: string): Dec {
  const ok = typeof value === 'number' ? Number.isFinite(value) && value >= 0 : GRAMS_RE.test(value);
  if (!ok) throw new RecipeFlattenError('invalid_weight', `${where}: the weight "${value}" is not a number of grams of zero or more.`);
  return new Dec(typeof value === 'number' ? value : value.trim());
}

interface Expanded {
  /** As-added grams per ingredient id for one whole batch of this recipe, in first-seen order. */
  grams: Map<string, Dec>;
  batch: Dec;
}

/**
 * Flattens a recipe into leaf ingredients with as-added weights (21 CFR 101.4(a)(1) orders by as-added
 * weight). Nested recipes at any depth are scaled by the portion used over their batch weight; the same
 * ingredient reached by several paths is summed. Each sub-recipe is expanded once (memoised), so the cost is
 * linear in the size of the recipe graph plus the leaves it produces. Leaves of zero grams are dropped.
 *
 * @throws RecipeFlattenError on a loop ("Recipe loop: Frosting → Filling → Frosting"), a missing recipe or
 * ingredient, a bad weight, or a sub-recipe whose batch weight is zero.
 */
export function flattenRecipe(recipe: RecipeInput, recipes: Lookup<RecipeInput>, ingredients: Lookup<IngredientDecl>): FlatLeaf[] {
  const memo = new Map<string, Expanded>();
  const path: RecipeInput[] = [];

  const expand = (r: RecipeInput): Expanded => {
    const done = memo.get(r.id);
    if (done) return done;
    const at = path.findIndex((p) => p.id === r.id);
    if (at >= 0) {
      const names = [...path.slice(at), r].map((p) => p.name);
      throw new RecipeFlattenError('recipe_loop', `Recipe loop: ${names.join(' → ')}`);
    }
    path.push(r);
    const grams = new Map<string, Dec>();
    let batch = new Dec(0);
    const add = (id: string, g: Dec) => {
      const prev = grams.get(id);
      grams.set(id, prev ? prev.plus(g) : g);
    };
    for (const c of r.components) {
      const g = parseGrams(c.grams, r.name);
      batch = batch.plus(g);
      if (c.kind === 'ingredient') {
        if (!ingredients.has(c.ingredientId)) {
          throw new RecipeFlattenError('ingredient_missing', `${r.name} uses an ingredient that no longer exists (${c.ingredientId}).`);
        }
        add(c.ingredientId, g);
        continue;
      }
      const sub = recipes.get(c.recipeId);
      if (!sub) throw new RecipeFlattenError('recipe_missing', `${r.name} uses a recipe that no longer exists (${c.recipeId}).`);
      const inner = expand(sub);
      if (g.isZero()) continue;
      const subBatch = sub.yieldGrams != null && sub.yieldGrams !== '' ? parseGrams(sub.yieldGrams, `${sub.name} yield`) : inner.batch;
      if (subBatch.isZero()) throw new RecipeFlattenError('recipe_empty', `${sub.name} has a batch weight of zero, so a portion of it cannot be worked out.`);
      const factor = g.div(subBatch);
      for (const [id, sg] of inner.grams) add(id, sg.times(factor));
    }
    path.pop();
    const out = { grams, batch };
    memo.set(r.id, out);
    return out;
  };

  const top = expand(recipe);
  const leaves: FlatLeaf[] = [];
  for (const [id, g] of top.grams) if (!g.isZero()) leaves.push({ ingredient: ingredients.get(id)!, grams: g });
  return leaves;
}
