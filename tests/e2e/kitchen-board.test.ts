import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { Browser } from 'playwright-core';
import { checkA11y, describeViolations, launchBrowser, newPage, signInInBrowser, startE2eServer, VIEWPORTS, type E2eServer } from '../support/e2e';
import { createTestBusiness, TEST_PASSWORD, type TestBusiness } from '../support/agents';
import { createBatch, createSimpleRecipe } from '../support/factories';

let server: E2eServer;
let browser: Browser;
let business: TestBusiness;

beforeAll(async () => {
  [server, browser] = await Promise.all([startE2eServer(), launchBrowser()]);
  business = await createTestBusiness(server.t);
  const { recipeVersion } = await createSimpleRecipe(server.t, business.businessId, ['Flour']);
  await createBatch(server.t, business.businessId, { recipeVersionId: recipeVersion.id });
}, 180_000);
afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('kitchen board on a tablet', () => {
  test('a helper starts a timer and sees it count down', async () => {
    const { context, page } = await newPage(browser, VIEWPORTS.tablet);
    try {
      await signInInBrowser(page, server.baseUrl, business.members.helper.email, TEST_PASSWORD);
      await page.goto(`${server.baseUrl}/`);
      await page.getByRole('heading', { name: 'Kitchen board', level: 1 }).waitFor();
      await page.getByText('No timers running').waitFor();
      await page.getByText(/model values/).waitFor();

      const start = page.getByRole('button', { name: 'Start timer' }).first();
      expect((await start.boundingBox())!.height).toBeGreaterThanOrEqual(44);
      await start.click();
      const dialog = page.getByRole('dialog', { name: 'Start a timer' });
      await dialog.getByLabel('Batch').selectOption({ index: 1 });
      await dialog.getByLabel('What is the food doing?').selectOption('setting');
      await dialog.getByLabel('Time limit').selectOption('custom');
      // Server validation reaches the field: a custom limit needs its minutes.
      await dialog.getByRole('button', { name: 'Start timer' }).click();
      await dialog.getByText('Enter your own time limit in minutes.').or(dialog.getByText('Enter the limit in minutes')).first().waitFor();
      await dialog.getByLabel('Limit in minutes').fill('30');
      await dialog.getByRole('button', { name: 'Start timer' }).click();
      await dialog.waitFor({ state: 'hidden' });

      const countdown = page.getByTestId('countdown').first();
      await countdown.waitFor();
      const first = await countdown.innerText();
      expect(first).toMatch(/(29|30):\d\d$/);
      const fontSize = await countdown.evaluate((el) => getComputedStyle(el).fontSize);
      expect(fontSize).toBe('48px');
      await page.waitForTimeout(2_200);
      const second = await countdown.innerText();
      expect(second).not.toBe(first);
      await expect(page.getByRole('article').first().getByText(/[−+]\d\d:\d\d/).first().isVisible()).resolves.toBe(true);
      expect(describeViolations(await checkA11y(page))).toEqual([]);

      await page.getByRole('button', { name: 'Add reading' }).click();
      const reading = page.getByRole('dialog', { name: /Add a reading/ });
      await reading.getByLabel('Temperature').fill('68');
      await reading.getByRole('button', { name: 'Save reading' }).click();
      await page.getByText(/68 °F \(20 °C\)/).waitFor();
      await page.getByRole('button', { name: 'Stop' }).click();
      await page.getByText('No timers running').waitFor();
    } finally {
      await context.close();
    }
  }, 60_000);
});
