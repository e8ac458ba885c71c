import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { Browser } from 'playwright-core';
import { checkA11y, describeViolations, launchBrowser, newPage, signInInBrowser, startE2eServer, VIEWPORTS, type E2eServer } from '../support/e2e';
import { createTestBusiness, signedInAgent, TEST_PASSWORD, type TestBusiness } from '../support/agents';
import { cleaningSetup } from '../support/cleaning';

let server: E2eServer;
let browser: Browser;
let business: TestBusiness;

beforeAll(async () => {
  [server, browser] = await Promise.all([startE2eServer(), launchBrowser()]);
  business = await createTestBusiness(server.t);
  await cleaningSetup(await signedInAgent(server.t, business, 'owner'));
}, 180_000);
afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('cleaning on a kitchen tablet', () => {
  test('a helper taps through a checklist, sees the live chlorine check and the cautions, and signs with their own password', async () => {
    const { context, page } = await newPage(browser, VIEWPORTS.tablet);
    try {
      await signInInBrowser(page, server.baseUrl, business.members.helper.email, TEST_PASSWORD);
      await page.goto(`${server.baseUrl}/cleaning`);
      await page.getByRole('heading', { name: 'Cleaning', level: 1 }).waitFor();
      // Helpers record and sign but do not edit equipment or checklists.
      expect(await page.getByRole('heading', { name: 'Equipment and checklists' }).count()).toBe(0);
      await page.getByRole('button', { name: 'Start cleaning' }).click();
      const wash = page.getByRole('button', { name: 'Mark “Wash” done' });
      await wash.waitFor();
      // Touch-first: step buttons are at least 44 CSS px tall (WCAG 2.5.5 enhanced target size).
      expect((await wash.boundingBox())!.height).toBeGreaterThanOrEqual(44);
      await wash.click();
      await page.getByRole('button', { name: 'Done again' }).waitFor();
      await page.getByRole('button', { name: 'Mark “Rinse” done' }).click();
      await page.getByRole('button', { name: 'Mark “Air-dry” done' }).click();
      await page.getByRole('button', { name: 'Record sanitising' }).click();

      const form = page.getByRole('form', { name: 'Sanitising measurements' });
      await expect(form.getByText('Never mix sanitisers or cleaners', { exact: false }).isVisible()).resolves.toBe(true);
      await expect(form.getByText('scalds', { exact: false }).isVisible()).resolves.toBe(true);
      await expect(form.getByText('local health authority', { exact: false }).isVisible()).resolves.toBe(true);
      // "chlorine 50 ppm, 80 °F, pH 9" fails live (FDA Food Code 2022 4-501.114(A) needs 100 °F at that pH) ...
      await form.getByLabel('Concentration').fill('50');
      await form.getByLabel('Water temperature').fill('80');
      await form.getByLabel('pH').fill('9');
      await form.getByLabel('Contact time').fill('10');
      await form.getByText('Check fails').waitFor();
      await form.getByText('too cool', { exact: false }).waitFor();
      // ... and "pH 7.5, 8 s" passes (4-501.114(A), 4-703.11(C)).
      await form.getByLabel('pH').fill('7.5');
      await form.getByLabel('Contact time').fill('8');
      await form.getByText('Check passes').waitFor();
      expect(describeViolations(await checkA11y(page))).toEqual([]);
      await form.getByRole('button', { name: 'Save sanitising step' }).click();
      await page.getByText('Check passed').waitFor();

      await page.getByRole('button', { name: 'Sign this checklist' }).click();
      const dialog = page.getByRole('dialog');
      await dialog.getByText('Cleaned and sanitised', { exact: false }).waitFor();
      await dialog.getByLabel('Your password').fill('not my password');
      await dialog.getByRole('button', { name: 'Sign', exact: true }).click();
      await dialog.getByText('That password is not right', { exact: false }).first().waitFor();
      expect(describeViolations(await checkA11y(page))).toEqual([]);
      await dialog.getByLabel('Your password').fill(TEST_PASSWORD);
      await dialog.getByRole('button', { name: 'Sign', exact: true }).click();

      const signature = page.getByTestId('signature');
      await signature.waitFor();
      const text = await signature.innerText();
      expect(text).toContain(business.members.helper.displayName);
      expect(text).toContain('Cleaned and sanitised');
      // Date and time with the zone offset (the test business is in America/Chicago).
      expect(text).toMatch(/\d{4}-\d\d-\d\d \d\d:\d\d \u22120[56]:00/);
      expect(await page.getByRole('button', { name: 'Mark “Wash” done' }).count()).toBe(0);
      expect(describeViolations(await checkA11y(page))).toEqual([]);
    } finally {
      await context.close();
    }
  }, 120_000);
});
