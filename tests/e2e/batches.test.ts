import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { Browser } from 'playwright-core';
import { checkA11y, describeViolations, launchBrowser, newPage, signInInBrowser, startE2eServer, type E2eServer } from '../support/e2e';
import { createTestBusiness, TEST_PASSWORD, type TestBusiness } from '../support/agents';
import { uniqueSuffix } from '../support/db';
import { createBatch, createIngredient, createRecipeVersion, createSupplierLot } from '../support/factories';

let server: E2eServer;
let browser: Browser;
let business: TestBusiness;

beforeAll(async () => {
  [server, browser] = await Promise.all([startE2eServer(), launchBrowser()]);
  business = await createTestBusiness(server.t);
});
afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('recording a batch in the browser', () => {
  test('a baker records a batch from a recipe version with its lots and a frosting batch, then holds it with confirmation', async () => {
    const t = server.t;
    const b = business.businessId;
    const s = uniqueSuffix();
    const crumb = await createIngredient(t, b, { labelName: `Cake crumb ${s}` });
    const sprinkles = await createIngredient(t, b, { labelName: `Sprinkles ${s}` });
    const butter = await createIngredient(t, b, { labelName: `Butter ${s}` });
    await createSupplierLot(t, b, { ingredientId: crumb.id, lotCode: 'MILL-4471', receivedOn: '2026-11-02' });
    await createSupplierLot(t, b, { ingredientId: sprinkles.id, lotCode: 'SPR-0912', receivedOn: '2026-11-03' });
    const butterLot = await createSupplierLot(t, b, { ingredientId: butter.id, lotCode: 'BTR-22', receivedOn: '2026-11-04' });
    const frosting = await createRecipeVersion(t, b, { name: `Binder frosting ${s}`, isSellable: false, components: [{ kind: 'ingredient', ingredientId: butter.id, grams: '200' }] });
    const frostingBatch = await createBatch(t, b, { recipeVersionId: frosting.id, lots: [{ ingredientId: butter.id, supplierLotId: butterLot.id }] });
    await createRecipeVersion(t, b, { name: `Confetti cake pops ${s}`, shelfLifeDays: 7, components: [
      { kind: 'ingredient', ingredientId: crumb.id, grams: '500' }, { kind: 'ingredient', ingredientId: sprinkles.id, grams: '20' }, { kind: 'recipe', recipeId: frosting.recipeId, grams: '100' },
    ] });

    const { context, page } = await newPage(browser);
    try {
      await signInInBrowser(page, server.baseUrl, business.members.baker.email, TEST_PASSWORD);
      await page.goto(`${server.baseUrl}/batches`);
      await page.getByRole('heading', { level: 1, name: 'Batches' }).waitFor();
      expect(describeViolations(await checkA11y(page))).toEqual([]);
      await page.getByRole('link', { name: 'Record a batch' }).first().click();
      await page.getByRole('heading', { level: 1, name: 'Record a batch' }).waitFor();
      await page.getByLabel('Recipe', { exact: true }).selectOption({ label: `Confetti cake pops ${s}` });
      await page.getByLabel(`Supplier lot of Cake crumb ${s}`).selectOption({ label: 'MILL-4471, received 2026-11-02' });
      await page.getByLabel(`Binder frosting ${s} (made in its own batch?)`).selectOption(frostingBatch.id);
      // With the frosting from its batch, its butter needs no lot of its own.
      await expect(page.getByLabel(`Supplier lot of Butter ${s}`).count()).resolves.toBe(0);
      await page.getByLabel('Pieces').fill('36');
      expect(describeViolations(await checkA11y(page))).toEqual([]);
      await page.getByRole('button', { name: 'Record batch' }).click();

      await page.getByRole('heading', { level: 1, name: /^Batch CT-\d{5}-\d{2}$/ }).waitFor();
      const what = page.getByRole('region', { name: 'What went in' });
      await expect(what.textContent()).resolves.toContain('MILL-4471');
      await expect(what.textContent()).resolves.toContain(frostingBatch.lotCode);
      // Sprinkles were left as "Not recorded": the page warns.
      await expect(page.getByText(`No supplier lot recorded for Sprinkles ${s}.`).isVisible()).resolves.toBe(true);
      expect(describeViolations(await checkA11y(page))).toEqual([]);

      await page.getByRole('button', { name: 'Change state' }).click();
      await page.getByLabel('New state').selectOption('held');
      await page.getByLabel('Reason').fill('Checking the sprinkles lot with the supplier');
      expect(describeViolations(await checkA11y(page))).toEqual([]);
      await page.getByRole('button', { name: 'Review change' }).click();
      await page.getByRole('alertdialog').getByText('Mark batch').waitFor();
      await page.getByRole('button', { name: 'Yes, mark as held' }).click();
      await page.getByRole('region', { name: 'State history' }).getByText('Checking the sprinkles lot with the supplier').waitFor();
      await expect(page.getByText('State:').textContent()).resolves.toContain('Held');
    } finally {
      await context.close();
    }
  }, 90_000);
});
