import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { Browser } from 'playwright-core';
import { checkA11y, describeViolations, launchBrowser, newPage, signInInBrowser, startE2eServer, type E2eServer } from '../support/e2e';
import { createTestBusiness, TEST_PASSWORD, type TestBusiness } from '../support/agents';
import { createBatch, createSimpleRecipe } from '../support/factories';
import { startMailCapture, type MailCapture } from '../../server/features/mail/mail-capture';
import { createMailTransport, runMailOnce } from '../../server/features/mail/mail.service';
import { addCalendarDays } from '../../shared/domain/calendar-date';

let server: E2eServer;
let browser: Browser;
let business: TestBusiness;
let capture: MailCapture;
let lotCode: string;

beforeAll(async () => {
  [server, browser] = await Promise.all([startE2eServer(), launchBrowser()]);
  // The local SMTP stand-in, as `npm start` runs it without SMTP_URL: Sent mail lists what it received.
  capture = await startMailCapture({ db: server.t.db });
  business = await createTestBusiness(server.t);
  const { recipeVersion } = await createSimpleRecipe(server.t, business.businessId, ['Flour']);
  lotCode = (await createBatch(server.t, business.businessId, { recipeVersionId: recipeVersion.id })).lotCode;
}, 180_000);
afterAll(async () => {
  await browser?.close();
  await capture?.close();
  await server?.close();
});

describe('inspector link in the browser', () => {
  test('the owner e-mails a link, Sent mail shows it, and the inspector reads the records without the token in the address', async () => {
    const owner = await newPage(browser);
    const inspector = await newPage(browser);
    try {
      const { page } = owner;
      await signInInBrowser(page, server.baseUrl, business.members.owner.email, TEST_PASSWORD);
      await page.goto(`${server.baseUrl}/records`);
      const links = page.getByRole('region', { name: 'Inspector links' });
      await links.waitFor();
      const today = server.t.clock.now.toISOString().slice(0, 10);
      await links.getByLabel('Inspector or office').fill('Millbrook County Health');
      await links.getByLabel('E-mail the link to (optional)').fill('inspector@millbrook-health.test');
      await links.getByLabel('Records from').fill(addCalendarDays(today, -14));
      await links.getByLabel('Records to').fill(addCalendarDays(today, 1));
      await links.getByRole('button', { name: 'Create link' }).click();
      const shown = links.getByRole('status').filter({ hasText: 'New link' });
      const url = (await shown.locator('code').innerText()).trim();
      expect(url).toMatch(/\/inspect\/[A-Za-z0-9_-]{43}$/);
      const token = url.split('/inspect/')[1]!;

      // The background sender, one round, over real SMTP into the stand-in (this business's mail only).
      const sent = await runMailOnce({ db: server.t.db, now: () => server.t.clock.now, transport: createMailTransport(`smtp://127.0.0.1:${capture.port}`), from: 'Crumbtrail <no-reply@crumbtrail.invalid>', businessId: business.businessId });
      expect(sent).toEqual({ sent: 1, failed: 0 });
      await page.goto(`${server.baseUrl}/sent-mail`);
      const mail = page.getByRole('article').filter({ hasText: 'food-safety records for your review' });
      await mail.waitFor();
      await expect(mail.getByText('inspector@millbrook-health.test').isVisible()).resolves.toBe(true);
      expect(await mail.locator('pre').innerText()).toContain(`/inspect/${token}`);

      // The inspector: another browser, no account. The token is swapped for a cookie and leaves the address bar.
      const ip = inspector.page;
      await ip.goto(`${server.baseUrl}/inspect/${token}`);
      await ip.waitForURL(`${server.baseUrl}/inspector`);
      expect(ip.url()).not.toContain(token);
      await ip.getByText('Inspector view — read only').waitFor();
      await ip.getByRole('heading', { level: 1, name: business.name }).waitFor();
      await ip.getByRole('heading', { name: /^Batches/ }).waitFor();
      await ip.getByRole('rowheader', { name: lotCode }).waitFor();
      await ip.getByRole('heading', { name: 'Allergen matrix' }).waitFor();
      await ip.getByRole('complementary', { name: /Local rules decide/ }).waitFor();
      // No member navigation and no sign-in prompt on this screen.
      expect(await ip.getByRole('navigation').count()).toBe(0);
      expect(await ip.getByRole('button', { name: 'Sign out' }).count()).toBe(0);
      expect(describeViolations(await checkA11y(ip))).toEqual([]);

      // A write from the inspector's session, with its own CSRF token, is refused by role.
      const write = await ip.evaluate(async () => {
        const { csrfToken } = (await (await fetch('/api/auth/session')).json()) as { csrfToken: string };
        const res = await fetch('/api/inspector-links', { method: 'POST', headers: { 'Content-Type': 'application/json', 'X-CSRF-Token': csrfToken }, body: JSON.stringify({ inspectorName: 'x', rangeFrom: '2026-01-01', rangeTo: '2026-01-02' }) });
        return { status: res.status, body: (await res.json()) as { error: { message: string } } };
      });
      expect(write.status).toBe(403);
      expect(write.body.error.message).toBe('Your role may not do that.');

      // The owner revokes the link; the inspector's next load says so plainly.
      await page.goto(`${server.baseUrl}/records`);
      await page.getByRole('region', { name: 'Inspector links' }).getByRole('button', { name: 'Revoke' }).first().click();
      await page.getByRole('region', { name: 'Inspector links' }).getByText(/revoked/).first().waitFor();
      await ip.reload();
      await ip.getByRole('heading', { level: 1, name: 'This link has expired or was revoked' }).waitFor();
      expect(ip.url()).toBe(`${server.baseUrl}/inspector`);
      expect(describeViolations(await checkA11y(ip))).toEqual([]);
    } finally {
      await owner.context.close();
      await inspector.context.close();
    }
  }, 90_000);
});
