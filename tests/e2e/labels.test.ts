import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import fs from 'node:fs';
import type { Browser } from 'playwright-core';
import { checkA11y, describeViolations, launchBrowser, newPage, signInInBrowser, startE2eServer, VIEWPORTS, type E2eServer } from '../support/e2e';
import { createTestBusiness, TEST_PASSWORD, type TestBusiness } from '../support/agents';
import { decodeQr, labelledBatch, renderPdfPage, setBusinessContact } from '../support/label-batches';
import type { Actor } from '../../server/lib/actor';

let server: E2eServer;
let browser: Browser;
let business: TestBusiness;
let batch: Awaited<ReturnType<typeof labelledBatch>>['batch'];

beforeAll(async () => {
  server = await startE2eServer();
  // The QR must point at this server: the label service reads the public address at request time.
  server.t.config.publicBaseUrl = server.baseUrl;
  business = await createTestBusiness(server.t, { ruleProfileId: 'us-tx-2025-09' });
  await setBusinessContact(server.t, business.businessId, { ruleProfileId: 'us-tx-2025-09' });
  const owner: Actor = { kind: 'member', businessId: business.businessId, userId: business.members.owner.userId, name: business.members.owner.displayName, role: 'owner' };
  ({ batch } = await labelledBatch(server.t, business.businessId, owner));
  browser = await launchBrowser();
}, 120_000);

afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('labels in the browser', () => {
  test('a baker prints a label sheet from a batch; its QR opens the lot page', async () => {
    const { context, page } = await newPage(browser);
    await signInInBrowser(page, server.baseUrl, business.members.baker.email, TEST_PASSWORD);
    await page.goto(`${server.baseUrl}/labels?batchId=${batch.id}`);
    await page.getByRole('heading', { name: 'Labels', level: 1 }).waitFor();
    await expect(page.getByText('check with your local health authority before you sell', { exact: false }).first().isVisible()).resolves.toBe(true);
    await page.getByText('Ready to print').waitFor();
    await page.getByLabel('Label size').selectOption('rect-3x2in');
    await page.getByLabel('How many labels').fill('8');
    await expect(page.getByText('2 × 4 = 8 labels per page.').isVisible()).resolves.toBe(true);
    expect(describeViolations(await checkA11y(page))).toEqual([]);

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Print labels (download PDF)' }).click()]);
    const bytes = fs.readFileSync((await download.path())!);
    expect(bytes.subarray(0, 5).toString()).toBe('%PDF-');
    await page.getByText('recorded. Print it at 100 %', { exact: false }).waitFor();
    await page.getByRole('cell', { name: batch.lotCode }).first().waitFor(); // print history

    // The first 3 × 2 in label sits at the 12.7 mm (0.5 in) top-left margin.
    const url = decodeQr(await renderPdfPage(bytes, 1, 300, { x: 0.5, y: 0.5, w: 3, h: 2 }));
    expect(url).toBe(`${server.baseUrl}/lot/${batch.publicCode}`);
    const { context: phone, page: lot } = await newPage(browser, VIEWPORTS.phone);
    const errors: string[] = [];
    lot.on('console', (m) => { if (m.type() === 'error') errors.push(m.text()); });
    await lot.goto(url!);
    await lot.getByRole('heading', { name: 'Pecan Praline Pops', level: 1 }).waitFor();
    await expect(lot.getByText('Contains: Milk, Egg, Pecan, Wheat').isVisible()).resolves.toBe(true);
    expect(errors).toEqual([]); // the inline style passes the page's CSP hash
    const width = await lot.evaluate(() => document.documentElement.scrollWidth);
    expect(width).toBeLessThanOrEqual(VIEWPORTS.phone.width); // one column, no sideways scrolling
    expect(describeViolations(await checkA11y(lot))).toEqual([]);
    await phone.close();
    await context.close();
  });

  test('a helper cannot reach the print screen', async () => {
    const { context, page } = await newPage(browser);
    await signInInBrowser(page, server.baseUrl, business.members.helper.email, TEST_PASSWORD);
    await page.goto(`${server.baseUrl}/labels`);
    await page.getByText('Not available for your role').waitFor();
    await expect(page.getByRole('button', { name: 'Print labels (download PDF)' }).count()).resolves.toBe(0);
    await context.close();
  });
});
