import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { Browser } from 'playwright-core';
import { checkA11y, describeViolations, launchBrowser, newPage, signInInBrowser, startE2eServer, type E2eServer } from '../support/e2e';
import { createTestBusiness, TEST_PASSWORD, type TestBusiness } from '../support/agents';
import { createIngredient } from '../support/factories';
import { createRecipe } from '../../server/features/recipes/recipes.service';
import { RecipeVersionInputSchema } from '../../shared/contracts/recipes';
import type { Actor } from '../../server/lib/actor';

let server: E2eServer;
let browser: Browser;
let business: TestBusiness;

beforeAll(async () => {
  [server, browser] = await Promise.all([startE2eServer(), launchBrowser()]);
  business = await createTestBusiness(server.t);
  const b = business.businessId;
  // Invented test ingredients, declared as on their packages.
  const flour = await createIngredient(server.t, b, { labelName: 'Cake flour', subIngredients: ['wheat flour', 'niacin'], allergens: [{ source: 'wheat' }] });
  const sugar = await createIngredient(server.t, b, { labelName: 'Sugar' });
  const butter = await createIngredient(server.t, b, { labelName: 'Butter', subIngredients: ['cream'], allergens: [{ source: 'milk' }] });
  await createIngredient(server.t, b, { labelName: 'Almond flour', allergens: [{ source: 'tree_nut', kind: 'almond' }] });
  const owner: Actor = { kind: 'member', businessId: b, userId: business.members.owner.userId, name: 'Owner', role: 'owner' };
  const base = await createRecipe(server.t.db, owner, RecipeVersionInputSchema.parse({
    name: 'E2E sponge', isSellable: false, components: [{ kind: 'ingredient', ingredientId: flour.id, amount: '300', unit: 'g' }, { kind: 'ingredient', ingredientId: sugar.id, amount: '200', unit: 'g' }],
  }), new Date());
  await createRecipe(server.t.db, owner, RecipeVersionInputSchema.parse({
    name: 'E2E binder', isSellable: false, components: [{ kind: 'recipe', recipeId: base.recipe.id, amount: '100', unit: 'g' }, { kind: 'ingredient', ingredientId: butter.id, amount: '4', unit: 'oz' }],
  }), new Date());
}, 180_000);
afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('recipes in the browser', () => {
  test('a baker builds a three-level recipe; the live preview equals the server statement for the saved version', async () => {
    const { context, page } = await newPage(browser);
    try {
      await signInInBrowser(page, server.baseUrl, business.members.baker.email, TEST_PASSWORD);
      await page.goto(`${server.baseUrl}/recipes/new`);
      await page.getByLabel('Name', { exact: true }).fill('E2E almond pops');
      const add = async (search: string, button: RegExp, weight: string, unit: string) => {
        await page.getByLabel('Add an ingredient or a recipe').fill(search);
        await page.getByRole('button', { name: button }).click();
        const name = (await page.getByRole('button', { name: /^Remove / }).last().getAttribute('aria-label'))!.replace(/^Remove /, '');
        await page.getByLabel(`Weight of ${name}`).fill(weight);
        await page.getByLabel(`Unit for ${name}`).selectOption(unit);
      };
      await add('binder', /Add E2E binder \(recipe\)/, '1', 'lb');
      await add('almond', /Add Almond flour \(ingredient\)/, '2', 'oz');
      await page.getByRole('textbox', { name: /^Weight of one piece/ }).fill('1');
      await page.getByLabel('Weight of one piece: unit').selectOption('oz');
      await page.getByLabel('Pieces per package').fill('6');
      await page.getByLabel('pH').fill('6.8');
      await page.getByLabel('Water activity (aw)').fill('0.83');

      const preview = page.getByTestId('live-preview');
      // Binder 453.59237 g = sponge 100 g (flour 60, sugar 40) + butter 113.3980925 g, scaled by 453.59237/213.3980925;
      // almond flour 56.69904625 g (2 oz); as-added order, 21 CFR 101.4(a)(1).
      await expect.poll(() => preview.getByTestId('label-statement').innerText()).toBe('Ingredients: Butter (milk) (cream), Cake flour (wheat flour, niacin), Sugar, Almond flour');
      const live = await preview.getByTestId('label-statement').innerText();
      await expect(preview.getByTestId('label-contains').innerText()).resolves.toBe('Contains: Milk, Almond, Wheat');
      // 6 × 1 oz = 170.09713875 g → "6 oz (170 g)" round-down (16 CFR 500.19(b)).
      await expect(preview.getByTestId('label-net').innerText()).resolves.toBe('6 pieces, Net wt 6 oz (170 g)');
      expect(describeViolations(await checkA11y(page))).toEqual([]);

      // Another profile on request: the EU list names the nut in the statement, no US Contains line.
      await preview.getByLabel('Rule profile').selectOption('eu-1169-2011');
      await expect.poll(() => preview.getByTestId('label-contains').count()).toBe(0);
      await preview.getByLabel('Rule profile').selectOption({ index: 0 });

      await page.getByRole('button', { name: 'Save recipe' }).click();
      await page.getByRole('heading', { name: 'E2E almond pops', level: 1 }).waitFor();
      const id = page.url().split('/recipes/')[1]!;
      const server1 = await page.request.get(`${server.baseUrl}/api/recipes/${id}/label-preview?profileId=us-federal-2025-01&version=1`);
      const body = await server1.json();
      expect(body.labelText.ingredientStatement.text).toBe(live);

      // The editor for the saved version computes the same text again in the browser.
      await page.goto(`${server.baseUrl}/recipes/${id}/edit`);
      await expect.poll(() => page.getByTestId('live-preview').getByTestId('label-statement').innerText()).toBe(body.labelText.ingredientStatement.text);
      await page.getByRole('button', { name: 'Save new version' }).click();
      await expect.poll(() => page.getByText('Say why you are changing the recipe').count()).toBeGreaterThan(0);
      await page.getByLabel('Why are you changing it?').fill('Checked the weights');
      await page.getByRole('button', { name: 'Save new version' }).click();
      await page.getByText(/^Version 2/).first().waitFor();
      await expect(page.getByText('Reason: Checked the weights').isVisible()).resolves.toBe(true);

      await page.goto(`${server.baseUrl}/recipes/allergen-matrix`);
      const row = page.getByTestId('allergen-matrix').getByRole('row', { name: /E2E almond pops/ });
      await expect(row.innerText()).resolves.toContain('Contains (Almond)');
      await expect(page.getByText(/may have cross-contact/).isVisible()).resolves.toBe(true);
      expect(describeViolations(await checkA11y(page))).toEqual([]);
    } finally {
      await context.close();
    }
  }, 120_000);
});
