import { and, desc, eq, gte, inArray, lte, sql, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { Db, DbOrTx } from '../../db/client';
import { sales } from '../../db/schema/sales';
import { customerContacts, customers } from '../../db/schema/customers';
import { batches } from '../../db/schema/batches';
import { recipeVersions } from '../../db/schema/recipes';
import { businesses } from '../../db/schema/business';
import type { Actor } from '../../lib/actor';
import { badRequest, conflict, notFound } from '../../lib/http-error';
import { appendRecordEvent } from '../records/record-events.service';
import { businessRuleProfile } from '../rule-profiles/rule-profiles.service';
import { salesCapStatus, formatCents } from '../../../shared/domain/sales-cap';
import { businessLocalDate, localDateTimeToInstants } from '../../../shared/domain/zoned-time';
import type { KitchenBoardSectionProvider } from '../holding/kitchen-board.service';
import type {
  CreateSaleInput, Customer, CustomerContactInput, ListSalesQuery, Sale, SalesCapView, SalesPage, UpdateCustomerInput, VoidSaleInput,
} from '../../../shared/contracts/sales';

/** Customer contacts are the owner's alone: bakers, helpers, devices and inspectors never get them. */
export const canSeeContacts = (actor: Pick<Actor, 'kind' | 'role'>) => actor.kind === 'member' && actor.role === 'owner';

async function businessOf(db: DbOrTx, businessId: string) {
  const [b] = await db.select({ timeZone: businesses.timeZone, name: businesses.name }).from(businesses).where(eq(businesses.id, businessId));
  if (!b) throw notFound('That business');
  return b;
}

/** Inserts a customer and their contact. The record event carries no personal data, so erasure leaves nothing behind in the chain. */
async function insertCustomer(tx: DbOrTx, actor: Actor, input: CustomerContactInput, today: string, now: Date): Promise<string> {
  const [c] = await tx.insert(customers).values({ businessId: actor.businessId, createdAt: now, updatedAt: now }).returning({ id: customers.id });
  await tx.insert(customerContacts).values({
    customerId: c!.id, businessId: actor.businessId, name: input.name, email: input.email || null, phone: input.phone || null,
    recallConsent: input.recallConsent, consentOn: input.recallConsent ? today : null, createdAt: now, updatedAt: now,
  });
  await appendRecordEvent(tx, actor, {
    entityType: 'customer', entityId: c!.id, action: 'create',
    payload: { recallConsent: input.recallConsent, hasEmail: Boolean(input.email), hasPhone: Boolean(input.phone) },
  }, now);
  return c!.id;
}

export async function createCustomer(db: Db, actor: Actor, input: CustomerContactInput, now: Date): Promise<Customer> {
  const { timeZone } = await businessOf(db, actor.businessId);
  const id = await db.transaction((tx) => insertCustomer(tx, actor, input, businessLocalDate(now, timeZone), now));
  return (await listCustomers(db, actor, [id]))[0]!;
}

/** The owner's customer list (erased customers stay as "erased" rows with their sale counts). */
export async function listCustomers(db: DbOrTx, actor: Actor, ids?: string[]): Promise<Customer[]> {
  const where: SQL[] = [eq(customers.businessId, actor.businessId)];
  if (ids) where.push(inArray(customers.id, ids));
  const rows = await db
    .select({
      c: customers, k: customerContacts,
      saleCount: sql<number>`(select count(*)::int from ${sales} where ${sales.customerId} = ${customers.id} and ${sales.kind} = 'sale')`,
    })
    .from(customers)
    .leftJoin(customerContacts, eq(customerContacts.customerId, customers.id))
    .where(and(...where))
    .orderBy(desc(customers.createdAt));
  const show = canSeeContacts(actor);
  return rows.map(({ c, k, saleCount }) => ({
    id: c.id, erased: c.erasedAt != null, saleCount, createdAt: c.createdAt.toISOString(),
    contact: show && k ? { name: k.name, email: k.email, phone: k.phone, recallConsent: k.recallConsent, consentOn: k.consentOn } : null,
  }));
}

async function contactRow(tx: DbOrTx, businessId: string, customerId: string) {
  const [row] = await tx
    .select({ c: customers, k: customerContacts })
    .from(customers)
    .leftJoin(customerContacts, eq(customerContacts.customerId, customers.id))
    .where(and(eq(customers.id, customerId), eq(customers.businessId, businessId)));
  if (!row) throw notFound('That customer');
  return row;
}

/** Consent to recall notices, given or withdrawn (the date is kept with it). */
export async function updateCustomerConsent(db: Db, actor: Actor, customerId: string, input: UpdateCustomerInput, now: Date): Promise<Customer> {
  const { timeZone } = await businessOf(db, actor.businessId);
  await db.transaction(async (tx) => {
    const row = await contactRow(tx, actor.businessId, customerId);
    if (!row.k) throw conflict('This customer’s contact was erased; there is nothing to change.');
    await tx.update(customerContacts)
      .set({ recallConsent: input.recallConsent, consentOn: input.recallConsent ? businessLocalDate(now, timeZone) : null, updatedAt: now })
      .where(eq(customerContacts.customerId, customerId));
    await appendRecordEvent(tx, actor, { entityType: 'customer', entityId: customerId, action: 'consent', payload: { recallConsent: input.recallConsent } }, now);
  });
  return (await listCustomers(db, actor, [customerId]))[0]!;
}

/**
 * Erasure on request: the contact row is deleted; the customer id stays on the sales, which are now
 * anonymous. The record event says only that an erasure happened.
 */
export async function eraseCustomer(db: Db, actor: Actor, customerId: string, now: Date): Promise<void> {
  await db.transaction(async (tx) => {
    const row = await contactRow(tx, actor.businessId, customerId);
    if (row.c.erasedAt) return;
    await tx.delete(customerContacts).where(eq(customerContacts.customerId, customerId));
    await tx.update(customers).set({ erasedAt: now, updatedAt: now }).where(eq(customers.id, customerId));
    await appendRecordEvent(tx, actor, { entityType: 'customer', entityId: customerId, action: 'erase', payload: {}, reason: 'Contact erased at the customer’s request' }, now);
  });
}

/** Records one sale of a released (or since sold-out) batch, through a channel the rule profile allows. */
export async function createSale(db: Db, actor: Actor, input: CreateSaleInput, now: Date): Promise<Sale> {
  const id = await db.transaction(async (tx) => {
    const { timeZone } = await businessOf(tx, actor.businessId);
    const today = businessLocalDate(now, timeZone);
    const [batch] = await tx.select().from(batches).where(and(eq(batches.id, input.batchId), eq(batches.businessId, actor.businessId)));
    if (!batch) throw notFound('That batch');
    if (batch.state !== 'released' && batch.state !== 'sold_out') {
      throw conflict(`Batch ${batch.lotCode} is ${batch.state.replace('_', ' ')}; only a released batch can be sold.`, { batchId: ['Choose a released batch.'] });
    }
    const profile = await businessRuleProfile(tx, actor.businessId);
    if (!profile.salesChannels.value.includes(input.channel)) {
      throw badRequest('That sales channel is not allowed.', {
        channel: [`${profile.name} allows ${profile.salesChannels.value.join(', ')} sales only (${profile.salesChannels.source.citation}).`],
      });
    }
    const soldOn = input.soldOn ?? today;
    if (soldOn > today) throw badRequest('Some fields need attention.', { soldOn: [`The sale date cannot be after today (${today}).`] });
    if (soldOn < batch.madeOn) throw badRequest('Some fields need attention.', { soldOn: [`Batch ${batch.lotCode} was made on ${batch.madeOn}; a sale cannot be earlier.`] });
    let customerId: string | null = null;
    if (input.customerId) {
      const row = await contactRow(tx, actor.businessId, input.customerId);
      if (row.c.erasedAt) throw badRequest('Some fields need attention.', { customerId: ['That customer’s contact was erased; record the sale without a customer or add them again.'] });
      customerId = row.c.id;
    } else if (input.newCustomer) {
      customerId = await insertCustomer(tx, actor, input.newCustomer, today, now);
    }
    const [row] = await tx.insert(sales).values({
      businessId: actor.businessId, batchId: batch.id, kind: 'sale', soldOn, quantity: input.quantity, unit: input.unit, amountCents: input.amountCents,
      channel: input.channel, customerId, recordedByUserId: actor.userId, recordedByName: actor.name, recordedAt: now, createdAt: now, updatedAt: now,
    }).returning({ id: sales.id });
    await appendRecordEvent(tx, actor, {
      entityType: 'sale', entityId: row!.id, action: 'create',
      payload: { batchId: batch.id, lotCode: batch.lotCode, soldOn, quantity: input.quantity, unit: input.unit, amountCents: input.amountCents, channel: input.channel, customerId },
    }, now);
    return row!.id;
  });
  return (await listSales(db, actor, { limit: 1 }, [id])).items[0]!;
}

/** A void is a new row (negative amount, same date as the sale so the year's total is right) with a reason. */
export async function voidSale(db: Db, actor: Actor, saleId: string, input: VoidSaleInput, now: Date): Promise<Sale> {
  await db.transaction(async (tx) => {
    const [sale] = await tx.select().from(sales).where(and(eq(sales.id, saleId), eq(sales.businessId, actor.businessId), eq(sales.kind, 'sale')));
    if (!sale) throw notFound('That sale');
    const [already] = await tx.select({ id: sales.id }).from(sales).where(eq(sales.voidsSaleId, sale.id));
    if (already) throw conflict('This sale was already voided.');
    const [row] = await tx.insert(sales).values({
      businessId: actor.businessId, batchId: sale.batchId, kind: 'void', voidsSaleId: sale.id, soldOn: sale.soldOn, quantity: sale.quantity, unit: sale.unit,
      amountCents: -sale.amountCents, channel: sale.channel, customerId: sale.customerId, reason: input.reason,
      recordedByUserId: actor.userId, recordedByName: actor.name, recordedAt: now, createdAt: now, updatedAt: now,
    }).returning({ id: sales.id });
    await appendRecordEvent(tx, actor, { entityType: 'sale', entityId: sale.id, action: 'void', reason: input.reason, payload: { voidRowId: row!.id, amountCents: sale.amountCents } }, now);
  });
  return (await listSales(db, actor, { limit: 1 }, [saleId])).items[0]!;
}

const voids = alias(sales, 'voids');

/** Sales (not the void rows themselves), newest first, each with its void if any. Contacts for the owner only. */
export async function listSales(db: DbOrTx, actor: Actor, q: ListSalesQuery, ids?: string[]): Promise<SalesPage> {
  const where: SQL[] = [eq(sales.businessId, actor.businessId), eq(sales.kind, 'sale')];
  if (ids) where.push(inArray(sales.id, ids));
  if (q.from) where.push(gte(sales.soldOn, q.from));
  if (q.to) where.push(lte(sales.soldOn, q.to));
  if (q.channel) where.push(eq(sales.channel, q.channel));
  if (q.batchId) where.push(eq(sales.batchId, q.batchId));
  const rows = await db
    .select({ s: sales, v: voids, lotCode: batches.lotCode, productName: recipeVersions.name, erasedAt: customers.erasedAt, name: customerContacts.name })
    .from(sales)
    .innerJoin(batches, eq(batches.id, sales.batchId))
    .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
    .leftJoin(voids, eq(voids.voidsSaleId, sales.id))
    .leftJoin(customers, eq(customers.id, sales.customerId))
    .leftJoin(customerContacts, eq(customerContacts.customerId, sales.customerId))
    .where(and(...where))
    .orderBy(desc(sales.soldOn), desc(sales.recordedAt))
    .limit(q.limit);
  const show = canSeeContacts(actor);
  const items: Sale[] = rows.map(({ s, v, lotCode, productName, erasedAt, name }) => ({
    id: s.id, batchId: s.batchId, lotCode, productName, soldOn: s.soldOn, quantity: s.quantity, unit: s.unit as Sale['unit'], amountCents: s.amountCents,
    channel: s.channel as Sale['channel'], hasCustomer: s.customerId != null,
    ...(show && s.customerId ? { customer: { id: s.customerId, erased: erasedAt != null, name: name ?? null } } : {}),
    voided: v ? { reason: v.reason ?? '', byName: v.recordedByName, at: v.recordedAt.toISOString() } : null,
    recordedByName: s.recordedByName, recordedAt: s.recordedAt.toISOString(),
  }));
  return { items, totalCents: items.reduce((sum, i) => sum + (i.voided ? 0 : i.amountCents), 0) };
}

const LEVEL_WORDS = { ok: 'Below 75 % of the cap.', warn_75: 'Past 75 % of the cap.', warn_90: 'Past 90 % of the cap: plan for the rest of the year.', over: 'Over the cap.' } as const;

/** The year's sales (business time zone) against the rule profile's cap, with its source and an unverified mark. */
export async function salesCapView(db: DbOrTx, actor: Pick<Actor, 'businessId'>, now: Date): Promise<SalesCapView> {
  const { timeZone } = await businessOf(db, actor.businessId);
  const profile = await businessRuleProfile(db, actor.businessId);
  const channels = { allowedChannels: profile.salesChannels.value, channelSource: profile.salesChannels.source.citation };
  const capRule = profile.salesCap.value;
  if (!capRule) return { profileName: profile.name, cap: null, noCapReason: profile.salesCap.source.citation, ...channels };
  const year = businessLocalDate(now, timeZone).slice(0, 4);
  const days = await db
    .select({ soldOn: sales.soldOn, cents: sql<number>`sum(${sales.amountCents})::bigint` })
    .from(sales)
    .where(and(eq(sales.businessId, actor.businessId), gte(sales.soldOn, `${year}-01-01`), lte(sales.soldOn, `${year}-12-31`)))
    .groupBy(sales.soldOn);
  // A sale date is a calendar day in the business zone; noon of that day is an instant inside it.
  const entries = days.map((d) => ({ soldAt: (localDateTimeToInstants(`${d.soldOn}T12:00`, timeZone)[0] ?? now).toISOString(), amountCents: Number(d.cents) }));
  const status = salesCapStatus(entries, Math.round(capRule.amount * 100), timeZone, now.toISOString());
  const source = profile.salesCap.source;
  const pct = `${Math.floor(status.permille / 10)}.${status.permille % 10} %`;
  const message = `Sales in ${status.periodYear}: ${formatCents(status.totalCents)} of the ${formatCents(status.capCents)} cap (${pct}). ${LEVEL_WORDS[status.level]}${source.verified ? '' : ' The cap figure is unverified: check it with your local health authority.'}`;
  return {
    profileName: profile.name,
    cap: { ...status, figureYear: capRule.year, source: { citation: source.citation, url: source.url, note: source.note, verified: source.verified }, message },
    noCapReason: null,
    ...channels,
  };
}

/** Kitchen board: shown only from 75 % of the cap. */
export const salesCapSection: KitchenBoardSectionProvider = {
  kind: 'sales_cap',
  order: 50,
  async load(db, actor, now) {
    const view = await salesCapView(db, actor, now);
    if (!view.cap || view.cap.level === 'ok') return null;
    const level = view.cap.level === 'over' ? 'over' : view.cap.level === 'warn_90' ? 'warning' : 'info';
    return { kind: 'sales_cap', warning: { message: view.cap.message, level } };
  },
};
