import { eq, inArray } from 'drizzle-orm';
import type { SeedContext, SeedStep } from './demo';
import { SEED_BATCHES_KEY } from './batches';
import { createCustomer, createSale, eraseCustomer, listSales } from '../../features/sales/sales.service';
import { businessRuleProfile } from '../../features/rule-profiles/rule-profiles.service';
import { addCalendarDays } from '../../../shared/domain/calendar-date';
import { businessLocalDate } from '../../../shared/domain/zoned-time';
import { businesses } from '../schema/business';
import { batches } from '../schema/batches';
import type { BatchDetail } from '../../../shared/contracts/batches';
import type { CreateSaleInput, CustomerContactInput } from '../../../shared/contracts/sales';

/** ctx.shared key: demo customer ids by first name (e.g. 'Bram'), for the recall step. */
export const SEED_CUSTOMERS_KEY = 'customers';

// Invented Millbrook customers (example.test is a reserved domain, RFC 2606).
const PEOPLE: Record<string, CustomerContactInput> = {
  Odile: { name: 'Odile Marsh', email: 'odile.marsh@example.test', recallConsent: true },
  Bram: { name: 'Bram Keller', phone: '(555) 010-2231', recallConsent: true },
  Cass: { name: 'Cass Rowan', email: 'cass.rowan@example.test', recallConsent: false },
  Hollis: { name: 'Hollis Grant', email: 'hollis.grant@example.test', phone: '(555) 010-8890', recallConsent: true },
  Dev: { name: 'Dev Lindqvist', email: 'dev.lindqvist@example.test', recallConsent: false },
  Wren: { name: 'Wren Abernathy', email: 'wren.abernathy@example.test', recallConsent: true },
};

type Plan = [batchKey: string, daysAfterMade: number, channel: CreateSaleInput['channel'], quantity: number, unit: CreateSaleInput['unit'], dollars: number, who?: string];

/**
 * Juniper Lane's recent sales on the demo batches at believable prices, never more bags than a batch
 * made; the cap meter shows a small share of the year's cap (its warnings are shown by the tests).
 * Several customers with and without recall consent; one erased on request (the sale stays, anonymous).
 */
export const salesSeedStep: SeedStep = {
  name: 'sales',
  run: async (ctx: SeedContext) => {
    const made = ctx.shared.get(SEED_BATCHES_KEY) as Record<string, BatchDetail> | undefined;
    if (!made) return;
    const { db, actors } = ctx;
    const [business] = await db.select().from(businesses).where(eq(businesses.id, ctx.businessId));
    const today = businessLocalDate(ctx.now, business!.timeZone);
    const yearStart = `${today.slice(0, 4)}-01-01`;
    const profile = await businessRuleProfile(db, ctx.businessId);
    const allowed = profile.salesChannels.value;
    // Invented prices for a bag of cake pops: $18 at the door, $20 at events, $24 shipped.
    const plan: Plan[] = [
      ['soldOutEarly', 0, 'event', 8, 'packages', 160, 'Wren'],
      ['soldOutEarly', 1, 'direct', 4, 'packages', 72],
      ['soldOutPlain', 1, 'event', 6, 'packages', 120, 'Hollis'],
      ['soldOutPlain', 2, 'online', 2, 'packages', 48, 'Dev'],
      ['soldOutMid', 1, 'event', 12, 'packages', 240, 'Hollis'],
      ['soldOutMid', 2, 'direct', 3, 'packages', 54],
      ['withFrostingA', 1, 'event', 6, 'packages', 120, 'Odile'],
      ['withFrostingA', 2, 'online', 2, 'packages', 48],
      ['withFrostingB', 1, 'event', 3, 'packages', 60, 'Bram'],
      ['withFrostingB', 2, 'direct', 2, 'packages', 36, 'Cass'],
      ['missingLot', 1, 'online', 4, 'packages', 96],
      ['released', 1, 'event', 5, 'packages', 100, 'Dev'],
      ['released', 2, 'direct', 2, 'packages', 36],
    ];
    // Later steps (holding) may have moved a batch on since the batches step: read the states now.
    const batchIds = Object.values(made).map((b) => b.id);
    const states = new Map((await db.select({ id: batches.id, state: batches.state }).from(batches).where(inArray(batches.id, batchIds))).map((r) => [r.id, r.state]));
    const ids: Record<string, string> = {};
    for (const [key, after, channel, quantity, unit, dollars, who] of plan) {
      const batch = made[key];
      if (!batch || !['released', 'sold_out'].includes(states.get(batch.id) ?? '')) continue;
      let soldOn = addCalendarDays(batch.madeOn, after);
      if (soldOn > today) soldOn = today;
      if (soldOn < yearStart) soldOn = yearStart; // the meter counts this year only
      const input: CreateSaleInput = {
        batchId: batch.id, soldOn, quantity, unit, amountCents: dollars * 100, channel: allowed.includes(channel) ? channel : allowed[0]!,
        ...(who && ids[who] ? { customerId: ids[who] } : who ? { newCustomer: PEOPLE[who]! } : {}),
      };
      const actor = who === 'Bram' || key.startsWith('soldOut') ? actors.owner : actors.baker;
      const sale = await createSale(db, actor, input, ctx.now);
      // Bakers get no contacts back, so look the new customer up as the owner.
      if (who && !ids[who]) ids[who] = (await listSales(db, actors.owner, { limit: 1 }, [sale.id])).items[0]!.customer!.id;
    }
    // Every story customer exists for the recall step, even if a planned batch was not sellable.
    for (const [who, contact] of Object.entries(PEOPLE)) if (!ids[who]) ids[who] = (await createCustomer(db, actors.owner, contact, ctx.now)).id;
    if (ids.Wren) await eraseCustomer(db, actors.owner, ids.Wren, ctx.now);
    ctx.shared.set(SEED_CUSTOMERS_KEY, ids);
  },
};
