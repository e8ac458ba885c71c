import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { AxeBuilder } from '@axe-core/playwright';
import { AXE_TAGS, checkA11y, describeViolations, launchBrowser, newPage, signInInBrowser, startE2eServer, VIEWPORTS, type E2eServer } from '../support/e2e';
import { createTestBusiness, signedInAgent, TEST_PASSWORD, type TestBusiness } from '../support/agents';

let server: E2eServer;
let browser: Browser;
let business: TestBusiness;
const SHOTS = path.resolve('.data/screenshots');

beforeAll(async () => {
  [server, browser] = await Promise.all([startE2eServer({ demoMode: true }), launchBrowser()]);
  business = await createTestBusiness(server.t);
  // The sign-in page lists whatever demo accounts the server has; point them at this test's people.
  server.t.config.demoAccounts = (['owner', 'baker', 'helper'] as const).map((role) => ({ ...business.members[role], role, password: TEST_PASSWORD }));
  fs.mkdirSync(SHOTS, { recursive: true });
});
afterAll(async () => {
  await browser?.close();
  await server?.close();
});

const NAV_BY_ROLE = {
  owner: ['Kitchen board', 'Batches', 'Recipes', 'Ingredients', 'Cleaning', 'Labels', 'Sales', 'Records', 'Trace & recall', 'Team', 'Settings', 'Sent mail', 'Account'],
  baker: ['Kitchen board', 'Batches', 'Recipes', 'Ingredients', 'Cleaning', 'Labels', 'Sales', 'Account'],
  helper: ['Kitchen board', 'Batches', 'Recipes', 'Ingredients', 'Cleaning', 'Account'],
} as const;

async function expectNoViolations(page: Page) {
  expect(describeViolations(await checkA11y(page))).toEqual([]);
}

async function withPage(viewport: { width: number; height: number }, fn: (page: Page) => Promise<void>) {
  const { context, page } = await newPage(browser, viewport);
  try {
    await fn(page);
  } finally {
    await context.close();
  }
}

describe('sign-in', () => {
  test('when the page opens in demo mode, then it lists the demo people and a click fills the form', () =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await page.goto(`${server.baseUrl}/sign-in`);
      await expectNoViolations(page);
      await page.getByRole('button', { name: new RegExp(business.members.baker.displayName) }).click();
      await expect(page.getByLabel('E-mail').inputValue()).resolves.toBe(business.members.baker.email);
      await expect(page.getByLabel('Password', { exact: true }).inputValue()).resolves.toBe(TEST_PASSWORD);
    }));

  test('when the password is wrong, then the error is in text, tied to the form, and axe finds nothing', () =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await page.goto(`${server.baseUrl}/sign-in`);
      await page.getByRole('button', { name: 'Sign in', exact: true }).click();
      await expect.poll(() => page.getByLabel('E-mail').getAttribute('aria-invalid')).toBe('true');
      await expectNoViolations(page);
      await page.getByLabel('E-mail').fill(business.members.owner.email);
      await page.getByLabel('Password', { exact: true }).fill('not the password');
      await page.getByRole('button', { name: 'Sign in', exact: true }).click();
      await expect(page.getByRole('alert').first().innerText()).resolves.toContain('do not match');
      await expectNoViolations(page);
    }));

  test('when signing in with the keyboard only, then Tab and Enter reach the kitchen board with focus always visible', () =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await page.goto(`${server.baseUrl}/sign-in`);
      await page.getByRole('heading', { name: 'Sign in' }).waitFor();
      const focusedLabel = () => page.evaluate(() => (document.activeElement as HTMLInputElement | null)?.labels?.[0]?.textContent ?? document.activeElement?.textContent ?? '');
      const outline = () => page.evaluate(() => getComputedStyle(document.activeElement!).outlineWidth + ' ' + getComputedStyle(document.activeElement!).outlineStyle);
      for (let i = 0; i < 6 && (await focusedLabel()) !== 'E-mail'; i++) await page.keyboard.press('Tab');
      expect(await focusedLabel()).toBe('E-mail');
      expect(await outline()).toBe('3px solid');
      await page.keyboard.type(business.members.helper.email);
      await page.keyboard.press('Tab');
      expect(await focusedLabel()).toBe('Password');
      await page.keyboard.type(TEST_PASSWORD);
      await page.keyboard.press('Enter');
      await page.getByRole('heading', { name: 'Kitchen board', level: 1 }).waitFor();
      expect(new URL(page.url()).pathname).toBe('/');
    }));

  test('when a signed-out person opens a deep link, then they sign in and land on it', () =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await page.goto(`${server.baseUrl}/recipes`);
      await page.waitForURL(/\/sign-in\?next=%2Frecipes/);
      await page.getByLabel('E-mail').fill(business.members.baker.email);
      await page.getByLabel('Password', { exact: true }).fill(TEST_PASSWORD);
      await page.getByRole('button', { name: 'Sign in', exact: true }).click();
      await page.getByRole('heading', { name: 'Recipes', level: 1 }).waitFor();
      expect(new URL(page.url()).pathname).toBe('/recipes');
    }));
});

describe('signed-in shell', () => {
  test.each(['owner', 'baker', 'helper'] as const)('when a %s signs in, then the navigation lists exactly their screens', (role) =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await signInInBrowser(page, server.baseUrl, business.members[role].email, TEST_PASSWORD);
      const nav = page.getByRole('navigation', { name: 'Main' });
      await expect.poll(() => nav.getByRole('link').allInnerTexts()).toEqual([...NAV_BY_ROLE[role]]);
      await expect(page.getByText(business.name).first().isVisible()).resolves.toBe(true);
      await expect(page.getByRole('button', { name: 'Sign out' }).isVisible()).resolves.toBe(true);
      await expectNoViolations(page);
    }));

  test('the installed axe really runs the 24 px target-size rule on the shell', () =>
    withPage(VIEWPORTS.phone, async (page) => {
      await signInInBrowser(page, server.baseUrl, business.members.owner.email, TEST_PASSWORD);
      const results = await new AxeBuilder({ page }).withTags(AXE_TAGS).analyze();
      expect([...results.passes, ...results.violations].map((r) => r.id)).toContain('target-size');
      expect(results.violations).toEqual([]);
    }));

  test('when a helper opens the team screen by address, then it says the screen is not for their role', () =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await signInInBrowser(page, server.baseUrl, business.members.helper.email, TEST_PASSWORD);
      await page.goto(`${server.baseUrl}/team`);
      await page.getByRole('heading', { name: 'Not available for your role' }).waitFor();
      await expectNoViolations(page);
    }));

  test('when an address does not exist, then a 404 page offers the way home', () =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await page.goto(`${server.baseUrl}/no-such-page`);
      await page.getByRole('heading', { name: 'Page not found' }).waitFor();
      await expect(page.getByRole('link', { name: 'Go to the kitchen board' }).isVisible()).resolves.toBe(true);
      await expectNoViolations(page);
    }));

  test('when sign out is pressed, then the session ends and protected pages ask to sign in', () =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await signInInBrowser(page, server.baseUrl, business.members.baker.email, TEST_PASSWORD);
      await page.getByRole('button', { name: 'Sign out' }).click();
      await page.getByText('You are signed out.').waitFor();
      await page.goto(`${server.baseUrl}/batches`);
      await page.waitForURL(/\/sign-in/);
    }));

  test('when the idle limit nears, then a dialog offers to stay signed in, and it works again and again', async () => {
    const { context, page } = await newPage(browser, VIEWPORTS.desktop);
    try {
      await context.clock.install();
      await signInInBrowser(page, server.baseUrl, business.members.owner.email, TEST_PASSWORD);
      // A screen that does not poll: any answered request restarts the server's idle timer, and the warning with it.
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Account' }).click();
      await page.getByRole('table', { name: 'Where you are signed in' }).waitFor();
      for (let round = 1; round <= 2; round++) {
        await page.clock.fastForward('28:30');
        const dialog = page.getByRole('alertdialog', { name: 'You will be signed out soon' });
        await dialog.waitFor();
        await expectNoViolations(page);
        const extended = page.waitForResponse((r) => r.url().endsWith('/api/auth/session') && r.status() === 200);
        await dialog.getByRole('button', { name: 'Stay signed in' }).click();
        expect(((await (await extended).json()) as { user: unknown }).user).not.toBeNull();
        await dialog.waitFor({ state: 'hidden' });
      }
      await expect(page.getByRole('button', { name: 'Sign out' }).isVisible()).resolves.toBe(true);
    } finally {
      await context.close();
    }
  });
});

describe('team and account pages', () => {
  test('when the owner opens Team and submits bad input, then errors are tied to fields and axe finds nothing', () =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await signInInBrowser(page, server.baseUrl, business.members.owner.email, TEST_PASSWORD);
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Team' }).click();
      await page.getByRole('table', { name: 'Team members' }).waitFor();
      await expect(page.getByRole('row', { name: new RegExp(business.members.helper.displayName) }).count()).resolves.toBe(1);
      await expectNoViolations(page);

      await page.getByRole('button', { name: 'Create invite' }).click();
      const email = page.getByLabel('E-mail');
      await expect.poll(() => email.getAttribute('aria-invalid')).toBe('true');
      await expectNoViolations(page);

      // A server-side conflict lands on the field too.
      await email.fill(business.members.baker.email);
      await page.getByRole('button', { name: 'Create invite' }).click();
      await expect.poll(() => page.getByText('That e-mail already belongs to a team member.').count()).toBe(1);
      await expectNoViolations(page);

      await email.fill(`new-${Date.now()}@test.invalid`);
      await page.getByRole('button', { name: 'Create invite' }).click();
      const dialog = page.getByRole('dialog', { name: 'Give them this invite code' });
      await dialog.waitFor();
      await expectNoViolations(page);
      await dialog.getByRole('button', { name: 'Done' }).click();
      await page.getByRole('table', { name: 'Invites waiting to be accepted' }).getByRole('row').nth(1).waitFor();
    }));

  test('when the session ends while typing, then signing in again comes back with the input kept', () =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await signInInBrowser(page, server.baseUrl, business.members.owner.email, TEST_PASSWORD);
      await page.goto(`${server.baseUrl}/team`);
      const typed = `kept-${Date.now()}@test.invalid`;
      await page.getByLabel('E-mail').fill(typed);
      await page.getByLabel('Role', { exact: true }).selectOption('baker');
      await server.t.pool.query(`DELETE FROM user_sessions WHERE sess->>'userId' = $1`, [business.members.owner.userId]);
      await page.getByRole('button', { name: 'Create invite' }).click();
      await page.waitForURL(/\/sign-in\?next=%2Fteam&reason=expired/);
      await page.getByText('Your session ended').waitFor();
      await page.getByLabel('E-mail').fill(business.members.owner.email);
      await page.getByLabel('Password', { exact: true }).fill(TEST_PASSWORD);
      await page.getByRole('button', { name: 'Sign in', exact: true }).click();
      await page.getByRole('heading', { name: 'Team', level: 1 }).waitFor();
      await expect.poll(() => page.getByLabel('E-mail').inputValue()).toBe(typed);
      await expect(page.getByLabel('Role', { exact: true }).inputValue()).resolves.toBe('baker');
    }));

  test('when someone joins with an invite code, then they choose a password and land signed in with their role', async () => {
    const owner = await signedInAgent(server.t, business, 'owner');
    const email = `joiner-${Date.now()}@test.invalid`;
    const created = await owner.post('/api/team/invites').send({ email, role: 'helper' });
    expect(created.status).toBe(201);
    await withPage(VIEWPORTS.phone, async (page) => {
      await page.goto(`${server.baseUrl}/sign-in`);
      await page.getByRole('link', { name: 'Use your invite code' }).click();
      await page.getByLabel('Invite code').fill('not-a-real-code');
      await page.getByRole('button', { name: 'Continue' }).click();
      await expect.poll(() => page.getByLabel('Invite code').getAttribute('aria-invalid')).toBe('true');
      await page.getByText('That invite code is not valid any more.').first().waitFor();
      await expectNoViolations(page);
      await page.getByLabel('Invite code').fill(created.body.code);
      await page.getByRole('button', { name: 'Continue' }).click();
      await page.getByText(`as ${email}`, { exact: false }).waitFor();
      await page.getByLabel('Your name').fill('Juniper Joiner');
      await page.getByLabel('Choose a password').fill('a long enough kitchen sentence');
      await expectNoViolations(page);
      await page.getByRole('button', { name: /^Join / }).click();
      await page.getByRole('heading', { name: 'Kitchen board', level: 1 }).waitFor();
      await expect(page.getByText('Juniper Joiner').first().isVisible()).resolves.toBe(true);
      await expect(page.getByText('Helper', { exact: false }).first().isVisible()).resolves.toBe(true);
    });
  });

  test('when the account page opens, then its forms and session table pass axe', () =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await signInInBrowser(page, server.baseUrl, business.members.helper.email, TEST_PASSWORD);
      await page.goto(`${server.baseUrl}/account`);
      await page.getByRole('table', { name: 'Where you are signed in' }).waitFor();
      await page.getByRole('button', { name: 'Change password' }).click();
      await expect.poll(() => page.getByLabel('Current password').getAttribute('aria-invalid')).toBe('true');
      await expectNoViolations(page);
    }));
});

describe('layouts at phone, tablet and desktop widths', () => {
  test.each(Object.entries(VIEWPORTS))('at %s width, the shell renders and the navigation works', (name, viewport) =>
    withPage(viewport, async (page) => {
      await signInInBrowser(page, server.baseUrl, business.members.owner.email, TEST_PASSWORD);
      await page.getByRole('heading', { name: 'Kitchen board', level: 1 }).waitFor();
      const menu = page.getByRole('button', { name: 'Menu' });
      const hasMenu = await menu.isVisible();
      expect(hasMenu).toBe(name !== 'desktop');
      if (hasMenu) {
        await menu.click();
        await expect(menu.getAttribute('aria-expanded')).resolves.toBe('true');
        await expectNoViolations(page);
        await page.screenshot({ path: path.join(SHOTS, `shell-${name}-menu.png`), fullPage: true });
      }
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Batches' }).click();
      await page.getByRole('heading', { name: 'Batches', level: 1 }).waitFor();
      expect(new URL(page.url()).pathname).toBe('/batches');
      // Focus moves to the new screen's heading, so keyboard and screen-reader users start there.
      await expect.poll(() => page.evaluate(() => document.activeElement?.tagName)).toBe('H1');
      // No sideways scrolling of the page itself (WCAG 1.4.10).
      expect(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true);
      await expectNoViolations(page);
      const file = path.join(SHOTS, `shell-${name}.png`);
      await page.screenshot({ path: file, fullPage: true });
      expect(fs.statSync(file).size).toBeGreaterThan(5_000);
      await page.goto(`${server.baseUrl}/team`);
      await page.getByRole('table', { name: 'Team members' }).waitFor();
      // Tables may scroll inside their own box (WCAG 1.4.10 exempts data tables), never the page.
      expect(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth)).toBe(true);
      await page.screenshot({ path: path.join(SHOTS, `team-${name}.png`), fullPage: true });
    }));

  test('at 320 px wide (WCAG 1.4.10 reflow), the header and account forms fit without sideways scrolling', () =>
    withPage({ width: 320, height: 640 }, async (page) => {
      await signInInBrowser(page, server.baseUrl, business.members.owner.email, TEST_PASSWORD);
      await page.goto(`${server.baseUrl}/account`);
      await page.getByRole('heading', { name: 'Change password' }).waitFor();
      expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(320);
      await expect(page.getByRole('button', { name: 'Sign out' }).isVisible()).resolves.toBe(true);
    }));

  test('when printed, then the header and navigation are left out', () =>
    withPage(VIEWPORTS.desktop, async (page) => {
      await signInInBrowser(page, server.baseUrl, business.members.owner.email, TEST_PASSWORD);
      await page.goto(`${server.baseUrl}/team`);
      await page.getByRole('table', { name: 'Team members' }).waitFor();
      await page.emulateMedia({ media: 'print' });
      await expect(page.getByRole('navigation', { name: 'Main' }).isVisible()).resolves.toBe(false);
      await expect(page.getByRole('button', { name: 'Sign out' }).isVisible()).resolves.toBe(false);
      await expect(page.evaluate(() => getComputedStyle(document.querySelector('thead')!).display)).resolves.toBe('table-header-group');
      await expect(page.getByRole('table', { name: 'Team members' }).isVisible()).resolves.toBe(true);
    }));

  test('the sign-in page at phone width', () =>
    withPage(VIEWPORTS.phone, async (page) => {
      await page.goto(`${server.baseUrl}/sign-in`);
      await page.getByRole('heading', { name: 'Sign in' }).waitFor();
      const file = path.join(SHOTS, 'sign-in-phone.png');
      await page.screenshot({ path: file, fullPage: true });
      expect(fs.statSync(file).size).toBeGreaterThan(5_000);
    }));
});
