import { desc, eq } from 'drizzle-orm';
import type { SeedContext, SeedStep } from './demo';
import { businesses } from '../schema/business';
import { supplierLots } from '../schema/ingredients';
import { latestRecipeVersions } from '../../features/batches/batches.queries';
import { changeBatchState, correctBatch, createBatch, getLotCandidates } from '../../features/batches/batches.service';
import { createSupplierLot } from '../../features/ingredients/supplier-lots.service';
import { addCalendarDays } from '../../../shared/domain/calendar-date';
import { businessLocalDate, localDateTimeToInstants } from '../../../shared/domain/zoned-time';
import type { BatchDetail } from '../../../shared/contracts/batches';
import type { BatchState } from '../../../shared/domain/batch-states';
import type { Actor } from '../../lib/actor';

/** ctx.shared key: the demo batches by story role (e.g. 'frosting', 'soldOutEarly'), for later steps. */
export const SEED_BATCHES_KEY = 'batches';

interface Step { to: BatchState; reason: string; afterHours: number; by?: 'owner' | 'baker' }

/**
 * Five weeks of Juniper Lane batches in every state but recalled (left to the recall story): released,
 * sold out, held, discarded, in progress; one frosting batch used by two product batches; one correction;
 * one batch with no supplier lot noted for an ingredient. Recipes and lots are found in the database.
 */
export const batchesSeedStep: SeedStep = {
  name: 'batches',
  run: async (ctx: SeedContext) => {
    const { db, businessId } = ctx;
    const [business] = await db.select().from(businesses).where(eq(businesses.id, businessId));
    const recipes = (await latestRecipeVersions(db, businessId)).filter((r) => !r.isArchived).sort((a, b) => a.name.localeCompare(b.name));
    const products = recipes.filter((r) => r.isSellable);
    if (products.length === 0) return;
    const usesSub = (p: (typeof recipes)[number]) => p.components.find((c) => c.kind === 'recipe');
    // The shared frosting/binder: the sub-recipe used by the most products.
    const subUse = new Map<string, number>();
    for (const p of products) for (const c of p.components) if (c.kind === 'recipe') subUse.set(c.recipeId, (subUse.get(c.recipeId) ?? 0) + 1);
    const nameOf = (id: string) => recipes.find((r) => r.recipeId === id)?.name ?? '';
    const isBinder = (id: string) => (/frosting|binder|buttercream/i.test(nameOf(id)) ? 1 : 0);
    const subId = [...subUse.entries()].sort((a, b) => b[1] - a[1] || isBinder(b[0]) - isBinder(a[0]))[0]?.[0];
    const sub = recipes.find((r) => r.recipeId === subId);
    const withSub = products.filter((p) => subId && p.components.some((c) => c.kind === 'recipe' && c.recipeId === subId));
    const pA = withSub[0] ?? products[0]!;
    const pB = withSub[1] ?? products.find((p) => p !== pA) ?? pA;
    const plain = products.find((p) => !usesSub(p)) ?? pB;

    const tz = business!.timeZone;
    const today = businessLocalDate(ctx.now, tz);
    // Every ingredient the batches use gets at least one received lot (the history starts ~6 weeks back).
    const used = new Map<string, string>();
    for (const r of [...products, ...(sub ? [sub] : [])]) for (const i of (await getLotCandidates(db, ctx.actors.owner, r.id)).ingredients) used.set(i.ingredientId, i.name);
    const haveLots = new Set((await db.select({ id: supplierLots.ingredientId }).from(supplierLots).where(eq(supplierLots.businessId, businessId))).map((l) => l.id));
    let n = 0;
    for (const [ingredientId, name] of used) {
      if (haveLots.has(ingredientId)) continue;
      n += 1;
      const initials = name.replace(/[^A-Za-z ]/g, '').split(' ').filter(Boolean).map((w) => w[0]!.toUpperCase()).join('').slice(0, 3) || 'LOT';
      await createSupplierLot(db, ctx.actors.baker, ingredientId, { lotCode: `${initials}-${4100 + n * 37}`, receivedOn: addCalendarDays(today, -40), bestBy: null, quantity: '', notes: '' }, ctx.now);
    }
    const lots = await db.select().from(supplierLots).where(eq(supplierLots.businessId, businessId)).orderBy(desc(supplierLots.receivedOn));
    const at = (date: string, hh: number) => localDateTimeToInstants(`${date}T${String(hh).padStart(2, '0')}:00`, tz)[0] ?? ctx.now;
    const atHoursAfter = (date: string, hours: number) => new Date(Math.min(at(date, 9).getTime() + hours * 3_600_000, ctx.now.getTime()));

    /** The newest lot of the ingredient received on or before the day (or its oldest, for a short history). */
    const lotFor = (ingredientId: string, madeOn: string) => {
      const own = lots.filter((l) => l.ingredientId === ingredientId);
      return own.find((l) => l.receivedOn <= madeOn) ?? own.at(-1);
    };

    const made: Record<string, BatchDetail> = {};
    const make = async (key: string, recipe: (typeof recipes)[number], daysAgo: number, who: 'owner' | 'baker', opts: {
      pieces?: number; packages?: number; notes?: string; steps?: Step[]; source?: BatchDetail; skipLots?: boolean;
    }) => {
      const madeOn = addCalendarDays(today, -daysAgo);
      const sourceRecipeId = opts.source ? sub?.recipeId : undefined;
      const c = await getLotCandidates(db, ctx.actors.owner, recipe.id);
      const fromFresh = new Set(c.subRecipes.filter((s) => s.recipeId !== sourceRecipeId).flatMap((s) => s.ingredientIds));
      const needed = c.ingredients.filter((i) => i.isDirect || fromFresh.has(i.ingredientId)).map((i) => i.ingredientId);
      // The "forgot to note the lot" story: sprinkles if the recipe has them, else its last ingredient.
      const skip = opts.skipLots ? [needed.find((id) => /sprinkle/i.test(used.get(id) ?? '')) ?? needed.at(-1)!] : [];
      const chosen = needed.filter((id) => !skip.includes(id)).flatMap((id) => {
        const lot = lotFor(id, madeOn);
        return lot ? [{ ingredientId: id, supplierLotId: lot.id }] : [];
      });
      let batch = await createBatch(db, ctx.actors[who], {
        recipeVersionId: recipe.id, madeOn, madeByUserId: ctx.actors[who].userId!, quantityPieces: opts.pieces ?? null, quantityPackages: opts.packages ?? null,
        notes: opts.notes ?? '', lots: chosen,
        subRecipeBatches: opts.source && sourceRecipeId ? [{ recipeId: sourceRecipeId, sourceBatchId: opts.source.id }] : [],
      }, atHoursAfter(madeOn, 0));
      for (const s of opts.steps ?? []) {
        const actor: Actor = ctx.actors[s.by ?? who];
        batch = await changeBatchState(db, actor, batch.id, { toState: s.to, reason: s.reason }, atHoursAfter(madeOn, s.afterHours));
      }
      made[key] = batch;
      return batch;
    };

    const release = (h = 6): Step => ({ to: 'released', reason: 'Cooled, dipped, set and bagged; labels checked', afterHours: h });
    await make('soldOutEarly', pA, 34, 'baker', { pieces: 36, packages: 12, notes: 'Farmers market, first Saturday of the month.', steps: [release(), { to: 'sold_out', reason: 'Sold out at the Millbrook farmers market', afterHours: 30 }] });
    await make('soldOutPlain', plain, 30, 'baker', { pieces: 24, packages: 8, steps: [release(), { to: 'sold_out', reason: 'Last bags sold to the library bake sale', afterHours: 52 }] });
    await make('discarded', pA, 27, 'baker', {
      pieces: 30, notes: 'Coating seized; pops cracked.',
      steps: [{ to: 'discarded', reason: 'Candy coating overheated and seized; whole tray thrown out before packing', afterHours: 3 }],
    });
    await make('soldOutMid', pB, 20, 'owner', { pieces: 48, packages: 16, steps: [release(), { to: 'sold_out', reason: 'Wedding favour order delivered', afterHours: 28, by: 'owner' }] });
    await make('held', pB, 13, 'baker', {
      pieces: 24, packages: 8,
      steps: [release(), { to: 'held', reason: 'A customer asked about an allergen on the label; holding until the supplier confirms the ingredient declaration', afterHours: 50, by: 'owner' }],
    });
    if (sub) {
      const frosting = await make('frosting', sub, 10, 'baker', { notes: 'One batch of frosting for both weekend products.', steps: [{ to: 'released', reason: 'Frosting made and chilled for the weekend products', afterHours: 2 }] });
      const first = await make('withFrostingA', pA, 9, 'baker', { pieces: 40, packages: 10, source: frosting, steps: [release()] });
      made.withFrostingA = await correctBatch(db, ctx.actors.owner, first.id, { quantityPieces: 38, quantityPackages: 9, reason: 'Recount after packing: two pops broke, so 38 pieces in 9 bags' }, atHoursAfter(addCalendarDays(today, -9), 8));
      if (withSub[1]) await make('withFrostingB', pB, 8, 'baker', { pieces: 24, packages: 6, source: frosting, steps: [release()] });
    }
    await make('missingLot', pB, 3, 'baker', { pieces: 24, packages: 8, notes: 'Opened a new tub of sprinkles; lot number not written down.', skipLots: true, steps: [release()] });
    await make('released', plain, 2, 'owner', { pieces: 30, packages: 10, steps: [release()] });
    await make('inProgress', pA, 0, 'baker', { pieces: 36, notes: 'Cake balls chilling; dipping this afternoon.' });
    ctx.shared.set(SEED_BATCHES_KEY, made);
  },
};
