import { and, desc, eq, inArray, type SQL } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { supplierLots, supplierLotLabelChecks } from '../../db/schema/ingredients';
import { appendRecordEvent } from '../records/record-events.service';
import { HttpError, notFound } from '../../lib/http-error';
import type { Actor } from '../../lib/actor';
import { addCalendarDays } from '../../../shared/domain/calendar-date';
import type { CreateSupplierLotInput, LabelCheckInput, SupplierLot } from '../../../shared/contracts/ingredients';
import { currentIngredientVersions, peopleByIds, personRef, requireIngredient } from './ingredients.queries';

type LotRow = typeof supplierLots.$inferSelect;

export interface LotFilter { ingredientId?: string; needsRecheck?: boolean; ids?: string[] }

/** Lots of this business, newest arrival first, each with its label re-checks. */
export async function listSupplierLots(db: DbOrTx, actor: Actor, filter: LotFilter = {}): Promise<SupplierLot[]> {
  const where: SQL[] = [eq(supplierLots.businessId, actor.businessId)];
  if (filter.ingredientId) where.push(eq(supplierLots.ingredientId, filter.ingredientId));
  if (filter.ids) where.push(inArray(supplierLots.id, filter.ids.length ? filter.ids : ['00000000-0000-0000-0000-000000000000']));
  const lots = await db.select().from(supplierLots).where(and(...where)).orderBy(desc(supplierLots.receivedOn), desc(supplierLots.createdAt));
  if (!lots.length) return [];
  const checks = await db
    .select()
    .from(supplierLotLabelChecks)
    .where(and(eq(supplierLotLabelChecks.businessId, actor.businessId), inArray(supplierLotLabelChecks.supplierLotId, lots.map((l) => l.id))))
    .orderBy(desc(supplierLotLabelChecks.checkedAt));
  const names = new Map((await currentIngredientVersions(db, actor.businessId, [...new Set(lots.map((l) => l.ingredientId))])).map((v) => [v.ingredientId, v.labelName]));
  const people = await peopleByIds(db, [...lots.map((l) => l.createdByUserId), ...checks.map((c) => c.checkedByUserId)]);
  const out = lots.map((l: LotRow): SupplierLot => {
    const mine = checks.filter((c) => c.supplierLotId === l.id);
    return {
      id: l.id,
      ingredientId: l.ingredientId,
      ingredientName: names.get(l.ingredientId) ?? '',
      lotCode: l.lotCode,
      receivedOn: l.receivedOn,
      bestBy: l.bestBy,
      quantity: l.quantity,
      notes: l.notes,
      createdBy: personRef(people, l.createdByUserId),
      createdAt: l.createdAt.toISOString(),
      labelChecks: mine.map((c) => ({ id: c.id, outcome: c.outcome, notes: c.notes, checkedBy: personRef(people, c.checkedByUserId)!, checkedAt: c.checkedAt.toISOString() })),
      needsLabelRecheck: mine.length === 0,
    };
  });
  return filter.needsRecheck === undefined ? out : out.filter((l) => l.needsLabelRecheck === filter.needsRecheck);
}

async function getLot(db: DbOrTx, actor: Actor, id: string): Promise<SupplierLot> {
  const [lot] = await listSupplierLots(db, actor, { ids: [id] });
  if (!lot) throw notFound('That supplier lot');
  return lot;
}

/** A received lot starts "label re-check needed": suppliers change recipes without notice. */
export async function createSupplierLot(db: Db, actor: Actor, ingredientId: string, input: CreateSupplierLotInput, now: Date): Promise<SupplierLot> {
  // One day of slack so a lot received "today" in any time zone is accepted.
  const latest = addCalendarDays(now.toISOString().slice(0, 10), 1);
  if (input.receivedOn > latest) throw new HttpError(400, 'validation_failed', 'Some fields need attention.', { receivedOn: ['The received date cannot be in the future'] });
  const id = await db.transaction(async (tx) => {
    const ingredient = await requireIngredient(tx, actor, ingredientId);
    const [lot] = await tx.insert(supplierLots).values({
      businessId: actor.businessId, ingredientId, lotCode: input.lotCode, receivedOn: input.receivedOn, bestBy: input.bestBy ?? null,
      quantity: input.quantity, notes: input.notes, createdByUserId: actor.userId, createdAt: now, updatedAt: now,
    }).returning();
    await appendRecordEvent(tx, actor, {
      entityType: 'supplier_lot', entityId: lot!.id, action: 'receive',
      payload: { ingredientId, ingredientVersion: ingredient.version, lotCode: input.lotCode, receivedOn: input.receivedOn, bestBy: input.bestBy ?? null, quantity: input.quantity },
    }, now);
    return lot!.id;
  });
  return getLot(db, actor, id);
}

/** Records that someone compared this lot's package label with the stored declaration. */
export async function recordLabelCheck(db: Db, actor: Actor, lotId: string, input: LabelCheckInput, now: Date): Promise<SupplierLot> {
  await db.transaction(async (tx) => {
    const [lot] = await tx.select().from(supplierLots).where(and(eq(supplierLots.id, lotId), eq(supplierLots.businessId, actor.businessId)));
    if (!lot) throw notFound('That supplier lot');
    const ingredient = await requireIngredient(tx, actor, lot.ingredientId);
    const [check] = await tx.insert(supplierLotLabelChecks).values({
      businessId: actor.businessId, supplierLotId: lotId, outcome: input.outcome, notes: input.notes,
      checkedByUserId: actor.userId!, checkedAt: now, createdAt: now, updatedAt: now,
    }).returning();
    await appendRecordEvent(tx, actor, {
      entityType: 'supplier_lot', entityId: lotId, action: 'label_check',
      payload: { checkId: check!.id, outcome: input.outcome, notes: input.notes, ingredientId: lot.ingredientId, ingredientVersion: ingredient.version },
    }, now);
  });
  return getLot(db, actor, lotId);
}
