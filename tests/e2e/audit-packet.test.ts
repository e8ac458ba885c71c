import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import fs from 'node:fs';
import { createHash } from 'node:crypto';
import JSZip from 'jszip';
import { parse } from 'csv-parse/sync';
import { AxeBuilder } from '@axe-core/playwright';
import type { Browser } from 'playwright-core';
import { AXE_TAGS, describeViolations, launchBrowser, newPage, signInInBrowser, startE2eServer, type E2eServer } from '../support/e2e';
import { DEMO_ACCOUNTS } from '../../server/db/seed/demo-accounts';
import { AuditPacketManifestSchema } from '../../shared/contracts/audit-packet';
import { lastMonth } from '../../src/features/records/components/audit-packet-panel';

let server: E2eServer;
let browser: Browser;

beforeAll(async () => {
  [server, browser] = await Promise.all([startE2eServer({ seedDemo: true }), launchBrowser()]);
}, 240_000);
afterAll(async () => {
  await browser?.close();
  await server?.close();
});

describe('audit packet in the browser', () => {
  test('the demo owner downloads last month\u2019s packet from the Records screen', async () => {
    const owner = DEMO_ACCOUNTS.find((a) => a.role === 'owner')!;
    const { context, page } = await newPage(browser);
    try {
      await signInInBrowser(page, server.baseUrl, owner.email, owner.password);
      await page.goto(`${server.baseUrl}/records`);
      const panel = page.locator('section[aria-labelledby="audit-packet"]');
      await panel.getByRole('heading', { name: 'Audit packet' }).waitFor();
      const range = lastMonth();
      expect(await panel.getByLabel('Records from').inputValue()).toBe(range.from);
      expect(await panel.getByLabel('Records to').inputValue()).toBe(range.to);
      const a11y = await new AxeBuilder({ page }).include('section[aria-labelledby="audit-packet"]').withTags(AXE_TAGS).analyze();
      expect(describeViolations(a11y.violations)).toEqual([]);

      const [download] = await Promise.all([page.waitForEvent('download', { timeout: 120_000 }), panel.getByRole('button', { name: 'Download packet' }).click()]);
      expect(download.suggestedFilename()).toBe(`audit-packet-${range.from}-to-${range.to}.zip`);
      await panel.getByText(/^Done: /).waitFor();
      const bytes = fs.readFileSync((await download.path())!);
      const zip = await JSZip.loadAsync(bytes);
      const manifest = AuditPacketManifestSchema.parse(JSON.parse(await zip.file('manifest.json')!.async('string')));
      expect(manifest.business.name).toBe('Juniper Lane Cake Pops');
      expect(manifest.range).toEqual(range);
      expect(manifest.exportedBy).toEqual({ name: owner.displayName, role: 'owner' });
      expect(manifest.chain.ok).toBe(true);
      for (const f of manifest.files) expect(createHash('sha256').update(await zip.file(f.name)!.async('nodebuffer')).digest('hex'), f.name).toBe(f.sha256);
      // The demo spans five weeks of batches, so last month has some.
      const batches = parse(await zip.file('csv/batches.csv')!.async('string'), { record_delimiter: '\r\n', columns: true }) as { made_on: string }[];
      expect(batches.length).toBeGreaterThan(0);
      for (const b of batches) expect(b.made_on >= range.from && b.made_on <= range.to).toBe(true);
    } finally {
      await context.close();
    }
  }, 240_000);
});
