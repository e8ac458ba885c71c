import { performance } from 'node:perf_hooks';
import { buildLabelText } from '../../shared/domain/label-text';
import { toLookup, type IngredientDecl, type RecipeInput } from '../../shared/domain/recipe-flatten';
import { getRuleProfile } from '../../shared/domain/rule-profiles';
import type { AllergenDecl } from '../../shared/domain/allergens';

// Synthetic recipe with `leaves` distinct ingredients spread over three levels of sub-recipes (10 per group).
function synthetic(leaves: number) {
  const decls: AllergenDecl[][] = [[], [{ source: 'milk' }], [{ source: 'wheat' }], [{ source: 'tree_nut', kind: 'pecan' }], [{ source: 'soy' }, { source: 'egg' }]];
  const ingredients: IngredientDecl[] = Array.from({ length: leaves }, (_, i) => ({
    id: `ing-${i}`, labelName: `Ingredient ${i % 7 === 0 ? 'whey' : 'part'} ${i}`, subIngredients: i % 3 === 0 ? ['sugar', 'corn starch', `colour ${i}`] : [],
    allergens: decls[i % decls.length], sulphitesMgPerKg: null, needsTimeTemperatureControl: false, isVerified: true, allergensConfirmed: true,
  }));
  const recipes: RecipeInput[] = [];
  const groups: string[] = [];
  for (let g = 0; g * 10 < leaves; g++) {
    const id = `leafgroup-${g}`;
    recipes.push({ id, name: `Group ${g}`, components: ingredients.slice(g * 10, g * 10 + 10).map((ing, j) => ({ kind: 'ingredient', ingredientId: ing.id, grams: `${(j + 1) * 3.25 + g}` })) });
    groups.push(id);
  }
  const mids: string[] = [];
  for (let m = 0; m * 10 < groups.length; m++) {
    const id = `mid-${m}`;
    recipes.push({ id, name: `Mid ${m}`, components: groups.slice(m * 10, m * 10 + 10).map((r, j) => ({ kind: 'recipe', recipeId: r, grams: `${50 + j}` })) });
    mids.push(id);
  }
  const top: RecipeInput = { id: 'top', name: 'Top', components: mids.map((r, j) => ({ kind: 'recipe', recipeId: r, grams: `${200 + j * 7}` })) };
  recipes.push(top);
  return { recipe: top, recipes: toLookup(recipes), ingredients: toLookup(ingredients) };
}

function medianMs(leaves: number, iterations: number): number {
  const input = { ...synthetic(leaves), profile: getRuleProfile('uk-ppds-2021')!, options: { netQuantity: { grams: '226.796185' }, lessThanThreshold: 2 as const } };
  for (let i = 0; i < 5; i++) buildLabelText(input);
  const times: number[] = [];
  for (let i = 0; i < iterations; i++) {
    const t0 = performance.now();
    const out = buildLabelText(input);
    times.push(performance.now() - t0);
    if (out.leaves.length !== leaves) throw new Error(`expected ${leaves} leaves, got ${out.leaves.length}`);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)];
}

const leaves200Ms = medianMs(200, 31);
const leaves2000Ms = medianMs(2000, 15);
const round = (n: number) => Math.round(n * 1000) / 1000;
console.log(JSON.stringify({ name: 'label-engine', leaves200Ms: round(leaves200Ms), leaves2000Ms: round(leaves2000Ms), ratio: round(leaves2000Ms / leaves200Ms), goalRatio: 15 }));
