import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { batches } from '../../db/schema/batches';
import { recipeVersions } from '../../db/schema/recipes';
import { businesses } from '../../db/schema/business';
import { supplierLots } from '../../db/schema/ingredients';
import { mailOutbox } from '../../db/schema/mail';
import { recallBatches, recallNotifications, recalls } from '../../db/schema/recalls';
import type { Actor } from '../../lib/actor';
import { badRequest, conflict, notFound } from '../../lib/http-error';
import { appendRecordEvent } from '../records/record-events.service';
import { changeBatchState } from '../batches/batches.service';
import { currentIngredients } from '../batches/batches.queries';
import { queueMail } from '../mail/mail.service';
import { canSeeContacts } from '../sales/sales.service';
import { buyersOf, loadInputRows, toEdges, withDownstream } from './trace.service';
import { batchesDownstreamOfSupplierLot } from '../../../shared/domain/trace';
import { canTransition, type BatchState } from '../../../shared/domain/batch-states';
import type { CloseRecallInput, OpenRecallInput, PhoneNoticeInput, RecallCustomerProgress, RecallDetail, RecallSummary } from '../../../shared/contracts/trace';

/** What a recall does to a batch: anything that may have left the kitchen is recalled; a batch still being made is held. */
function recallTarget(state: BatchState): BatchState {
  if (canTransition(state, 'recalled')) return 'recalled';
  if (state === 'in_progress') return 'held';
  return state; // already recalled, or discarded
}

function lotPageLink(publicBaseUrl: string, publicCode: string) {
  return `${publicBaseUrl.replace(/\/+$/, '')}/lot/${publicCode}`;
}

async function lockBusiness(tx: DbOrTx, businessId: string) {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${businessId}::text, 0))`);
}

async function batchesForRecall(tx: DbOrTx, businessId: string, scope: OpenRecallInput['scope']): Promise<string[]> {
  const edges = toEdges(await loadInputRows(tx, businessId));
  if (scope.kind === 'supplier_lot') {
    const [lot] = await tx.select({ id: supplierLots.id }).from(supplierLots).where(and(eq(supplierLots.id, scope.supplierLotId), eq(supplierLots.businessId, businessId)));
    if (!lot) throw notFound('That supplier lot');
    return batchesDownstreamOfSupplierLot(edges, lot.id);
  }
  const ids = [...new Set(scope.batchIds)];
  const own = await tx.select({ id: batches.id }).from(batches).where(and(eq(batches.businessId, businessId), inArray(batches.id, ids)));
  if (own.length !== ids.length) throw notFound('One of those batches');
  return withDownstream(edges, ids);
}

/**
 * Opens a recall: every affected batch moves through the batches service (so its history is kept),
 * consenting customers with an e-mail get one notice each (deduped per recall and customer), and one
 * record event describes it without any contact details.
 */
export async function openRecall(db: Db, actor: Actor, input: OpenRecallInput, now: Date, publicBaseUrl: string): Promise<RecallDetail> {
  const id = await db.transaction(async (tx) => {
    await lockBusiness(tx, actor.businessId);
    const ids = await batchesForRecall(tx, actor.businessId, input.scope);
    if (ids.length === 0) throw badRequest('No batch used that supplier lot, so there is nothing to recall.', { scope: ['No batch used that supplier lot.'] });
    const [recall] = await tx.insert(recalls).values({
      businessId: actor.businessId, reason: input.reason, publicNotice: input.publicNotice, scopeKind: input.scope.kind,
      supplierLotId: input.scope.kind === 'supplier_lot' ? input.scope.supplierLotId : null, status: 'open',
      openedByUserId: actor.userId, openedByName: actor.name, openedAt: now, createdAt: now, updatedAt: now,
    }).returning();
    const rows = await tx
      .select({ id: batches.id, state: batches.state, lotCode: batches.lotCode, publicCode: batches.publicCode, productName: recipeVersions.name })
      .from(batches).innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
      .where(and(eq(batches.businessId, actor.businessId), inArray(batches.id, ids)));
    const stateReason = `Recall: ${input.reason}`.slice(0, 1000);
    for (const b of rows) {
      const from = b.state as BatchState;
      const to = recallTarget(from);
      if (to !== from) await changeBatchState(tx, actor, b.id, { toState: to, reason: stateReason }, now);
      await tx.insert(recallBatches).values({ businessId: actor.businessId, recallId: recall!.id, batchId: b.id, fromState: from, toState: to, createdAt: now, updatedAt: now });
    }
    const [business] = await tx.select().from(businesses).where(eq(businesses.id, actor.businessId));
    const contact = [business!.phone, business!.email].filter(Boolean).join(' or ');
    let emailed = 0;
    for (const buyer of await buyersOf(tx, actor.businessId, ids)) {
      if (!buyer.contact?.recallConsent || !buyer.contact.email) continue;
      const bought = rows.filter((r) => buyer.batchIds.includes(r.id));
      const text = [
        'Hello,',
        '',
        `You asked ${business!.name} to tell you if something you bought is recalled. We are recalling:`,
        '',
        ...bought.map((b) => `  • ${b.productName}, lot ${b.lotCode}: ${lotPageLink(publicBaseUrl, b.publicCode)}`),
        '',
        input.publicNotice,
        '',
        'Please do not eat it. Keep it or throw it away.',
        contact ? `Questions? Contact ${business!.name}: ${contact}.` : '',
      ].join('\n');
      const mail = await queueMail(tx, {
        businessId: actor.businessId, to: buyer.contact.email, kind: 'recall_notice', dedupeKey: `recall:${recall!.id}:${buyer.customerId}`,
        subject: `Recall notice from ${business!.name}: ${[...new Set(bought.map((b) => b.productName))].join(', ')}`, text,
      }, now);
      if (!mail.queued) continue;
      emailed += 1;
      await tx.insert(recallNotifications).values({
        businessId: actor.businessId, recallId: recall!.id, customerId: buyer.customerId, method: 'email', outboxId: mail.id, byName: actor.name, at: now, createdAt: now, updatedAt: now,
      });
    }
    await appendRecordEvent(tx, actor, {
      entityType: 'recall', entityId: recall!.id, action: 'open', reason: input.reason,
      payload: { publicNotice: input.publicNotice, scope: input.scope, batches: rows.map((b) => ({ batchId: b.id, lotCode: b.lotCode })), emailsQueued: emailed },
    }, now);
    return recall!.id;
  });
  return getRecall(db, actor, id);
}

export async function closeRecall(db: Db, actor: Actor, recallId: string, input: CloseRecallInput, now: Date): Promise<RecallDetail> {
  await db.transaction(async (tx) => {
    const [r] = await tx.select().from(recalls).where(and(eq(recalls.id, recallId), eq(recalls.businessId, actor.businessId))).for('update');
    if (!r) throw notFound('That recall');
    if (r.status === 'closed') throw conflict('This recall is already closed.');
    await tx.update(recalls).set({ status: 'closed', closedAt: now, closedByName: actor.name, closeNote: input.note, updatedAt: now }).where(eq(recalls.id, r.id));
    await appendRecordEvent(tx, actor, { entityType: 'recall', entityId: r.id, action: 'close', reason: input.note, payload: {} }, now);
  });
  return getRecall(db, actor, recallId);
}

/** The owner marks a customer as told by phone (kept beside any e-mail sent). */
export async function markToldByPhone(db: Db, actor: Actor, recallId: string, customerId: string, input: PhoneNoticeInput, now: Date): Promise<RecallDetail> {
  await db.transaction(async (tx) => {
    const [r] = await tx.select().from(recalls).where(and(eq(recalls.id, recallId), eq(recalls.businessId, actor.businessId)));
    if (!r) throw notFound('That recall');
    const ids = (await tx.select({ id: recallBatches.batchId }).from(recallBatches).where(eq(recallBatches.recallId, r.id))).map((b) => b.id);
    if (!(await buyersOf(tx, actor.businessId, ids)).some((b) => b.customerId === customerId)) throw notFound('That customer of this recall');
    await tx.insert(recallNotifications).values({ businessId: actor.businessId, recallId: r.id, customerId, method: 'phone', note: input.note, byName: actor.name, at: now, createdAt: now, updatedAt: now });
    await appendRecordEvent(tx, actor, { entityType: 'recall', entityId: r.id, action: 'told_by_phone', payload: { customerId } }, now);
  });
  return getRecall(db, actor, recallId);
}

type RecallRow = typeof recalls.$inferSelect;

async function summaries(db: DbOrTx, businessId: string, rows: RecallRow[]): Promise<Map<string, { summary: RecallSummary; customers: RecallCustomerProgress[] }>> {
  const out = new Map<string, { summary: RecallSummary; customers: RecallCustomerProgress[] }>();
  if (rows.length === 0) return out;
  const ids = rows.map((r) => r.id);
  const rb = await db
    .select({ recallId: recallBatches.recallId, id: batches.id, lotCode: batches.lotCode, publicCode: batches.publicCode, productName: recipeVersions.name, fromState: recallBatches.fromState, toState: recallBatches.toState })
    .from(recallBatches).innerJoin(batches, eq(batches.id, recallBatches.batchId)).innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
    .where(inArray(recallBatches.recallId, ids)).orderBy(asc(batches.madeOn), asc(batches.lotCode));
  const notes = await db
    .select({ n: recallNotifications, status: mailOutbox.status, sentAt: mailOutbox.sentAt })
    .from(recallNotifications).leftJoin(mailOutbox, eq(mailOutbox.id, recallNotifications.outboxId))
    .where(inArray(recallNotifications.recallId, ids)).orderBy(asc(recallNotifications.at), asc(recallNotifications.createdAt));
  const lotIds = rows.flatMap((r) => (r.supplierLotId ? [r.supplierLotId] : []));
  const lots = lotIds.length ? await db.select().from(supplierLots).where(inArray(supplierLots.id, lotIds)) : [];
  const names = lotIds.length ? await currentIngredients(db, businessId) : new Map();
  for (const r of rows) {
    const bs = rb.filter((b) => b.recallId === r.id);
    const buyers = await buyersOf(db, businessId, bs.map((b) => b.id));
    const customers: RecallCustomerProgress[] = buyers.map((buyer) => {
      const steps = notes.filter((n) => n.n.recallId === r.id && n.n.customerId === buyer.customerId);
      const phone = steps.filter((s) => s.n.method === 'phone').at(-1);
      const email = steps.filter((s) => s.n.method === 'email').at(-1);
      let status: RecallCustomerProgress['status'];
      let toldAt: Date | null = null;
      let toldByName: string | null = null;
      if (phone) [status, toldAt, toldByName] = ['told_by_phone', phone.n.at, phone.n.byName];
      else if (email?.status === 'sent') [status, toldAt, toldByName] = ['email_sent', email.sentAt ?? email.n.at, email.n.byName];
      else if (email) status = email.status === 'failed' ? 'email_failed' : 'email_queued';
      else if (buyer.erased) status = 'erased';
      else status = buyer.contact?.recallConsent ? 'to_call' : 'no_consent';
      return { customerId: buyer.customerId, status, toldAt: toldAt?.toISOString() ?? null, toldByName, note: phone?.n.note ?? '', batchIds: buyer.batchIds, contact: buyer.contact };
    });
    const lot = lots.find((l) => l.id === r.supplierLotId);
    const count = (...s: RecallCustomerProgress['status'][]) => customers.filter((c) => s.includes(c.status)).length;
    out.set(r.id, {
      customers,
      summary: {
        id: r.id, status: r.status as RecallSummary['status'], reason: r.reason, publicNotice: r.publicNotice, scopeKind: r.scopeKind as RecallSummary['scopeKind'],
        supplierLot: lot ? { id: lot.id, lotCode: lot.lotCode, ingredientName: names.get(lot.ingredientId)?.labelName ?? 'Ingredient' } : null,
        openedByName: r.openedByName, openedAt: r.openedAt.toISOString(), closedAt: r.closedAt?.toISOString() ?? null, closedByName: r.closedByName, closeNote: r.closeNote,
        batches: bs.map(({ recallId: _r, ...b }) => b),
        progress: { customers: customers.length, told: count('email_sent', 'told_by_phone'), emailQueued: count('email_queued', 'email_failed'), toCall: count('to_call'), noConsent: count('no_consent', 'erased') },
      },
    });
  }
  return out;
}

/** One recall with per-customer progress; contact details for the owner only. */
export async function getRecall(db: DbOrTx, actor: Actor, recallId: string): Promise<RecallDetail> {
  const [r] = await db.select().from(recalls).where(and(eq(recalls.id, recallId), eq(recalls.businessId, actor.businessId)));
  if (!r) throw notFound('That recall');
  const { summary, customers } = (await summaries(db, actor.businessId, [r])).get(r.id)!;
  const show = canSeeContacts(actor);
  return { ...summary, customers: customers.map(({ contact, ...c }) => (show ? { ...c, contact } : c)) };
}

export async function listRecalls(db: DbOrTx, actor: Actor): Promise<RecallSummary[]> {
  const rows = await db.select().from(recalls).where(eq(recalls.businessId, actor.businessId)).orderBy(desc(recalls.openedAt));
  const map = await summaries(db, actor.businessId, rows);
  return rows.map((r) => map.get(r.id)!.summary);
}

/**
 * For the audit packet: recalls opened between two calendar dates (inclusive, business time zone),
 * with batches and notification counts, never contact details.
 */
export async function listRecallsForRange(db: DbOrTx, businessId: string, from: string, to: string): Promise<RecallSummary[]> {
  const rows = await db
    .select({ r: recalls })
    .from(recalls)
    .innerJoin(businesses, eq(businesses.id, recalls.businessId))
    .where(and(eq(recalls.businessId, businessId), sql`(${recalls.openedAt} at time zone ${businesses.timeZone})::date between ${from}::date and ${to}::date`))
    .orderBy(asc(recalls.openedAt));
  const list = rows.map((x) => x.r);
  const map = await summaries(db, businessId, list);
  return list.map((r) => map.get(r.id)!.summary);
}

/** The public notice of the newest recall covering a batch (for the lot page); null when none. */
export async function recallNoticeForBatch(db: DbOrTx, businessId: string, batchId: string): Promise<string | null> {
  const [row] = await db
    .select({ notice: recalls.publicNotice })
    .from(recallBatches).innerJoin(recalls, eq(recalls.id, recallBatches.recallId))
    .where(and(eq(recallBatches.businessId, businessId), eq(recallBatches.batchId, batchId)))
    .orderBy(desc(recalls.openedAt))
    .limit(1);
  return row?.notice ?? null;
}

