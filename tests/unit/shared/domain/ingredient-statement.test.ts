import { describe, expect, test } from 'vitest';
import { buildIngredientStatement } from '../../../../shared/domain/ingredient-statement';
import { Dec, type FlatLeaf, type IngredientDecl } from '../../../../shared/domain/recipe-flatten';
import { ingredient } from '../../../support/label-fixtures';

const US = { code: 'US' as const, ruleSetDate: '2025-01-06' };
const UK = { code: 'UK' as const, ruleSetDate: '2021-10-01' };
const leaf = (ing: IngredientDecl, grams: string | number): FlatLeaf => ({ ingredient: ing, grams: new Dec(grams) });

const sugar = ingredient('sugar', 'Sugar');
const flour = ingredient('flour', 'Enriched flour', { subIngredients: ['wheat flour', 'niacin', 'reduced iron'], allergens: [{ source: 'wheat' }] });
const butter = ingredient('butter', 'Butter', { allergens: [{ source: 'milk' }] });
const coating = ingredient('coat', 'Candy coating', { subIngredients: ['sugar', 'palm kernel oil', 'whey', 'soy lecithin'], allergens: [{ source: 'milk' }, { source: 'soy' }] });
const salt = ingredient('salt', 'Salt');

describe('buildIngredientStatement', () => {
  // 21 CFR 101.4(a)(1): descending order of predominance by weight; (b)(2): compound ingredients
  // followed by their own ingredients in parentheses.
  test.each([
    ['descending by as-added weight', [leaf(sugar, 100), leaf(flour, 300), leaf(salt, 5)], 'Ingredients: Enriched flour (wheat flour, niacin, reduced iron), Sugar, Salt'],
    ['equal weights sort by label name, whatever the input order', [leaf(salt, 10), leaf(sugar, 10), leaf(butter, 10)], 'Ingredients: Butter (milk), Salt, Sugar'],
    ['identical ingredients are merged and re-placed by their sum', [leaf(sugar, 60), leaf(salt, 100), leaf(ingredient('sugar2', ' sugar '), 60)], 'Ingredients: Sugar, Salt'],
    ['same name but different sub-ingredients stay apart', [leaf(ingredient('s1', 'Sprinkles', { subIngredients: ['sugar', 'corn starch'] }), 10), leaf(ingredient('s2', 'Sprinkles', { subIngredients: ['sugar', 'rice starch'] }), 20)], 'Ingredients: Sprinkles (sugar, rice starch), Sprinkles (sugar, corn starch)'],
    // 21 U.S.C. 343(w)(1)(A): common name followed by the source, e.g. "whey (milk)".
    ['the source follows the sub-ingredient that carries it', [leaf(coating, 100)], 'Ingredients: Candy coating (sugar, palm kernel oil, whey (milk), soy lecithin)'],
    ['no parenthetical when the name already says it', [leaf(ingredient('m', 'Milk chocolate', { allergens: [{ source: 'milk' }] }), 10)], 'Ingredients: Milk chocolate'],
    ['US tree nuts are named by kind', [leaf(ingredient('n', 'Nut flour', { allergens: [{ source: 'tree_nut', kind: 'almond' }] }), 10)], 'Ingredients: Nut flour (almond)'],
    ['coconut is not a US tree nut under the 2025 list, so it gets no parenthetical', [leaf(ingredient('c', 'Desiccated coconut', { allergens: [{ source: 'tree_nut', kind: 'coconut' }] }), 10)], 'Ingredients: Desiccated coconut'],
  ])('%s', (_name, leaves, text) => {
    expect(buildIngredientStatement(leaves, { regime: US }).text).toBe(text);
  });

  // 21 CFR 101.4(a)(2): thresholds 2, 1.5, 1 or 0.5 %; nothing above the threshold after the phrase.
  test.each([
    [2, 'Ingredients: Sugar, Contains 2% or less of Salt, Vanilla'],
    [1.5, 'Ingredients: Sugar, Salt, Contains 1.5% or less of Vanilla'],
    [0.5, 'Ingredients: Sugar, Salt, Contains 0.5% or less of Vanilla'],
    [1, 'Ingredients: Sugar, Salt, Contains 1% or less of Vanilla'],
  ] as const)('threshold %s %%', (threshold, text) => {
    // Salt at exactly 2.00 % may go after a 2 % phrase; vanilla at 0.5 % may go after a 0.5 % phrase.
    const leaves = [leaf(sugar, '97.5'), leaf(salt, '2'), leaf(ingredient('v', 'Vanilla'), '0.5')];
    expect(buildIngredientStatement(leaves, { regime: US, lessThanThreshold: threshold }).text).toBe(text);
  });
  test('an ingredient at 2.01 % stays before the 2 % phrase', () => {
    const leaves = [leaf(sugar, '97.49'), leaf(salt, '2.01'), leaf(ingredient('v', 'Vanilla'), '0.5')];
    const s = buildIngredientStatement(leaves, { regime: US, lessThanThreshold: 2 });
    expect(s.text).toBe('Ingredients: Sugar, Salt, Contains 2% or less of Vanilla');
    expect(s.entries.map((e) => e.isAfterThresholdPhrase)).toEqual([false, false, true]);
  });
  test('a threshold outside 2, 1.5, 1, 0.5 is refused', () => {
    expect(() => buildIngredientStatement([leaf(sugar, 1)], { regime: US, lessThanThreshold: 3 as 2 })).toThrow('21 CFR 101.4(a)(2)');
  });

  // EU 1169/2011 Art. 21(1)(b): allergen names emphasised inside the list.
  test('UK: allergen words are flagged for emphasis, and nothing else', () => {
    const s = buildIngredientStatement([leaf(flour, 300), leaf(coating, 200), leaf(sugar, 100)], { regime: UK });
    expect(s.segments.filter((x) => x.isAllergen).map((x) => x.text)).toEqual(['wheat', 'milk', 'soy']);
    expect(s.text).toBe('Ingredients: Enriched flour (wheat flour, niacin, reduced iron), Candy coating (sugar, palm kernel oil, whey (milk), soy lecithin), Sugar');
    expect(s.segments.map((x) => x.text).join('')).toBe(s.text);
  });
  test('UK: soya is the source word in the UK', () => {
    const s = buildIngredientStatement([leaf(ingredient('l', 'Lecithin', { allergens: [{ source: 'soy' }] }), 1)], { regime: UK });
    expect(s.text).toBe('Ingredients: Lecithin (soya)');
  });
  test('percentages and exact grams are reported per entry', () => {
    const s = buildIngredientStatement([leaf(sugar, '75'), leaf(salt, '25')], { regime: US });
    expect(s.entries.map((e) => [e.grams, e.percent])).toEqual([['75', 75], ['25', 25]]);
  });
  test('no leaves gives an empty statement', () => {
    expect(buildIngredientStatement([], { regime: US })).toMatchObject({ text: '', segments: [], entries: [] });
  });
});
