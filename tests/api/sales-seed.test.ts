import { getBatchDetail } from '../../server/features/batches/batches.service';
import { describe, expect, test } from 'vitest';
import os from 'node:os';
import path from 'node:path';
import { and, eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { createTestBusiness } from '../support/agents';
import type { SeedContext } from '../../server/db/seed/demo';
import { DEMO_STEPS } from '../../server/db/seed/steps';
import { salesCapView, listSales, listCustomers } from '../../server/features/sales/sales.service';
import { getRecall, listRecalls } from '../../server/features/trace/recalls.service';
import { mailOutbox } from '../../server/db/schema/mail';
import { verifyBusinessChain } from '../../server/features/records/record-events.service';
import type { Actor } from '../../server/lib/actor';

const t = makeTestApp();

describe('sales and recall demo steps', () => {
  test('sales at believable prices count toward the cap through several channels, one customer is erased, and one recall reaches customers', async () => {
    const business = await createTestBusiness(t, { ruleProfileId: 'us-tx-2025-09', timeZone: 'America/Chicago' });
    const b = business.businessId;
    const actors = Object.fromEntries((['owner', 'baker', 'helper'] as const).map((role) => [role, { kind: 'member', businessId: b, userId: business.members[role].userId, name: business.members[role].displayName, role } satisfies Actor])) as SeedContext['actors'];
    const ctx: SeedContext = { db: t.db, now: t.clock.now, businessId: b, actors, publicBaseUrl: 'http://127.0.0.1:5180', uploadDir: path.join(os.tmpdir(), `crumbtrail-sales-seed-${process.pid}`), shared: new Map() };
    // Every demo step, so the states the holding step leaves are the ones sales and the recall see.
    for (const step of DEMO_STEPS.filter((s) => s.name !== 'cleaning')) await step.run(ctx); // cleaning signs with the demo accounts' passwords

    const cap = (await salesCapView(t.db, actors.owner, t.clock.now)).cap!;
    // Believable amounts: well under the cap, and never more bags sold than a batch made.
    expect(cap.totalCents).toBeGreaterThan(0);
    expect(cap.level).toBe('ok');
    const sold = new Map<string, number>();
    for (const sale of (await listSales(t.db, actors.owner, { limit: 500 })).items) {
      if (sale.unit === 'packages' && !sale.voided) sold.set(sale.batchId, (sold.get(sale.batchId) ?? 0) + sale.quantity);
    }
    let checked = 0;
    for (const [batchId, packages] of sold) {
      const made = (await getBatchDetail(t.db, { businessId: b }, batchId)).current.quantityPackages;
      if (made === null) continue; // a batch recorded in pieces only
      expect(packages, batchId).toBeLessThanOrEqual(made);
      checked += 1;
    }
    expect(checked).toBeGreaterThanOrEqual(5);
    const sales = (await listSales(t.db, actors.owner, { limit: 500 })).items;
    expect(new Set(sales.map((s) => s.channel)).size).toBeGreaterThanOrEqual(3);
    const customers = await listCustomers(t.db, actors.owner);
    expect(customers.filter((c) => c.erased)).toHaveLength(1);
    expect(customers.some((c) => c.contact?.recallConsent)).toBe(true);
    expect(customers.some((c) => c.contact && !c.contact.recallConsent)).toBe(true);
    const erased = customers.find((c) => c.erased)!;
    expect(sales.some((s) => s.customer?.id === erased.id && s.customer.erased)).toBe(true);

    const [recall] = await listRecalls(t.db, actors.owner);
    expect(recall).toBeDefined();
    const detail = await getRecall(t.db, actors.owner, recall!.id);
    // One in-between batch and the two product batches made with it.
    expect(detail.batches.map((x) => x.toState)).toEqual(['recalled', 'recalled', 'recalled']);
    expect(detail.batches.filter((x) => /binder/i.test(x.productName))).toHaveLength(1);
    expect(detail.customers.some((c) => c.status === 'told_by_phone')).toBe(true);
    expect(detail.customers.some((c) => c.status === 'email_queued')).toBe(true);
    const mails = await t.db.select().from(mailOutbox).where(and(eq(mailOutbox.businessId, b), eq(mailOutbox.kind, 'recall_notice')));
    expect(mails.length).toBeGreaterThanOrEqual(1);
    expect(await verifyBusinessChain(t.db, b)).toMatchObject({ ok: true });
  }, 120_000);
});
