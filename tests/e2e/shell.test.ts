import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { Browser } from 'playwright-core';
import { checkA11y, describeViolations, launchBrowser, newPage, signInInBrowser, startE2eServer, type E2eServer } from '../support/e2e';
import { createTestBusiness, TEST_PASSWORD, type TestBusiness } from '../support/agents';

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

const NAV_BY_ROLE = {
  owner: ['Kitchen board', 'Batches', 'Recipes', 'Ingredients', 'Cleaning', 'Labels', 'Sales', 'Records', 'Trace & recall', 'Team', 'Settings', 'Sent mail', 'Account'],
  baker: ['Kitchen board', 'Batches', 'Recipes', 'Ingredients', 'Cleaning', 'Labels', 'Sales', 'Account'],
  helper: ['Kitchen board', 'Batches', 'Recipes', 'Cleaning', 'Account'],
} as const;

describe('signed-in shell', () => {
  test.each(['owner', 'baker', 'helper'] as const)('when a %s signs in, then the navigation lists exactly their screens', async (role) => {
    const { context, page } = await newPage(browser);
    await signInInBrowser(page, server.baseUrl, business.members[role].email, TEST_PASSWORD);
    const nav = page.getByRole('navigation', { name: 'Main' });
    await expect.poll(() => nav.getByRole('link').allInnerTexts()).toEqual([...NAV_BY_ROLE[role]]);
    await expect(page.getByText(business.name).first().isVisible()).resolves.toBe(true);
    expect(describeViolations(await checkA11y(page))).toEqual([]);
    await context.close();
  });
});
