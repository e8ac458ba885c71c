import { beforeAll, describe, expect, test } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { businessWithAgents, type ApiAgent } from '../support/agents';
import { createIngredient } from '../support/factories';
import { ingredientVersions } from '../../server/db/schema/ingredients';
import { recipeVersions } from '../../server/db/schema/recipes';
import { recordEvents } from '../../server/db/schema/record-events';
import { getRuleProfile } from '../../shared/domain/rule-profiles';
import { buildLabelText } from '../../shared/domain/label-text';
import { labelOptionsForRecipe, recipeInputOf, type RecipeVersionForLabel } from '../../shared/domain/recipe-label';
import type { LabelInputs, RecipeDetail } from '../../shared/contracts/recipes';
import type { TestBusiness } from '../support/agents';

const t = makeTestApp();

let business: TestBusiness;
let baker: ApiAgent;
let helper: ApiAgent;
const ing: Record<string, string> = {};

// An in-between and a sellable recipe body; weights in several units.
const cakeBase = () => ({
  name: 'Test cake base',
  isSellable: false,
  components: [
    { kind: 'ingredient', ingredientId: ing.flour, amount: '1', unit: 'lb' },
    { kind: 'ingredient', ingredientId: ing.sugar, amount: '8', unit: 'oz' },
    { kind: 'ingredient', ingredientId: ing.egg, amount: '0.2', unit: 'kg' },
  ],
  yieldWeight: { amount: '800', unit: 'g' },
});

const pops = (baseId: string) => ({
  name: 'Test cake pops',
  isSellable: true,
  components: [
    { kind: 'recipe', recipeId: baseId, amount: '400', unit: 'g' },
    { kind: 'ingredient', ingredientId: ing.butter, amount: '100', unit: 'g' },
  ],
  yieldPieces: 18,
  pieceWeight: { amount: '28', unit: 'g' },
  piecesPerPackage: 6,
  shelfLifeDays: 7,
  ph: 6.8,
  waterActivity: 0.83,
  isHeatTreatedAndPackaged: true,
});

beforeAll(async () => {
  ({ business, baker, helper } = await businessWithAgents(t));
  // Invented ingredients (test data), declared as on their packages.
  ing.flour = (await createIngredient(t, business.businessId, { labelName: 'Wheat flour', subIngredients: ['wheat flour', 'niacin'], allergens: [{ source: 'wheat' }] })).id;
  ing.sugar = (await createIngredient(t, business.businessId, { labelName: 'Sugar' })).id;
  ing.egg = (await createIngredient(t, business.businessId, { labelName: 'Whole eggs', allergens: [{ source: 'egg' }] })).id;
  ing.butter = (await createIngredient(t, business.businessId, { labelName: 'Butter', subIngredients: ['cream', 'salt'], allergens: [{ source: 'milk' }] })).id;
  ing.almond = (await createIngredient(t, business.businessId, { labelName: 'Almond flour', allergens: [{ source: 'tree_nut', kind: 'almond' }] })).id;
});

async function create(agent: ApiAgent, body: object) {
  const res = await agent.post('/api/recipes').send(body);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as RecipeDetail;
}

describe('POST /api/recipes', () => {
  test('when weights are typed in oz, lb and kg, then exact grams are stored (1 lb = 453.59237 g, 1 oz = 28.349523125 g, NIST HB 44 App. C)', async () => {
    const detail = await create(baker, cakeBase());
    const grams = detail.current.components.map((c) => c.grams);
    expect(grams).toEqual(['453.59237', '226.796185', '200']);
    const [row] = await t.db.select().from(recipeVersions).where(eq(recipeVersions.recipeId, detail.recipe.id));
    expect(row!.components.map((c) => c.grams)).toEqual(['453.59237', '226.796185', '200']);
    expect(row!.components[1]!.entered).toEqual({ amount: '8', unit: 'oz' });
    expect(row!.yieldGrams).toBe('800');
    expect(detail.current.version).toBe(1);
    const events = await t.db.select().from(recordEvents).where(and(eq(recordEvents.entityId, detail.recipe.id), eq(recordEvents.action, 'create')));
    expect(events).toHaveLength(1);
  });

  test('when the pieces weigh 1.5 oz, then the piece weight and net quantity per package stay exact', async () => {
    const base = await create(baker, cakeBase());
    const detail = await create(baker, { ...pops(base.recipe.id), pieceWeight: { amount: '1.5', unit: 'oz' } });
    expect(detail.current.pieceGrams).toBe('42.5242846875');
    expect(detail.current.netGramsPerPackage).toBe('255.145708125');
    // 255.145708125 g = 9 oz; round-down: 255 g (16 CFR 500.19(b), 3 significant digits).
    expect(detail.labelText.netQuantity?.text).toBe('6 pieces, Net wt 9 oz (255 g)');
  });

  test('when fields are wrong, then 400 names each field', async () => {
    const res = await baker.post('/api/recipes').send({ name: '', isSellable: true, components: [{ kind: 'ingredient', ingredientId: ing.sugar, amount: '-3', unit: 'cup' }], ph: 15 });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(Object.keys(res.body.error.fieldErrors)).toEqual(expect.arrayContaining(['name', 'components.0.amount', 'components.0.unit', 'ph']));
  });

  test('when a helper writes, then 403; when anonymous, then 401', async () => {
    expect((await helper.post('/api/recipes').send(cakeBase())).status).toBe(403);
    const { anonymous } = await businessWithAgents(t);
    await anonymous.refreshCsrf();
    expect((await anonymous.get('/api/recipes')).status).toBe(401);
  });

  test('when a component is another business\'s ingredient or an unknown recipe, then 400 naming the component', async () => {
    const other = await businessWithAgents(t);
    const foreign = await createIngredient(t, other.business.businessId, { labelName: 'Foreign sugar' });
    const res = await baker.post('/api/recipes').send({
      ...cakeBase(),
      components: [
        { kind: 'ingredient', ingredientId: foreign.id, amount: '10', unit: 'g' },
        { kind: 'recipe', recipeId: '00000000-0000-4000-8000-000000000000', amount: '10', unit: 'g' },
      ],
    });
    expect(res.status).toBe(400);
    expect(res.body.error.fieldErrors).toMatchObject({ 'components.0.ingredientId': ['That ingredient does not exist'], 'components.1.recipeId': ['That recipe does not exist'] });
  });
});

describe('versions', () => {
  test('when a new version is saved, then the old one stays readable and unchanged, and the reason is required', async () => {
    const base = await create(baker, cakeBase());
    const id = base.recipe.id;
    const v1Before = (await helper.get(`/api/recipes/${id}/versions/1`)).body;

    const noReason = await baker.post(`/api/recipes/${id}/versions`).send({ ...cakeBase(), basedOnVersion: 1 });
    expect(noReason.status).toBe(400);
    expect(noReason.body.error.fieldErrors.reason).toBeDefined();

    const changed = { ...cakeBase(), components: [...cakeBase().components, { kind: 'ingredient', ingredientId: ing.almond, amount: '50', unit: 'g' }] };
    const saved = await baker.post(`/api/recipes/${id}/versions`).send({ ...changed, reason: 'Added almond flour', basedOnVersion: 1 });
    expect(saved.status, JSON.stringify(saved.body)).toBe(201);
    expect(saved.body.current.version).toBe(2);

    const v1After = (await helper.get(`/api/recipes/${id}/versions/1`)).body;
    expect(v1After).toEqual(v1Before);
    expect(v1After.components).toHaveLength(3);

    const history = (await helper.get(`/api/recipes/${id}/versions`)).body.versions;
    expect(history.map((v: { version: number }) => v.version)).toEqual([1, 2]);
    expect(history[1].reason).toBe('Added almond flour');
    const allergenChange = history[1].changes.find((c: { field: string }) => c.field === 'allergens');
    expect(allergenChange.added).toEqual(['Tree nuts (Almond)']);
    expect(history[1].changes.find((c: { field: string }) => c.field === 'ingredientStatement').added).toEqual(['Almond flour']);

    const stale = await baker.post(`/api/recipes/${id}/versions`).send({ ...changed, reason: 'Again', basedOnVersion: 1 });
    expect(stale.status).toBe(409);
    expect((await helper.get(`/api/recipes/${id}/versions/9`)).status).toBe(404);
  });

  test('when an old version is touched in the database, then the append-only trigger refuses it', async () => {
    const base = await create(baker, cakeBase());
    await expect(t.db.update(recipeVersions).set({ name: 'Tampered' }).where(eq(recipeVersions.recipeId, base.recipe.id))).rejects.toThrow();
  });

  test('when a recipe would use itself through another, then 400 names the loop', async () => {
    const a = await create(baker, { ...cakeBase(), name: 'Loop frosting' });
    const b = await create(baker, { ...cakeBase(), name: 'Loop filling', components: [{ kind: 'recipe', recipeId: a.recipe.id, amount: '100', unit: 'g' }], yieldWeight: null });
    const res = await baker.post(`/api/recipes/${a.recipe.id}/versions`).send({
      ...cakeBase(), name: 'Loop frosting', components: [{ kind: 'recipe', recipeId: b.recipe.id, amount: '50', unit: 'g' }], reason: 'Use the filling', basedOnVersion: 1,
    });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toBe('Recipe loop: Loop frosting → Loop filling → Loop frosting');
    expect((await helper.get(`/api/recipes/${a.recipe.id}`)).body.current.version).toBe(1);
  });

  test('when archived, then a new version marks it and the list hides it unless asked', async () => {
    const base = await create(baker, { ...cakeBase(), name: 'Archive me' });
    expect((await helper.post(`/api/recipes/${base.recipe.id}/archive`).send({ reason: 'x' })).status).toBe(403);
    const res = await baker.post(`/api/recipes/${base.recipe.id}/archive`).send({ reason: 'No longer made' });
    expect(res.status).toBe(200);
    expect(res.body.current).toMatchObject({ version: 2, isArchived: true, reason: 'No longer made' });
    const list = (await helper.get('/api/recipes')).body.recipes.map((r: { id: string }) => r.id);
    expect(list).not.toContain(base.recipe.id);
    const all = (await helper.get('/api/recipes?includeArchived=true')).body.recipes.map((r: { id: string }) => r.id);
    expect(all).toContain(base.recipe.id);
  });
});

describe('label text', () => {
  test('the server preview equals buildLabelText run here for the same version, for the business and another profile', async () => {
    const base = await create(baker, cakeBase());
    const product = await create(baker, pops(base.recipe.id));
    const inputs = (await helper.get('/api/recipes/label-inputs')).body as LabelInputs;
    const recipes = new Map(inputs.recipes.map((r) => [r.recipeId, recipeInputOf(r)]));
    const ingredients = new Map(inputs.ingredients.map((i) => [i.id, i]));
    const v = inputs.recipes.find((r) => r.recipeId === product.recipe.id)! as RecipeVersionForLabel;
    for (const profileId of ['us-federal-2025-01', 'eu-1169-2011']) {
      const res = await helper.get(`/api/recipes/${product.recipe.id}/label-preview?profileId=${profileId}&version=1`);
      expect(res.status).toBe(200);
      const expected = buildLabelText({ recipe: recipeInputOf(v), recipes, ingredients, profile: getRuleProfile(profileId)!, options: labelOptionsForRecipe(v) });
      expect(res.body.labelText).toEqual(JSON.parse(JSON.stringify(expected)));
    }
    // 400 g of an 800 g batch: half of each base ingredient (as-added, 21 CFR 101.4(a)(1)); butter 100 g.
    const us = (await helper.get(`/api/recipes/${product.recipe.id}/label-preview?profileId=us-federal-2025-01`)).body.labelText;
    expect(us.ingredientStatement.text).toBe('Ingredients: Wheat flour (wheat flour, niacin), Sugar, Butter (milk) (cream, salt), Whole eggs');
    expect(us.allergenStatement.containsLine).toBe('Contains: Milk, Egg, Wheat');
    expect(us.netQuantity.text).toBe('6 pieces, Net wt 5.92 oz (168 g)');
    // pH 6.8, aw 0.83, heat-treated and packaged: Food Code 1-201.10(B) Table A, aw ≤ 0.92 → not TCS.
    expect(us.tcs).toMatchObject({ result: 'non_tcs', table: 'A' });
    expect((await helper.get(`/api/recipes/${product.recipe.id}/label-preview?profileId=no-such`)).status).toBe(400);
  });

  test('when an ingredient is edited after saving, then the recipe says its label text changed since that version', async () => {
    const base = await create(baker, cakeBase());
    const product = await create(baker, pops(base.recipe.id));
    expect(product.recipe.isLabelChanged).toBe(false);
    const [v1] = await t.db.select().from(ingredientVersions).where(eq(ingredientVersions.ingredientId, ing.sugar));
    // A new version of the sugar: the supplier now declares a blend.
    const { id: _id, version: _v, createdAt: _c, updatedAt: _u, ...rest } = v1!;
    await t.db.insert(ingredientVersions).values({ ...rest, version: 2, labelName: 'Cane sugar', reason: 'New supplier' });
    try {
      const detail = (await helper.get(`/api/recipes/${product.recipe.id}`)).body as RecipeDetail;
      expect(detail.recipe.isLabelChanged).toBe(true);
      expect(detail.labelChanges[0]).toMatchObject({ field: 'ingredientStatement', added: ['Cane sugar'], removed: ['Sugar'] });
      const list = (await helper.get('/api/recipes')).body.recipes;
      expect(list.find((r: { id: string }) => r.id === base.recipe.id).isLabelChanged).toBe(true);
    } finally {
      await t.db.insert(ingredientVersions).values({ ...rest, version: 3, labelName: 'Sugar', reason: 'Back to the old supplier' });
    }
  });
});

describe('cross-business access', () => {
  test('another business\'s recipe answers 404 on every route', async () => {
    const base = await create(baker, cakeBase());
    const other = await businessWithAgents(t);
    const id = base.recipe.id;
    expect((await other.owner.get(`/api/recipes/${id}`)).status).toBe(404);
    expect((await other.owner.get(`/api/recipes/${id}/versions`)).status).toBe(404);
    expect((await other.owner.get(`/api/recipes/${id}/versions/1`)).status).toBe(404);
    expect((await other.owner.get(`/api/recipes/${id}/label-preview`)).status).toBe(404);
    const save = await other.owner.post(`/api/recipes/${id}/versions`).send({ ...cakeBase(), reason: 'x', basedOnVersion: 1 });
    expect(save.status, JSON.stringify(save.body)).toBe(404);
    expect((await other.owner.post(`/api/recipes/${id}/archive`).send({ reason: 'x' })).status).toBe(404);
    expect((await other.owner.get('/api/recipes')).body.recipes).toEqual([]);
  });
});

describe('GET /api/allergen-matrix', () => {
  test('lists sellable products with a mark per allergen, named kinds included', async () => {
    const base = await create(baker, cakeBase());
    const product = await create(baker, { ...pops(base.recipe.id), name: 'Matrix almond pops', components: [...pops(base.recipe.id).components, { kind: 'ingredient', ingredientId: ing.almond, amount: '20', unit: 'g' }] });
    const res = await helper.get('/api/allergen-matrix');
    expect(res.status).toBe(200);
    expect(res.body.allergens.map((a: { key: string }) => a.key)).toEqual(['milk', 'egg', 'fish', 'crustacean_shellfish', 'tree_nuts', 'wheat', 'peanuts', 'soybeans', 'sesame']);
    const row = res.body.products.find((p: { recipeId: string }) => p.recipeId === product.recipe.id);
    const cell = (k: string) => row.cells.find((c: { key: string }) => c.key === k);
    expect(cell('tree_nuts')).toEqual({ key: 'tree_nuts', isPresent: true, kinds: ['Almond'] });
    expect(cell('peanuts').isPresent).toBe(false);
    expect(res.body.products.some((p: { recipeId: string }) => p.recipeId === base.recipe.id)).toBe(false);
  });
});
