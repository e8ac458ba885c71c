import { and, eq, inArray, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { batches } from '../../db/schema/batches';
import { recipeVersions } from '../../db/schema/recipes';
import { ingredients, supplierLots } from '../../db/schema/ingredients';
import { sales } from '../../db/schema/sales';
import { customerContacts, customers } from '../../db/schema/customers';
import type { Actor } from '../../lib/actor';
import { notFound } from '../../lib/http-error';
import { businesses } from '../../db/schema/business';
import { renderTraceReportPdf } from './trace-report';
import { currentIngredients } from '../batches/batches.queries';
import { canSeeContacts } from '../sales/sales.service';
import { batchesDownstreamOfBatch, batchesDownstreamOfSupplierLot, supplierLotsUpstreamOfBatch, type TraceEdge } from '../../../shared/domain/trace';
import { batchesUpstreamOfBatch } from '../../../shared/domain/trace-upstream';
import type { BatchState } from '../../../shared/domain/batch-states';
import type { TraceBatch, TraceOptions, TraceQuery, TraceResult } from '../../../shared/contracts/trace';
import type { CustomerContact } from '../../../shared/contracts/sales';

/** One input row of a batch's current version (corrections replace the inputs of earlier versions). */
export interface InputEdgeRow { batchId: string; ingredientId: string | null; supplierLotId: string | null; sourceBatchId: string | null }

/** The inputs of every batch of the business, current versions only. */
export async function loadInputRows(db: DbOrTx, businessId: string): Promise<InputEdgeRow[]> {
  const rows = await db.execute<{ batch_id: string; ingredient_id: string | null; supplier_lot_id: string | null; source_batch_id: string | null }>(sql`
    select bi.batch_id, bi.ingredient_id, bi.supplier_lot_id, bi.source_batch_id
    from batch_inputs bi
    join batches b on b.id = bi.batch_id
    join batch_versions v on v.id = bi.batch_version_id and v.version = b.current_version
    where b.business_id = ${businessId}`);
  return rows.rows.map((r) => ({ batchId: r.batch_id, ingredientId: r.ingredient_id, supplierLotId: r.supplier_lot_id, sourceBatchId: r.source_batch_id }));
}

export function toEdges(rows: readonly InputEdgeRow[]): TraceEdge[] {
  return rows.flatMap((r): TraceEdge[] =>
    r.supplierLotId ? [{ fromSupplierLotId: r.supplierLotId, toBatchId: r.batchId }] : r.sourceBatchId ? [{ fromBatchId: r.sourceBatchId, toBatchId: r.batchId }] : [],
  );
}

/** Batches that contain the supplier lot, directly or through in-between batches. */
export async function batchIdsForSupplierLot(db: DbOrTx, businessId: string, supplierLotId: string): Promise<string[]> {
  return batchesDownstreamOfSupplierLot(toEdges(await loadInputRows(db, businessId)), supplierLotId);
}

/** The chosen batches plus every batch made from them. */
export function withDownstream(edges: readonly TraceEdge[], batchIds: readonly string[]): string[] {
  return [...new Set(batchIds.flatMap((id) => [id, ...batchesDownstreamOfBatch(edges, id)]))].sort();
}

interface Buyer { customerId: string; erased: boolean; contact: CustomerContact | null; batchIds: string[] }

/** Customers who bought (and did not have voided) any of the batches, with their contact if one is kept. */
export async function buyersOf(db: DbOrTx, businessId: string, batchIds: readonly string[]): Promise<Buyer[]> {
  if (batchIds.length === 0) return [];
  const rows = await db
    .select({ customerId: customers.id, erasedAt: customers.erasedAt, k: customerContacts, batchId: sales.batchId })
    .from(sales)
    .innerJoin(customers, eq(customers.id, sales.customerId))
    .leftJoin(customerContacts, eq(customerContacts.customerId, customers.id))
    .where(and(
      eq(sales.businessId, businessId), eq(sales.kind, 'sale'), inArray(sales.batchId, [...batchIds]),
      sql`not exists (select 1 from ${sales} v where v.voids_sale_id = ${sales.id})`,
    ));
  const byId = new Map<string, Buyer>();
  for (const r of rows) {
    const b = byId.get(r.customerId) ?? { customerId: r.customerId, erased: r.erasedAt != null, batchIds: [], contact: r.k ? { name: r.k.name, email: r.k.email, phone: r.k.phone, recallConsent: r.k.recallConsent, consentOn: r.k.consentOn } : null };
    if (!b.batchIds.includes(r.batchId)) b.batchIds.push(r.batchId);
    byId.set(r.customerId, b);
  }
  return [...byId.values()].sort((a, b) => (a.contact?.name ?? '~').localeCompare(b.contact?.name ?? '~'));
}

async function batchRows(db: DbOrTx, businessId: string, ids: readonly string[]) {
  if (ids.length === 0) return [];
  return db
    .select({ id: batches.id, lotCode: batches.lotCode, publicCode: batches.publicCode, productName: recipeVersions.name, madeOn: batches.madeOn, state: batches.state })
    .from(batches)
    .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
    .where(and(eq(batches.businessId, businessId), inArray(batches.id, [...ids])));
}

async function salesByBatch(db: DbOrTx, businessId: string, ids: readonly string[]) {
  if (ids.length === 0) return new Map<string, TraceBatch['sales']>();
  const rows = await db
    .select({
      batchId: sales.batchId,
      count: sql<number>`count(*) filter (where ${sales.kind} = 'sale')::int`,
      amount: sql<number>`coalesce(sum(${sales.amountCents}), 0)::bigint`,
      customers: sql<number>`count(distinct ${sales.customerId}) filter (where ${sales.kind} = 'sale')::int`,
    })
    .from(sales)
    .where(and(eq(sales.businessId, businessId), inArray(sales.batchId, [...ids])))
    .groupBy(sales.batchId);
  return new Map(rows.map((r) => [r.batchId, { count: r.count, amountCents: Number(r.amount), customerCount: r.customers }]));
}

async function lotRows(db: DbOrTx, businessId: string, where: { ids?: string[]; ingredientId?: string }) {
  const names = await currentIngredients(db, businessId);
  const conds = [eq(supplierLots.businessId, businessId)];
  if (where.ids) conds.push(inArray(supplierLots.id, where.ids.length ? where.ids : ['00000000-0000-0000-0000-000000000000']));
  if (where.ingredientId) conds.push(eq(supplierLots.ingredientId, where.ingredientId));
  const rows = await db.select().from(supplierLots).where(and(...conds)).orderBy(supplierLots.receivedOn);
  return rows.map((l) => ({ id: l.id, lotCode: l.lotCode, ingredientId: l.ingredientId, ingredientName: names.get(l.ingredientId)?.labelName ?? 'Ingredient', receivedOn: l.receivedOn }));
}

/**
 * Forward from a supplier lot or an ingredient (every batch that used it, through in-between batches,
 * with its sales and buyers), or backward from a batch (the batches and supplier lots that went in).
 * Contacts only for the owner.
 */
export async function trace(db: DbOrTx, actor: Actor, q: TraceQuery, now: Date): Promise<TraceResult> {
  const rows = await loadInputRows(db, actor.businessId);
  const edges = toEdges(rows);
  let direction: TraceResult['direction'] = 'forward';
  let start: TraceResult['start'];
  let ids: string[] = [];
  const unrecorded = new Set<string>();
  let upstreamLots: TraceResult['supplierLots'] = [];
  let unrecordedIngredients: TraceResult['unrecordedIngredients'] = [];
  if (q.supplierLotId) {
    const [lot] = await lotRows(db, actor.businessId, { ids: [q.supplierLotId] });
    if (!lot) throw notFound('That supplier lot');
    start = { kind: 'supplier_lot', id: lot.id, label: `${lot.ingredientName}, lot ${lot.lotCode}` };
    ids = batchesDownstreamOfSupplierLot(edges, lot.id);
  } else if (q.ingredientId) {
    const [ing] = await db.select({ id: ingredients.id }).from(ingredients).where(and(eq(ingredients.id, q.ingredientId), eq(ingredients.businessId, actor.businessId)));
    if (!ing) throw notFound('That ingredient');
    const name = (await currentIngredients(db, actor.businessId)).get(ing.id)?.labelName ?? 'Ingredient';
    start = { kind: 'ingredient', id: ing.id, label: name };
    const lots = await lotRows(db, actor.businessId, { ingredientId: ing.id });
    const found = new Set(lots.flatMap((l) => batchesDownstreamOfSupplierLot(edges, l.id)));
    // Used with no lot noted: that batch and everything made from it may contain any lot.
    for (const r of rows) if (r.ingredientId === ing.id && !r.supplierLotId) unrecorded.add(r.batchId);
    for (const id of withDownstream(edges, [...unrecorded])) found.add(id);
    ids = [...found].sort();
  } else {
    direction = 'backward';
    const [b] = await batchRows(db, actor.businessId, [q.batchId!]);
    if (!b) throw notFound('That batch');
    start = { kind: 'batch', id: b.id, label: `${b.productName}, lot ${b.lotCode}` };
    ids = [b.id, ...batchesUpstreamOfBatch(edges, b.id)];
    upstreamLots = await lotRows(db, actor.businessId, { ids: supplierLotsUpstreamOfBatch(edges, b.id) });
    const names = await currentIngredients(db, actor.businessId);
    unrecordedIngredients = rows
      .filter((r) => ids.includes(r.batchId) && r.ingredientId && !r.supplierLotId)
      .map((r) => ({ ingredientId: r.ingredientId!, ingredientName: names.get(r.ingredientId!)?.labelName ?? 'Ingredient', batchId: r.batchId }));
  }
  const inSet = new Set(ids);
  const found = await batchRows(db, actor.businessId, ids);
  const salesMap = await salesByBatch(db, actor.businessId, ids);
  const list: TraceBatch[] = found
    .map((b) => ({
      ...b, state: b.state as BatchState,
      madeFromBatchIds: [...new Set(rows.filter((r) => r.batchId === b.id && r.sourceBatchId && inSet.has(r.sourceBatchId)).map((r) => r.sourceBatchId!))],
      lotNotRecorded: unrecorded.has(b.id),
      sales: salesMap.get(b.id) ?? { count: 0, amountCents: 0, customerCount: 0 },
    }))
    .sort((a, b) => a.madeOn.localeCompare(b.madeOn) || a.lotCode.localeCompare(b.lotCode));
  const buyers = direction === 'forward' ? await buyersOf(db, actor.businessId, ids) : [];
  const show = canSeeContacts(actor);
  return {
    direction, start, batches: list, supplierLots: upstreamLots, unrecordedIngredients,
    customers: buyers.map((c) => ({ customerId: c.customerId, erased: c.erased, batchIds: c.batchIds, ...(show ? { contact: c.contact } : {}) })),
    consentingCustomerCount: buyers.filter((c) => c.contact?.recallConsent).length,
    generatedAt: now.toISOString(),
  };
}

/** Pickers: supplier lots (newest first), ingredients, batches. */
export async function traceOptions(db: DbOrTx, actor: Actor): Promise<TraceOptions> {
  const names = await currentIngredients(db, actor.businessId);
  const lots = (await lotRows(db, actor.businessId, {})).reverse();
  const list = await db
    .select({ id: batches.id, lotCode: batches.lotCode, productName: recipeVersions.name, madeOn: batches.madeOn, state: batches.state })
    .from(batches)
    .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
    .where(eq(batches.businessId, actor.businessId))
    .orderBy(sql`${batches.madeOn} desc`, sql`${batches.daySequence} desc`)
    .limit(500);
  return {
    supplierLots: lots,
    ingredients: [...names.values()].map((i) => ({ id: i.id, name: i.labelName })).sort((a, b) => a.name.localeCompare(b.name)),
    batches: list.map((b) => ({ ...b, state: b.state as BatchState })),
  };
}

/** The trace as a PDF (contacts only in the owner's copy, as on screen). */
export async function traceReport(db: DbOrTx, actor: Actor, q: TraceQuery, now: Date): Promise<{ bytes: Uint8Array; fileName: string }> {
  const result = await trace(db, actor, q, now);
  const [b] = await db.select({ name: businesses.name, timeZone: businesses.timeZone }).from(businesses).where(eq(businesses.id, actor.businessId));
  const bytes = await renderTraceReportPdf(result, b!.name, b!.timeZone);
  return { bytes, fileName: `trace-${result.direction}-${now.toISOString().slice(0, 10)}.pdf` };
}
