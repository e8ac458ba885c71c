import { eq } from 'drizzle-orm';
import type { SeedContext, SeedStep } from './demo';
import { SEED_CUSTOMERS_KEY } from './sales';
import { businesses } from '../schema/business';
import { latestRecipeVersions } from '../../features/batches/batches.queries';
import { changeBatchState, createBatch, getLotCandidates } from '../../features/batches/batches.service';
import { createSupplierLot } from '../../features/ingredients/supplier-lots.service';
import { createSale } from '../../features/sales/sales.service';
import { markToldByPhone, openRecall } from '../../features/trace/recalls.service';
import { currentIngredients } from '../../features/batches/batches.queries';
import { addCalendarDays } from '../../../shared/domain/calendar-date';
import { businessLocalDate, localDateTimeToInstants } from '../../../shared/domain/zoned-time';
import type { BatchDetail } from '../../../shared/contracts/batches';

/**
 * The recall story: the supplier (invented) recalls a lot that went into one in-between batch (the
 * buttercream binder), which went into two product batches that customers bought. The recall moves the
 * three batches to recalled, e-mails the consenting customer (Sent mail shows it once the sender runs),
 * lists the one without consent, and records one customer told by phone.
 */
export const recallsSeedStep: SeedStep = {
  name: 'trace and recall',
  run: async (ctx: SeedContext) => {
    const { db, businessId, actors } = ctx;
    const [business] = await db.select().from(businesses).where(eq(businesses.id, businessId));
    const tz = business!.timeZone;
    const today = businessLocalDate(ctx.now, tz);
    const at = (daysAgo: number, hh: number) => {
      const t = localDateTimeToInstants(`${addCalendarDays(today, -daysAgo)}T${String(hh).padStart(2, '0')}:00`, tz)[0] ?? ctx.now;
      return new Date(Math.min(t.getTime(), ctx.now.getTime()));
    };
    const latest = (await latestRecipeVersions(db, businessId)).filter((r) => !r.isArchived);
    const products = latest.filter((r) => r.isSellable);
    const usersOf = (recipeId: string) => products.filter((p) => p.components.some((c) => c.kind === 'recipe' && c.recipeId === recipeId));
    const sub = latest
      .filter((r) => !r.isSellable && usersOf(r.recipeId).length >= 2 && r.components.some((c) => c.kind === 'ingredient'))
      .sort((a, b) => Number(/binder|frosting/i.test(b.name)) - Number(/binder|frosting/i.test(a.name)))[0];
    if (!sub) return;
    const [pA, pB] = usersOf(sub.recipeId);
    const names = await currentIngredients(db, businessId);
    // An ingredient of the binder without peanut: the story is undeclared peanut (the pops declare no peanut).
    const ingredientIds = sub.components.flatMap((c) => (c.kind === 'ingredient' ? [c.ingredientId] : []));
    const ingredientId = ingredientIds.find((id) => !/peanut/i.test(names.get(id)?.labelName ?? '')) ?? ingredientIds[0]!;
    const ingredientName = (names.get(ingredientId)?.labelName ?? 'ingredient').toLowerCase();
    const lot = await createSupplierLot(db, actors.baker, ingredientId, {
      lotCode: 'PS-2611-R', receivedOn: addCalendarDays(today, -8), bestBy: addCalendarDays(today, 300), quantity: '1 bag', notes: '',
    }, at(8, 10));

    const make = async (rv: (typeof latest)[number], daysAgo: number, pieces: number | null, source?: BatchDetail): Promise<BatchDetail> => {
      const c = await getLotCandidates(db, actors.owner, rv.id);
      const covered = source ? c.subRecipes.find((s) => s.recipeId === sub.recipeId)?.ingredientIds ?? [] : [];
      const lots = c.ingredients
        .filter((i) => i.isDirect || !covered.includes(i.ingredientId))
        .flatMap((i) => {
          const chosen = i.ingredientId === ingredientId ? lot.id : i.lots.find((l) => l.receivedOn <= addCalendarDays(today, -daysAgo))?.id ?? i.lots[0]?.id;
          return chosen ? [{ ingredientId: i.ingredientId, supplierLotId: chosen }] : [];
        });
      const b = await createBatch(db, actors.baker, {
        recipeVersionId: rv.id, madeOn: addCalendarDays(today, -daysAgo), madeByUserId: actors.baker.userId!, quantityPieces: pieces, lots,
        subRecipeBatches: source ? [{ recipeId: sub.recipeId, sourceBatchId: source.id }] : [],
      }, at(daysAgo, 9));
      return changeBatchState(db, actors.baker, b.id, { toState: 'released', reason: source ? 'Cooled, dipped, set and bagged; labels checked' : 'Binder made for the weekend products' }, at(daysAgo, 13));
    };
    const binder = await make(sub, 7, null);
    const first = await make(pA!, 6, 36, binder);
    const second = pB ? await make(pB, 6, 24, binder) : null;

    const customers = (ctx.shared.get(SEED_CUSTOMERS_KEY) as Record<string, string> | undefined) ?? {};
    const sell = async (batch: BatchDetail, who: string | undefined, dollars: number, channel: 'event' | 'direct' | 'online') =>
      createSale(db, actors.owner, { batchId: batch.id, soldOn: addCalendarDays(today, -5), quantity: 2, unit: 'packages', amountCents: dollars * 100, channel, ...(who && customers[who] ? { customerId: customers[who] } : {}) }, at(5, 16));
    await sell(first, 'Odile', 48, 'event');
    await sell(first, 'Bram', 36, 'event');
    await sell(second ?? first, 'Cass', 42, 'direct');
    await sell(second ?? first, 'Hollis', 30, 'event');
    await sell(second ?? first, undefined, 24, 'direct');

    const recall = await openRecall(db, actors.owner, {
      reason: `Cedar Row Baking Supply (invented) recalled ${ingredientName} lot ${lot.lotCode}: a packing-line mix-up means it may contain peanut that is not on its label.`,
      publicNotice: `We are recalling these cake pops: the ${ingredientName} in them may contain peanut, which is not declared on the label. If you or anyone you share them with is allergic to peanuts, do not eat them. Bring them back for a full refund, or throw them away.`,
      scope: { kind: 'supplier_lot', supplierLotId: lot.id },
      confirmed: true,
    }, at(1, 9), ctx.publicBaseUrl);
    if (customers.Bram) {
      await markToldByPhone(db, actors.owner, recall.id, customers.Bram, { note: 'Called the number from the market order; none eaten, bringing the bags back on Saturday.' }, at(1, 11));
    }
  },
};
