import { eq } from 'drizzle-orm';
import type { TestApp } from './app';
import type { TestBusiness } from './agents';
import { createIngredient, createRecipeVersion, createSupplierLot } from './factories';
import { changeBatchState, createBatch } from '../../server/features/batches/batches.service';
import { businesses } from '../../server/db/schema/business';
import type { Actor } from '../../server/lib/actor';

export const ownerActor = (b: TestBusiness): Actor => ({ kind: 'member', businessId: b.businessId, userId: b.members.owner.userId, name: b.members.owner.displayName, role: 'owner' });

export async function setRuleProfile(t: TestApp, businessId: string, ruleProfileId: string) {
  await t.db.update(businesses).set({ ruleProfileId }).where(eq(businesses.id, businessId));
}

/**
 * A supplier lot of sprinkles → one frosting batch → two product batches made with that frosting, plus
 * an unrelated product batch of another lot. All released (made yesterday) so they can be sold.
 */
export async function recallChain(t: TestApp, b: TestBusiness) {
  const actor = ownerActor(b);
  const now = t.clock.now;
  const madeOn = new Date(now.getTime() - 86_400_000).toISOString().slice(0, 10);
  const sprinkles = await createIngredient(t, b.businessId, { labelName: 'Rainbow sprinkles (test)' });
  const sprinklesLot = await createSupplierLot(t, b.businessId, { ingredientId: sprinkles.id, lotCode: `RS-${Math.random().toString(36).slice(2, 8)}`, receivedOn: madeOn });
  const otherLot = await createSupplierLot(t, b.businessId, { ingredientId: sprinkles.id, lotCode: `RS-OTHER-${Math.random().toString(36).slice(2, 8)}`, receivedOn: madeOn });
  const frostingRv = await createRecipeVersion(t, b.businessId, { name: 'Sprinkle frosting', isSellable: false, components: [{ kind: 'ingredient', ingredientId: sprinkles.id, grams: '100' }] });
  const productRv = (name: string) => createRecipeVersion(t, b.businessId, { name, components: [{ kind: 'recipe', recipeId: frostingRv.recipeId, grams: '50' }] });
  const popsA = await productRv('Confetti pops');
  const popsB = await productRv('Party pops');
  const plainRv = await createRecipeVersion(t, b.businessId, { name: 'Plain sprinkle pops', components: [{ kind: 'ingredient', ingredientId: sprinkles.id, grams: '20' }] });
  const release = async (id: string) => changeBatchState(t.db, actor, id, { toState: 'released', reason: 'Checked and packed' }, now);
  const frosting = await createBatch(t.db, actor, { recipeVersionId: frostingRv.id, madeOn, lots: [{ ingredientId: sprinkles.id, supplierLotId: sprinklesLot.id }] }, now);
  await release(frosting.id);
  const a = await createBatch(t.db, actor, { recipeVersionId: popsA.id, madeOn, subRecipeBatches: [{ recipeId: frostingRv.recipeId, sourceBatchId: frosting.id }] }, now);
  const bb = await createBatch(t.db, actor, { recipeVersionId: popsB.id, madeOn, subRecipeBatches: [{ recipeId: frostingRv.recipeId, sourceBatchId: frosting.id }] }, now);
  const unrelated = await createBatch(t.db, actor, { recipeVersionId: plainRv.id, madeOn, lots: [{ ingredientId: sprinkles.id, supplierLotId: otherLot.id }] }, now);
  for (const x of [a, bb, unrelated]) await release(x.id);
  return { sprinkles, sprinklesLot, otherLot, frosting, productA: a, productB: bb, unrelated, madeOn };
}
