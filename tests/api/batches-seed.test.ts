import { describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { createTestBusiness } from '../support/agents';
import { createIngredient, createRecipeVersion, createSupplierLot } from '../support/factories';
import { batchesSeedStep, SEED_BATCHES_KEY } from '../../server/db/seed/batches';
import type { SeedContext } from '../../server/db/seed/demo';
import { batches } from '../../server/db/schema/batches';
import { getBatchDetail } from '../../server/features/batches/batches.service';
import { verifyBusinessChain } from '../../server/features/records/record-events.service';
import type { Actor } from '../../server/lib/actor';
import type { BatchDetail } from '../../shared/contracts/batches';

const t = makeTestApp();

describe('batches demo step', () => {
  test('seeds five weeks of batches in every state, a shared frosting batch, a correction and a missing-lot warning', async () => {
    const business = await createTestBusiness(t);
    const b = business.businessId;
    const ing = async (name: string) => {
      const i = await createIngredient(t, b, { labelName: name });
      await createSupplierLot(t, b, { ingredientId: i.id, lotCode: `${name.slice(0, 3).toUpperCase()}-1`, receivedOn: '2026-09-01' });
      return i;
    };
    const [crumb, butter, sugar, coating, sprinkles] = [await ing('Cake crumb'), await ing('Butter'), await ing('Icing sugar'), await ing('Candy coating'), await ing('Sprinkles')];
    const frosting = await createRecipeVersion(t, b, { name: 'Vanilla binder frosting', isSellable: false, components: [
      { kind: 'ingredient', ingredientId: butter.id, grams: '200' }, { kind: 'ingredient', ingredientId: sugar.id, grams: '400' },
    ] });
    const product = (name: string, extra: string) => createRecipeVersion(t, b, { name, components: [
      { kind: 'ingredient', ingredientId: crumb.id, grams: '500' }, { kind: 'recipe', recipeId: frosting.recipeId, grams: '120' },
      { kind: 'ingredient', ingredientId: coating.id, grams: '300' }, { kind: 'ingredient', ingredientId: extra, grams: '20' },
    ] });
    await product('Birthday cake pops', sprinkles.id);
    await product('Salted caramel cake pops', coating.id);
    await createRecipeVersion(t, b, { name: 'Plain chocolate cake pops', components: [{ kind: 'ingredient', ingredientId: crumb.id, grams: '500' }, { kind: 'ingredient', ingredientId: coating.id, grams: '300' }] });

    const actors = Object.fromEntries((['owner', 'baker', 'helper'] as const).map((role) => [role, { kind: 'member', businessId: b, userId: business.members[role].userId, name: business.members[role].displayName, role } satisfies Actor])) as SeedContext['actors'];
    const ctx: SeedContext = { db: t.db, now: t.clock.now, businessId: b, actors, publicBaseUrl: 'http://127.0.0.1', uploadDir: '/tmp', shared: new Map() };
    await batchesSeedStep.run(ctx);

    const rows = await t.db.select().from(batches).where(eq(batches.businessId, b));
    expect(new Set(rows.map((r) => r.state))).toEqual(new Set(['in_progress', 'released', 'held', 'sold_out', 'discarded']));
    const oldest = rows.map((r) => r.madeOn).sort()[0]!;
    expect(Date.parse(t.clock.now.toISOString().slice(0, 10)) - Date.parse(oldest)).toBeGreaterThanOrEqual(33 * 86_400_000);

    const made = ctx.shared.get(SEED_BATCHES_KEY) as Record<string, BatchDetail>;
    const details = await Promise.all(rows.map((r) => getBatchDetail(t.db, { businessId: b }, r.id)));
    const usingFrosting = details.filter((d) => d.current.inputs.some((i) => i.kind === 'batch' && i.sourceBatchId === made.frosting!.id));
    expect(usingFrosting).toHaveLength(2);
    const corrected = details.filter((d) => d.versions.length > 1);
    expect(corrected).toHaveLength(1);
    expect(corrected[0]!.current.reason).toMatch(/Recount/);
    const warned = details.filter((d) => d.warnings.length > 0);
    expect(warned.map((d) => d.id)).toEqual([made.missingLot!.id]);
    expect(warned[0]!.warnings[0]!.message).toMatch(/^No supplier lot recorded for /);
    expect(details.filter((d) => d.id !== made.missingLot!.id).every((d) => d.current.inputs.every((i) => i.kind === 'batch' || i.supplierLotId))).toBe(true);
    expect(await verifyBusinessChain(t.db, b)).toMatchObject({ ok: true });
  });
});
