import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { checkContainsLine, type AllergenDecl } from '../../../../shared/domain/allergens';
import { buildIngredientStatement } from '../../../../shared/domain/ingredient-statement';
import { buildLabelText, type LabelTextOptions } from '../../../../shared/domain/label-text';
import { buildNetQuantity, GRAMS_PER_OUNCE } from '../../../../shared/domain/net-quantity';
import { Dec, toLookup, type FlatLeaf, type IngredientDecl, type RecipeInput } from '../../../../shared/domain/recipe-flatten';
import { getRuleProfile } from '../../../../shared/domain/rule-profiles';
import { ingredient, recipe } from '../../../support/label-fixtures';

// Invented demo: Juniper Lane Cake Pops, Millbrook.
const INGREDIENTS = toLookup([
  ingredient('flour', 'Enriched flour', { subIngredients: ['wheat flour', 'niacin', 'reduced iron', 'thiamin mononitrate', 'riboflavin', 'folic acid'], allergens: [{ source: 'wheat' }] }),
  ingredient('sugar', 'Sugar'),
  ingredient('butter', 'Butter', { allergens: [{ source: 'milk' }] }),
  ingredient('eggs', 'Eggs', { allergens: [{ source: 'egg' }] }),
  ingredient('almond', 'Almond flour', { allergens: [{ source: 'tree_nut', kind: 'almond' }] }),
  ingredient('coating', 'Pink candy coating', { subIngredients: ['sugar', 'palm kernel oil', 'whey', 'soy lecithin', 'red 40'], allergens: [{ source: 'milk' }, { source: 'soy' }] }),
  ingredient('creamcheese', 'Cream cheese', { allergens: [{ source: 'milk' }], needsTimeTemperatureControl: true }),
  ingredient('salt', 'Salt'),
  ingredient('vanilla', 'Vanilla extract', { isVerified: false }),
  ingredient('apricot', 'Dried apricots', { sulphitesMgPerKg: 2000, allergens: [{ source: 'sulphites' }] }),
  ingredient('nuts', 'Mixed nuts', { allergens: [{ source: 'tree_nut' }] }),
]);
const CAKE = recipe('cake', 'Vanilla crumb', [['flour', '300'], ['sugar', '250'], ['butter', '200'], ['eggs', '150'], ['salt', '3'], ['vanilla', '8']]);
const FROSTING = recipe('frost', 'Buttercream', [['butter', '100'], ['sugar', '200']]);
const POPS = recipe('pops', 'Birthday cake pops', [['r:cake', '500'], ['r:frost', '150'], ['coating', '300'], ['almond', '20']]);
const RECIPES = toLookup([CAKE, FROSTING, POPS]);

const run = (profileId: string, rec: RecipeInput = POPS, options: LabelTextOptions = { netQuantity: { grams: '226.796185', count: 12 } }) =>
  buildLabelText({ recipe: rec, recipes: RECIPES, ingredients: INGREDIENTS, profile: getRuleProfile(profileId)!, options });

describe('buildLabelText', () => {
  test('US (Texas 2025): statement, Contains line in statutory order, net quantity, home-kitchen text', () => {
    const r = run('us-tx-2025-09');
    expect(r.ingredientStatement.text).toBe(
      'Ingredients: Pink candy coating (sugar, palm kernel oil, whey (milk), soy lecithin, red 40), Sugar, Enriched flour (wheat flour, niacin, reduced iron, thiamin mononitrate, riboflavin, folic acid), Butter (milk), Eggs, Almond flour, Vanilla extract, Salt');
    // 21 U.S.C. 343(w)(1)(B): all majors; (w)(2): the nut named.
    expect(r.allergenStatement.containsLine).toBe('Contains: Milk, Egg, Almond, Wheat, Soy');
    expect(checkContainsLine(r.allergenStatement.containsLine!, r.allergenStatement.allergens)).toEqual([]);
    expect(r.netQuantity?.text).toBe('12 pieces, Net wt 8 oz (226 g)');
    expect(r.statements.map((s) => s.key)).toEqual(['homeKitchenStatement']);
    expect(r.isTcsProduct).toBe(false);
    expect(r.cautions.map((c) => [c.code, c.severity])).toEqual([['ingredient_unverified', 'warn'], ['tcs_unknown', 'info'], ['local_rules', 'info']]);
    expect(r.leaves.reduce((s, l) => s + l.percent, 0)).toBeCloseTo(100, 9);
  });
  test('sum of leaf grams equals the as-added total of the top recipe (leaves are reported to 6 decimal places)', () => {
    const total = run('us-ca-2022').leaves.reduce((s, l) => s.plus(l.grams), new Dec(0));
    expect(total.minus(970).abs().lte('0.00001')).toBe(true);
  });
  test('UK: no Contains line; allergens emphasised in the list; metric only', () => {
    const r = run('uk-ppds-2021');
    expect(r.allergenStatement.containsLine).toBeNull();
    expect(r.allergenStatement.isEmphasisRequired).toBe(true);
    expect(r.ingredientStatement.segments.filter((s) => s.isAllergen).map((s) => s.text)).toEqual(['milk', 'soy', 'wheat', 'milk', 'Eggs', 'Almond']);
    expect(r.allergenStatement.allergens.map((a) => a.key)).toEqual(['cereals_gluten', 'eggs', 'soybeans', 'milk', 'nuts']);
    expect(r.netQuantity?.text).toBe('12 pieces, Net weight 226 g');
  });
  // Texas S.B. 541: from 2025-09-01 TCS baked goods need the date made and the 12-pt safe-handling line.
  test('a TCS ingredient: blocked where cottage rules forbid it, extra statement in Texas 2025', () => {
    const withCream = recipe('cc', 'Cream cheese pops', [['r:cake', '500'], ['creamcheese', '100']]);
    const ca = run('us-ca-2022', withCream);
    expect(ca.cautions.find((c) => c.code === 'tcs_ingredient')).toMatchObject({ severity: 'block', ingredientId: 'creamcheese' });
    const tx = run('us-tx-2025-09', withCream);
    expect(tx.cautions.find((c) => c.code === 'tcs_ingredient')?.severity).toBe('warn');
    expect(tx.isTcsProduct).toBe(true);
    expect(tx.statements.map((s) => [s.key, s.minPoints])).toEqual([['homeKitchenStatement', null], ['safeHandlingStatement', 12]]);
    expect(tx.requiredElements).toEqual(expect.arrayContaining(['madeOnDate', 'safeHandlingStatement']));
  });
  test('Texas on 2025-08-31 and 2025-09-01 print different statements', () => {
    const before = buildLabelText({ recipe: POPS, recipes: RECIPES, ingredients: INGREDIENTS, profile: getRuleProfile('us-tx-2013')!, options: {} });
    expect(before.statements[0].text).toMatch(/^This food is made in a home kitchen/);
    expect(run('us-tx-2025-09').statements[0].text).toMatch(/^THIS PRODUCT WAS PRODUCED IN A PRIVATE RESIDENCE/);
  });
  test('a tree nut without its kind blocks and no Contains line is written (343(w)(2))', () => {
    const r = run('us-federal-2025-01', recipe('n', 'Nutty pops', [['r:cake', '100'], ['nuts', '10']]));
    expect(r.allergenStatement.containsLine).toBeNull();
    expect(r.cautions.find((c) => c.code === 'allergen_kind_missing')).toMatchObject({ severity: 'block', ingredientId: 'nuts' });
  });
  test('a recipe loop gives a block caution naming the loop, not an exception', () => {
    const a = recipe('a', 'Frosting', [['r:b', '10']]);
    const b = recipe('b', 'Filling', [['r:a', '10']]);
    const r = buildLabelText({ recipe: a, recipes: toLookup([a, b]), ingredients: INGREDIENTS, profile: getRuleProfile('us-ca-2022')!, options: {} });
    expect(r.cautions[0]).toEqual({ code: 'recipe_loop', severity: 'block', message: 'Recipe loop: Frosting → Filling → Frosting' });
    expect(r.ingredientStatement.text).toBe('');
  });
  // EU Annex II point 12: sulphites only above 10 mg/kg in the finished food.
  test.each([
    ['5', false], ['1000', true],
  ])('EU sulphites with %s g of apricots in 1011 g', (g, declared) => {
    const r = run('eu-1169-2011', recipe('s', 'Apricot pops', [['r:cake', '1011'], ['apricot', g]]));
    expect(r.allergenStatement.allergens.some((a) => a.key === 'sulphites')).toBe(declared);
  });
  test('missing net quantity blocks where the profile requires it; a bad one is a caution, not a crash', () => {
    expect(run('us-ca-2022', POPS, {}).cautions.find((c) => c.code === 'net_quantity_missing')?.severity).toBe('block');
    expect(run('us-ca-2022', POPS, { netQuantity: { grams: '-3' } }).cautions.find((c) => c.code === 'net_quantity_invalid')?.severity).toBe('block');
  });
  test('needs-review TCS assessment is never shown as safe', () => {
    const r = run('us-ca-2022', POPS, { netQuantity: { grams: '100' }, tcs: { ph: 6.5, aw: 0.97, isHeatTreated: true, isPackaged: true } });
    expect(r.tcs.result).toBe('needs_review');
    expect(r.cautions.find((c) => c.code === 'tcs_needs_review')).toMatchObject({ severity: 'block', message: expect.stringMatching(/not a finding that the food is safe/) });
  });
  test('an allergen word in an undeclared ingredient is flagged', () => {
    const ings = toLookup([...INGREDIENTS.values(), ingredient('pb', 'Peanut butter chips')]);
    const r = buildLabelText({ recipe: recipe('p', 'PB pops', [['pb', '5'], ['sugar', '5']]), recipes: RECIPES, ingredients: ings, profile: getRuleProfile('us-ca-2022')!, options: {} });
    expect(r.cautions.find((c) => c.code === 'allergen_word_undeclared')?.ingredientId).toBe('pb');
  });
  test('the voluntary cross-contact statement leaves out what the food contains', () => {
    const r = run('us-ca-2022', POPS, { crossContact: [{ source: 'peanut' }, { source: 'milk' }, { source: 'sesame' }] });
    expect(r.allergenStatement.crossContact).toEqual({ text: 'Made in a home kitchen that also handles peanuts and sesame.', isVoluntary: true });
  });
  test('deterministic: the same input gives the same output', () => {
    expect(JSON.stringify(run('uk-ppds-2021'))).toBe(JSON.stringify(run('uk-ppds-2021')));
  });
});

// Property-based checks (fast-check).
const US = { code: 'US' as const, ruleSetDate: '2025-01-06' };
const NAMES = ['Sugar', 'sugar', 'Flour', 'Butter', 'Cocoa', 'Salt', 'Vanilla', 'Sprinkles', 'Coating', 'Milk powder'];
const DECLS: AllergenDecl[] = [
  { source: 'milk' }, { source: 'egg' }, { source: 'wheat' }, { source: 'soy' }, { source: 'peanut' }, { source: 'sesame' },
  { source: 'tree_nut', kind: 'almond' }, { source: 'tree_nut', kind: 'pecan' }, { source: 'tree_nut', kind: 'walnut' },
  { source: 'fish', kind: 'salmon' }, { source: 'crustacean_shellfish', kind: 'shrimp' }, { source: 'celery' },
];
const leafArb = fc.record({
  name: fc.constantFrom(...NAMES),
  subs: fc.array(fc.constantFrom('sugar', 'corn starch', 'whey', 'palm oil'), { maxLength: 2 }),
  allergens: fc.uniqueArray(fc.constantFrom(...DECLS), { maxLength: 3 }),
  grams: fc.integer({ min: 1, max: 100000 }).map((n) => (n / 100).toFixed(2)),
});
const toLeaves = (raw: Array<{ name: string; subs: string[]; allergens: AllergenDecl[]; grams: string }>): FlatLeaf[] =>
  raw.map((r, i) => ({ ingredient: ingredient(`i${i}`, r.name, { subIngredients: r.subs, allergens: r.allergens }) as IngredientDecl, grams: new Dec(r.grams) }));

describe('properties', () => {
  test('the statement order never increases in weight', () => {
    fc.assert(fc.property(fc.array(leafArb, { minLength: 1, maxLength: 30 }), fc.constantFrom(null, 2, 1.5, 1, 0.5), (raw, threshold) => {
      const s = buildIngredientStatement(toLeaves(raw), { regime: US, lessThanThreshold: threshold as 2 | null });
      for (let i = 1; i < s.entries.length; i++) expect(new Dec(s.entries[i].grams).lte(s.entries[i - 1].grams)).toBe(true);
      // 21 CFR 101.4(a)(2): nothing above the threshold follows the phrase.
      if (threshold !== null) for (const e of s.entries.filter((x) => x.isAfterThresholdPhrase)) expect(e.percent).toBeLessThanOrEqual(threshold + 1e-9);
    }));
  });
  test('every leaf allergen is declared in the Contains line', () => {
    fc.assert(fc.property(fc.array(leafArb, { minLength: 1, maxLength: 20 }), (raw) => {
      const ings = toLookup(raw.map((r, i) => ingredient(`i${i}`, r.name, { subIngredients: r.subs, allergens: r.allergens })));
      const rec: RecipeInput = { id: 'p', name: 'P', components: raw.map((r, i) => ({ kind: 'ingredient', ingredientId: `i${i}`, grams: r.grams })) };
      const out = buildLabelText({ recipe: rec, recipes: new Map(), ingredients: ings, profile: getRuleProfile('us-federal-2025-01')!, options: {} });
      const usDecls = raw.flatMap((r) => r.allergens).filter((d) => d.source !== 'celery');
      if (usDecls.length === 0) {
        expect(out.allergenStatement.containsLine).toBeNull();
        return;
      }
      const line = out.allergenStatement.containsLine!;
      expect(checkContainsLine(line, out.allergenStatement.allergens)).toEqual([]);
      const expected = new Set(usDecls.map((d) => ({ milk: 'Milk', egg: 'Egg', wheat: 'Wheat', soy: 'Soy', peanut: 'Peanut', sesame: 'Sesame' } as Record<string, string>)[d.source] ?? d.kind![0].toUpperCase() + d.kind!.slice(1)));
      expect(new Set(line.replace('Contains: ', '').split(', '))).toEqual(expected);
    }));
  });
  test('round-down never overstates either figure', () => {
    fc.assert(fc.property(fc.integer({ min: 1, max: 5_000_000 }), (centigrams) => {
      const grams = new Dec(centigrams).div(100);
      const nq = buildNetQuantity({ grams: grams.toFixed(), units: 'us-dual', rounding: 'round-down' })!;
      const [, mv, mu] = /^([\d.]+) (g|kg)$/.exec(nq.metricText!)!;
      expect(new Dec(mv).times(mu === 'kg' ? 1000 : 1).lte(grams)).toBe(true);
      const c = nq.customaryText!;
      const oz = /^([\d.]+) oz/.exec(c);
      const shown = oz ? new Dec(oz[1]).times(GRAMS_PER_OUNCE) : new Dec(/^([\d.]+) lb/.exec(c)![1]).times('453.59237');
      expect(shown.lte(grams)).toBe(true);
    }));
  });
  test('merging is order-independent', () => {
    fc.assert(fc.property(fc.array(leafArb, { minLength: 1, maxLength: 25 }).chain((raw) => fc.tuple(fc.constant(raw), fc.shuffledSubarray(raw, { minLength: raw.length, maxLength: raw.length }))), ([raw, shuffled]) => {
      const a = buildIngredientStatement(toLeaves(raw), { regime: US, lessThanThreshold: 2 });
      const b = buildIngredientStatement(toLeaves(shuffled), { regime: US, lessThanThreshold: 2 });
      expect(b.text).toBe(a.text);
      expect(b.segments).toEqual(a.segments);
    }));
  });
});
