import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Browser } from 'playwright-core';
import { checkA11y, describeViolations, launchBrowser, newPage, signInInBrowser, startE2eServer, type E2eServer } from '../support/e2e';
import { createTestBusiness, TEST_PASSWORD, type TestBusiness } from '../support/agents';
import { drawLabelPng } from '../../server/db/seed/label-images';

let server: E2eServer;
let browser: Browser;
let business: TestBusiness;
const photo = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'ct-e2e-')), 'almond-flour-label.png');

beforeAll(async () => {
  server = await startE2eServer();
  browser = await launchBrowser();
  business = await createTestBusiness(server.t);
  fs.writeFileSync(photo, drawLabelPng('almond flour'));
}, 120_000);
afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('ingredients in the browser', () => {
  test('a baker adds an ingredient with its label photo, and a helper sees it without edit controls', async () => {
    const { context, page } = await newPage(browser);
    await signInInBrowser(page, server.baseUrl, business.members.baker.email, TEST_PASSWORD);
    await page.goto(`${server.baseUrl}/ingredients/new`);
    await page.getByLabel('Name on the package').fill('Blanched almond flour');
    await page.getByLabel('Its ingredients, in package order').fill('blanched almonds');
    // Tree nuts must be named (21 U.S.C. 343(w)(2)): tick tree nuts without a kind and the form says so.
    await page.getByLabel('Tree nuts').check();
    await page.getByRole('button', { name: 'Save ingredient' }).click();
    await expect(page.getByText(/Name the tree nut/).first().isVisible()).resolves.toBe(true);
    await page.getByLabel('Which tree nuts?').fill('almond');
    await page.getByLabel('Which tree nuts?').blur();
    await page.getByLabel('Allergens confirmed against the package').check();
    expect(describeViolations(await checkA11y(page))).toEqual([]);
    await page.getByRole('button', { name: 'Save ingredient' }).click();
    await page.getByRole('heading', { name: 'Blanched almond flour', level: 1 }).waitFor();
    await expect(page.getByText('Tree nuts: almond (marked as read off the package when entered)').isVisible()).resolves.toBe(true);

    await page.getByLabel('Add a label photo or PDF').setInputFiles(photo);
    const img = page.getByRole('img', { name: /Label photo almond-flour-label/ });
    await img.waitFor();
    await expect(img.evaluate((el: HTMLImageElement) => el.complete && el.naturalWidth)).resolves.toBe(240);
    expect(describeViolations(await checkA11y(page))).toEqual([]);
    const url = page.url();
    await context.close();

    const helper = await newPage(browser);
    await signInInBrowser(helper.page, server.baseUrl, business.members.helper.email, TEST_PASSWORD);
    await helper.page.goto(url);
    await helper.page.getByRole('heading', { name: 'Blanched almond flour', level: 1 }).waitFor();
    await expect(helper.page.getByRole('button', { name: 'Edit' }).count()).resolves.toBe(0);
    await expect(helper.page.getByLabel('Add a label photo or PDF').count()).resolves.toBe(0);
    await helper.page.goto(`${server.baseUrl}/ingredients`);
    await helper.page.getByRole('link', { name: 'Blanched almond flour' }).waitFor();
    await helper.context.close();
  }, 90_000);
});
