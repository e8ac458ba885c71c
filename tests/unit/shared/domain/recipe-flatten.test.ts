import { describe, expect, test } from 'vitest';
import { flattenRecipe, parseGrams, RecipeFlattenError, toLookup } from '../../../../shared/domain/recipe-flatten';
import { ingredient, recipe } from '../../../support/label-fixtures';

const ings = toLookup([ingredient('sugar', 'Sugar'), ingredient('butter', 'Butter'), ingredient('flour', 'Wheat flour'), ingredient('cocoa', 'Cocoa')]);
const byId = (leaves: ReturnType<typeof flattenRecipe>) => Object.fromEntries(leaves.map((l) => [l.ingredient.id, l.grams.toFixed()]));

describe('flattenRecipe', () => {
  // Weight order is as-added weight at formulation (21 CFR 101.4(a)(1)); a portion of a sub-recipe
  // contributes its share of each as-added weight.
  test.each([
    ['a single level sums repeated ingredients', [recipe('top', 'Top', [['sugar', '100'], ['sugar', '50.5'], ['butter', 20]])], { sugar: '150.5', butter: '20' }],
    ['half a sub-recipe contributes half of each weight', [
      recipe('frost', 'Frosting', [['sugar', '300'], ['butter', '100']]),
      recipe('top', 'Top', [['r:frost', '200'], ['sugar', '10']]),
    ], { sugar: '160', butter: '50' }],
    ['three levels scale by each portion in turn', [
      recipe('ganache', 'Ganache', [['cocoa', '50'], ['butter', '50']]),
      recipe('filling', 'Filling', [['r:ganache', '50'], ['sugar', '150']]),
      recipe('top', 'Top', [['r:filling', '100'], ['flour', '100']]),
    ], { cocoa: '12.5', butter: '12.5', sugar: '75', flour: '100' }],
    ['a yield below the as-added total (baking loss) scales by the yield', [
      recipe('cake', 'Cake', [['flour', '600'], ['sugar', '400']], '800'),
      recipe('top', 'Top', [['r:cake', '400']]),
    ], { flour: '300', sugar: '200' }],
    ['exact stored weights stay exact', [recipe('top', 'Top', [['sugar', '453.59237'], ['sugar', '28.349523125']])], { sugar: '481.941893125' }],
  ])('%s', (_name, recipes, expected) => {
    const top = recipes[recipes.length - 1];
    expect(byId(flattenRecipe(top, toLookup(recipes), ings))).toEqual(expected);
  });

  test('when the same sub-recipe is reached by two paths, then both portions are added', () => {
    const frost = recipe('frost', 'Frosting', [['sugar', '80'], ['butter', '20']]);
    const filling = recipe('filling', 'Filling', [['r:frost', '50'], ['cocoa', '50']]);
    const top = recipe('top', 'Top', [['r:frost', '100'], ['r:filling', '100']]);
    expect(byId(flattenRecipe(top, toLookup([frost, filling, top]), ings))).toEqual({ sugar: '120', butter: '30', cocoa: '50' });
  });

  test.each([
    ['a loop names the recipes in order', [recipe('frost', 'Frosting', [['r:fill', '10']]), recipe('fill', 'Filling', [['r:frost', '10']])], 'frost', 'recipe_loop', 'Recipe loop: Frosting → Filling → Frosting'],
    ['a recipe that uses itself', [recipe('a', 'Glaze', [['sugar', '1'], ['r:a', '1']])], 'a', 'recipe_loop', 'Recipe loop: Glaze → Glaze'],
    ['a missing sub-recipe', [recipe('a', 'Top', [['r:gone', '1']])], 'a', 'recipe_missing', 'Top uses a recipe that no longer exists (gone).'],
    ['a missing ingredient', [recipe('a', 'Top', [['nope', '1']])], 'a', 'ingredient_missing', 'Top uses an ingredient that no longer exists (nope).'],
    ['a negative weight', [recipe('a', 'Top', [['sugar', '-1']])], 'a', 'invalid_weight', 'Top: the weight "-1" is not a number of grams of zero or more.'],
    ['a zero-weight sub-recipe', [recipe('z', 'Empty', []), recipe('a', 'Top', [['r:z', '5']])], 'a', 'recipe_empty', 'Empty has a batch weight of zero, so a portion of it cannot be worked out.'],
  ])('when %s, then it throws a clear error', (_name, recipes, topId, code, message) => {
    const lookup = toLookup(recipes);
    const run = () => flattenRecipe(lookup.get(topId)!, lookup, ings);
    expect(run).toThrow(RecipeFlattenError);
    expect(run).toThrow(message);
    try { run(); } catch (e) { expect((e as RecipeFlattenError).code).toBe(code); }
  });

  test('a longer loop deeper down names only the loop', () => {
    const recipes = [
      recipe('top', 'Cake pops', [['r:a', '1']]),
      recipe('a', 'Crumb', [['r:b', '1']]),
      recipe('b', 'Frosting', [['r:c', '1']]),
      recipe('c', 'Filling', [['r:b', '1']]),
    ];
    const lookup = toLookup(recipes);
    expect(() => flattenRecipe(lookup.get('top')!, lookup, ings)).toThrow('Recipe loop: Frosting → Filling → Frosting');
  });

  test('zero-gram leaves are left out', () => {
    expect(byId(flattenRecipe(recipe('a', 'A', [['sugar', '0'], ['butter', '1']]), new Map(), ings))).toEqual({ butter: '1' });
  });

  test.each([['1e3'], ['abc'], [''], [Number.NaN]])('parseGrams rejects %j', (v) => {
    expect(() => parseGrams(v as string, 'Here')).toThrow(RecipeFlattenError);
  });
});
