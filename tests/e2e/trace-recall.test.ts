import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import type { Browser } from 'playwright-core';
import { checkA11y, describeViolations, launchBrowser, newPage, signInInBrowser, startE2eServer, type E2eServer } from '../support/e2e';
import { createTestBusiness, TEST_PASSWORD, type TestBusiness } from '../support/agents';
import { ownerActor, recallChain, setRuleProfile } from '../support/sales-fixtures';
import { createSale } from '../../server/features/sales/sales.service';
import { startMailCapture, type MailCapture } from '../../server/features/mail/mail-capture';
import { createMailTransport, runMailOnce } from '../../server/features/mail/mail.service';

let server: E2eServer;
let browser: Browser;
let business: TestBusiness;
let capture: MailCapture;

beforeAll(async () => {
  [server, browser] = await Promise.all([startE2eServer(), launchBrowser()]);
  capture = await startMailCapture({ db: server.t.db });
  business = await createTestBusiness(server.t);
});
afterAll(async () => {
  await capture?.close();
  await browser?.close();
  await server?.close();
});

describe('trace and recall in the browser', () => {
  test('the owner traces a recalled sprinkles lot to its customers, opens a recall, and sees the lot page and Sent mail change', async () => {
    const t = server.t;
    const chain = await recallChain(t, business);
    const owner = ownerActor(business);
    const sale = (batchId: string, newCustomer?: Parameters<typeof createSale>[2]['newCustomer']) =>
      createSale(t.db, owner, { batchId, quantity: 2, unit: 'packages', amountCents: 2400, channel: 'event', ...(newCustomer ? { newCustomer } : {}) }, t.clock.now);
    await sale(chain.productA.id, { name: 'Odile Marsh', email: 'odile.marsh@example.test', recallConsent: true });
    await sale(chain.productB.id, { name: 'Bram Keller', phone: '555-0177', recallConsent: true });

    const { context, page } = await newPage(browser);
    try {
      await signInInBrowser(page, server.baseUrl, business.members.owner.email, TEST_PASSWORD);
      // The lot page before: no recall.
      await page.goto(`${server.baseUrl}/lot/${chain.productA.publicCode}`);
      expect(await page.textContent('body')).not.toContain('Recall');

      await page.goto(`${server.baseUrl}/trace`);
      await page.getByRole('heading', { level: 1, name: 'Trace & recall' }).waitFor();
      await page.getByLabel('Which one').selectOption({ label: `Rainbow sprinkles (test) — lot ${chain.sprinklesLot.lotCode} (received ${chain.sprinklesLot.receivedOn})` });
      const tree = page.getByTestId('trace-tree');
      await tree.getByText(chain.productB.lotCode).waitFor();
      for (const b of [chain.frosting, chain.productA, chain.productB]) await tree.getByText(b.lotCode).waitFor();
      expect(await tree.textContent()).not.toContain(chain.unrelated.lotCode);
      await page.getByRole('cell', { name: 'odile.marsh@example.test' }).waitFor();
      await page.getByRole('rowheader', { name: 'Bram Keller' }).waitFor();
      expect(describeViolations(await checkA11y(page))).toEqual([]);

      await page.getByRole('button', { name: 'Open a recall' }).click();
      await page.getByLabel('Reason (kept in your records)').fill('Cedar Row recalled this sprinkles lot: may contain undeclared milk');
      await page.getByLabel('Public notice (shown on the lot pages and in the e-mail)').fill('These pops may contain milk that is not on the label. Do not eat them if you are allergic to milk.');
      await page.getByRole('button', { name: 'Review' }).click();
      await page.getByText('3 batches will be marked recalled').waitFor();
      await page.getByText('1 customer who agreed to recall notices will get an e-mail.').waitFor();
      expect(describeViolations(await checkA11y(page))).toEqual([]);
      // Not without the confirmation box.
      await page.getByRole('button', { name: 'Open recall' }).click();
      await page.getByText('Confirm that you have reviewed the affected batches').waitFor();
      await page.getByLabel('I have checked the batches and customers above, and I want to open this recall.').check();
      await page.getByRole('button', { name: 'Open recall' }).click();

      const view = page.getByTestId('recall-view');
      await view.waitFor();
      await view.getByText('E-mail waiting to send').waitFor();
      await view.getByRole('button', { name: 'Told by phone (Bram Keller)' }).click();
      await view.getByRole('button', { name: 'Told by phone (Bram Keller)' }).waitFor({ state: 'detached' });
      await view.getByText(/Progress: 1 of 2 customers told/).waitFor();
      expect(describeViolations(await checkA11y(page))).toEqual([]);

      // The lot page now leads with the notice, at once.
      await page.goto(`${server.baseUrl}/lot/${chain.productA.publicCode}`);
      await page.reload();
      expect(await page.textContent('body')).toContain('These pops may contain milk that is not on the label.');

      // The sender delivers to the local stand-in; Sent mail shows the notice.
      await runMailOnce({ db: t.db, now: () => t.clock.now, transport: createMailTransport(`smtp://127.0.0.1:${capture.port}`), from: 'Crumbtrail <no-reply@crumbtrail.invalid>' });
      await page.goto(`${server.baseUrl}/sent-mail`);
      await page.getByRole('heading', { level: 1, name: 'Sent mail' }).waitFor();
      await page.getByText(/Recall notice from/).first().waitFor();
      expect(await page.textContent('main')).toContain('odile.marsh@example.test');
    } finally {
      await context.close();
    }
  }, 180_000);

  // us-tx-2025-09: $100,000 cap from the filed S.B. 541 versions, shipped as unverified; direct, event and online only.
  test('a baker records a sale with a new customer on the Sales screen; the cap meter shows word, figure and source', async () => {
    const t = server.t;
    const other = await createTestBusiness(t);
    await setRuleProfile(t, other.businessId, 'us-tx-2025-09');
    const chain = await recallChain(t, other);
    await createSale(t.db, ownerActor(other), { batchId: chain.productA.id, quantity: 200, unit: 'packages', amountCents: 7_600_000, channel: 'event' }, t.clock.now);
    const { context, page } = await newPage(browser);
    try {
      await signInInBrowser(page, server.baseUrl, other.members.baker.email, TEST_PASSWORD);
      await page.goto(`${server.baseUrl}/sales`);
      await page.getByRole('heading', { level: 1, name: 'Sales' }).waitFor();
      const meter = page.getByTestId('cap-meter');
      await meter.getByText('Past 75 %', { exact: true }).waitFor();
      expect(await meter.textContent()).toContain('$76,000.00 of $100,000.00 (76.0 %)');
      await meter.getByText('Unverified', { exact: true }).waitFor();
      // Wholesale is not offered under this profile.
      const form = page.getByRole('form', { name: 'Record a sale' });
      expect(await form.getByLabel('Channel', { exact: true }).locator('option').allTextContents()).toEqual(['Direct (in person)', 'Event or market', 'Online order']);
      expect(describeViolations(await checkA11y(page))).toEqual([]);
      await form.getByLabel('Batch').selectOption(chain.productB.id);
      await form.getByLabel('Quantity').fill('3');
      await form.getByLabel('Amount (US dollars)').fill('18.5');
      await form.getByLabel('A new customer').check();
      await form.getByLabel('Name').fill('Juno Ferris');
      await page.getByRole('button', { name: 'Record sale' }).click();
      // Neither an e-mail nor a phone: the form says so next to the field.
      await page.getByText('Enter an e-mail address or a phone number').waitFor();
      await form.getByRole('textbox', { name: 'E-mail (optional)' }).fill('juno.ferris@example.test');
      await page.getByRole('button', { name: 'Record sale' }).click();
      await page.getByRole('rowheader', { name: chain.productB.lotCode }).waitFor();
      expect(await page.getByRole('table').first().textContent()).toContain('$18.50');
      // A baker never sees the contact back.
      expect(await page.textContent('main')).not.toContain('Juno Ferris');
      expect(describeViolations(await checkA11y(page))).toEqual([]);
    } finally {
      await context.close();
    }
  }, 180_000);
});
