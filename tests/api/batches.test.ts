import { describe, expect, test } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { businessWithAgents, createTestBusiness, signedInAgent } from '../support/agents';
import { uniqueSuffix } from '../support/db';
import { createBatch, createIngredient, createRecipeVersion, createSimpleRecipe, createSupplierLot } from '../support/factories';
import { batches, batchVersions } from '../../server/db/schema/batches';
import { recordEvents } from '../../server/db/schema/record-events';
import { businesses } from '../../server/db/schema/business';
import { registerReleaseCheck, unregisterReleaseCheck, type ReleaseCheck } from '../../server/features/batches/release-checks';
import { verifyBusinessChain } from '../../server/features/records/record-events.service';

const t = makeTestApp();

async function setUp() {
  const ctx = await businessWithAgents(t);
  const recipe = await createSimpleRecipe(t, ctx.business.businessId, ['Flour', 'Sugar']);
  const lots = recipe.ingredients.map((i) => ({ ingredientId: i.ingredient.id, supplierLotId: i.lot.id }));
  return { ...ctx, recipe, lots };
}

describe('POST /api/batches: lot codes', () => {
  // Ordinal days per ISO 8601 ordinal date (YYYY-DDD): 2024 is a leap year, so 31 Dec is day 366 and 29 Feb day 060.
  test.each([
    ['2024-12-31', 'CT-24366-01'],
    ['2025-01-01', 'CT-25001-01'],
    ['2024-02-29', 'CT-24060-01'],
  ])('when made on %s, then the lot code is %s', async (madeOn, expected) => {
    const { baker, recipe, lots } = await setUp();
    const res = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, madeOn, lots });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ lotCode: expected, madeOn, daySequence: 1, state: 'in_progress' });
  });

  test('when three batches are made on one day, then the sequence counts 01, 02, 03 and the next day restarts', async () => {
    const { owner, recipe, lots } = await setUp();
    const codes: string[] = [];
    for (const madeOn of ['2025-03-01', '2025-03-01', '2025-03-01', '2025-03-02']) {
      const res = await owner.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, madeOn, lots });
      codes.push(res.body.lotCode);
    }
    // 2025-03-01 is ordinal day 060 in a common year (ISO 8601 ordinal date).
    expect(codes).toEqual(['CT-25060-01', 'CT-25060-02', 'CT-25060-03', 'CT-25061-01']);
  });

  test('when the business uses its own scheme and prefix, then codes follow it', async () => {
    const { business, baker, recipe, lots } = await setUp();
    await t.db.update(businesses).set({ lotCodeScheme: '{PREFIX}{YYYY}{MM}{DD}-{SEQ}', lotCodePrefix: 'JL' }).where(eq(businesses.id, business.businessId));
    const res = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, madeOn: '2025-03-01', lots });
    expect(res.body.lotCode).toBe('JL20250301-01');
    await t.db.update(businesses).set({ lotCodeScheme: '{PREFIX}-{SEQ}' }).where(eq(businesses.id, business.businessId));
    const bad = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, madeOn: '2025-03-01', lots });
    expect(bad).toMatchObject({ status: 400, body: { error: { code: 'validation_failed', message: expect.stringMatching(/lot-code scheme/) } } });
  });

  test('when batches are made concurrently on one day, then each gets its own sequence number', async () => {
    const { owner, recipe, lots } = await setUp();
    const results = await Promise.all([1, 2, 3].map(() => owner.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, madeOn: '2025-06-10', lots })));
    expect(results.map((r) => r.status)).toEqual([201, 201, 201]);
    expect(results.map((r) => r.body.lotCode).sort()).toEqual(['CT-25161-01', 'CT-25161-02', 'CT-25161-03']);
  });

  test('when the made-on date is left out, then it is today in the business time zone; best-by comes from the recipe shelf life', async () => {
    const { baker, recipe, lots } = await setUp();
    const res = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots, quantityPieces: 24, quantityPackages: 6 });
    expect(res.status).toBe(201);
    const today = new Intl.DateTimeFormat('en-CA', { timeZone: 'America/Chicago' }).format(t.clock.now);
    expect(res.body.madeOn).toBe(today);
    // Factory recipe shelf life is 5 days; day of making is day 0.
    const expected = new Date(Date.parse(`${today}T00:00:00Z`) + 5 * 86_400_000).toISOString().slice(0, 10);
    expect(res.body.current).toMatchObject({ shelfLifeDays: 5, bestBy: expected, quantityPieces: 24, quantityPackages: 6, version: 1 });
    expect(res.body.publicCode).toMatch(/^[A-Za-z0-9_-]{24,}$/);
    expect(res.body.publicCode).not.toContain(res.body.lotCode);
  });

  test('when the made-on date is in the future, then it answers 400 naming madeOn', async () => {
    const { baker, recipe, lots } = await setUp();
    const res = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots, madeOn: '2999-01-01' });
    expect(res).toMatchObject({ status: 400, body: { error: { code: 'validation_failed', fieldErrors: { madeOn: expect.any(Array) } } } });
  });
});

describe('POST /api/batches: inputs', () => {
  test('when an ingredient has no lot chosen, then the batch is saved with a warning naming it', async () => {
    const { baker, recipe } = await setUp();
    const [flour, sugar] = recipe.ingredients;
    const res = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots: [{ ingredientId: flour!.ingredient.id, supplierLotId: flour!.lot.id }] });
    expect(res.status).toBe(201);
    expect(res.body.warnings).toEqual([{ code: 'no_supplier_lot', ingredientId: sugar!.ingredient.id, message: `No supplier lot recorded for ${sugar!.ingredient.labelName}.` }]);
    expect(res.body.current.inputs).toEqual(expect.arrayContaining([
      expect.objectContaining({ kind: 'ingredient', ingredientId: flour!.ingredient.id, supplierLotCode: flour!.lot.lotCode }),
      expect.objectContaining({ kind: 'ingredient', ingredientId: sugar!.ingredient.id, supplierLotId: null }),
    ]));
    const list = await baker.get('/api/batches');
    expect(list.body.items.find((i: { id: string }) => i.id === res.body.id)).toMatchObject({ warningCount: 1 });
  });

  test('when a lot belongs to another ingredient, then it answers 400 on that lot field', async () => {
    const { baker, recipe } = await setUp();
    const [flour, sugar] = recipe.ingredients;
    const res = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots: [{ ingredientId: flour!.ingredient.id, supplierLotId: sugar!.lot.id }] });
    expect(res).toMatchObject({ status: 400, body: { error: { fieldErrors: { 'lots.0.supplierLotId': expect.any(Array) } } } });
  });

  test('when a sub-recipe comes from another batch, then its ingredients need no lots and the input points at that batch', async () => {
    const { business, baker } = await setUp();
    const b = business.businessId;
    const butter = await createIngredient(t, b, { labelName: `Butter ${uniqueSuffix()}` });
    const icingSugar = await createIngredient(t, b, { labelName: `Icing sugar ${uniqueSuffix()}` });
    const cake = await createIngredient(t, b, { labelName: `Cake crumb ${uniqueSuffix()}` });
    const [butterLot, sugarLot, cakeLot] = await Promise.all([butter, icingSugar, cake].map((i) => createSupplierLot(t, b, { ingredientId: i.id })));
    const frosting = await createRecipeVersion(t, b, { name: `Frosting ${uniqueSuffix()}`, isSellable: false, components: [
      { kind: 'ingredient', ingredientId: butter.id, grams: '200' }, { kind: 'ingredient', ingredientId: icingSugar.id, grams: '400' },
    ] });
    const pops = await createRecipeVersion(t, b, { name: `Cake pops ${uniqueSuffix()}`, components: [
      { kind: 'ingredient', ingredientId: cake.id, grams: '500' }, { kind: 'recipe', recipeId: frosting.recipeId, grams: '150' },
    ] });

    const candidates = await baker.get(`/api/batches/lot-candidates?recipeVersionId=${pops.id}`);
    expect(candidates.status).toBe(200);
    expect(candidates.body.ingredients.map((i: { ingredientId: string }) => i.ingredientId).sort()).toEqual([cake.id, butter.id, icingSugar.id].sort());
    expect(candidates.body.subRecipes[0]).toMatchObject({ recipeId: frosting.recipeId, batches: [] });

    const frostingBatch = await baker.post('/api/batches').send({ recipeVersionId: frosting.id, lots: [
      { ingredientId: butter.id, supplierLotId: butterLot!.id }, { ingredientId: icingSugar.id, supplierLotId: sugarLot!.id },
    ] });
    expect(frostingBatch.status).toBe(201);
    const withBatch = await baker.post('/api/batches').send({ recipeVersionId: pops.id, lots: [{ ingredientId: cake.id, supplierLotId: cakeLot!.id }], subRecipeBatches: [{ recipeId: frosting.recipeId, sourceBatchId: frostingBatch.body.id }] });
    expect(withBatch.status).toBe(201);
    expect(withBatch.body.warnings).toEqual([]);
    expect(withBatch.body.current.inputs).toContainEqual({ kind: 'batch', subRecipeId: frosting.recipeId, subRecipeName: frosting.name, sourceBatchId: frostingBatch.body.id, sourceLotCode: frostingBatch.body.lotCode });

    const withoutBatch = await baker.post('/api/batches').send({ recipeVersionId: pops.id, lots: [{ ingredientId: cake.id, supplierLotId: cakeLot!.id }, { ingredientId: butter.id, supplierLotId: butterLot!.id }] });
    expect(withoutBatch.body.warnings.map((w: { ingredientId: string }) => w.ingredientId)).toEqual([icingSugar.id]);

    const again = await baker.get(`/api/batches/${withBatch.body.id}/lot-candidates`);
    expect(again.body.subRecipes[0].batches.map((x: { id: string }) => x.id)).toEqual([frostingBatch.body.id]);
  });
  test('when one sub-recipe comes from a batch, then an ingredient it shares with a fresh sub-recipe still needs its lot', async () => {
    const { business, baker } = await setUp();
    const b = business.businessId;
    const butter = await createIngredient(t, b, { labelName: `Butter ${uniqueSuffix()}` });
    const flour = await createIngredient(t, b, { labelName: `Flour ${uniqueSuffix()}` });
    const sugar = await createIngredient(t, b, { labelName: `Icing sugar ${uniqueSuffix()}` });
    const butterLot = await createSupplierLot(t, b, { ingredientId: butter.id });
    const sugarLot = await createSupplierLot(t, b, { ingredientId: sugar.id });
    const cakeBase = await createRecipeVersion(t, b, { isSellable: false, components: [{ kind: 'ingredient', ingredientId: flour.id, grams: '300' }, { kind: 'ingredient', ingredientId: butter.id, grams: '100' }] });
    const binder = await createRecipeVersion(t, b, { isSellable: false, components: [{ kind: 'ingredient', ingredientId: butter.id, grams: '50' }, { kind: 'ingredient', ingredientId: sugar.id, grams: '100' }] });
    const pops = await createRecipeVersion(t, b, { components: [{ kind: 'recipe', recipeId: cakeBase.recipeId, grams: '400' }, { kind: 'recipe', recipeId: binder.recipeId, grams: '150' }] });
    const base = await createBatch(t, b, { recipeVersionId: cakeBase.id });
    const withoutButter = await baker.post('/api/batches').send({ recipeVersionId: pops.id, lots: [{ ingredientId: sugar.id, supplierLotId: sugarLot.id }], subRecipeBatches: [{ recipeId: cakeBase.recipeId, sourceBatchId: base.id }] });
    expect(withoutButter.body.warnings.map((w: { ingredientId: string }) => w.ingredientId)).toEqual([butter.id]);
    const withButter = await baker.post('/api/batches').send({ recipeVersionId: pops.id, lots: [{ ingredientId: sugar.id, supplierLotId: sugarLot.id }, { ingredientId: butter.id, supplierLotId: butterLot.id }], subRecipeBatches: [{ recipeId: cakeBase.recipeId, sourceBatchId: base.id }] });
    expect(withButter.body.warnings).toEqual([]);
    // Flour comes only through the cake-base batch, so a lot for it is refused.
    const flourLot = await createSupplierLot(t, b, { ingredientId: flour.id });
    const extra = await baker.post('/api/batches').send({ recipeVersionId: pops.id, lots: [{ ingredientId: flour.id, supplierLotId: flourLot.id }], subRecipeBatches: [{ recipeId: cakeBase.recipeId, sourceBatchId: base.id }] });
    expect(extra).toMatchObject({ status: 400, body: { error: { fieldErrors: { 'lots.0.ingredientId': expect.any(Array) } } } });
  });

  test('recipe options list each recipe with its versions, newest first', async () => {
    const { business, helper, recipe } = await setUp();
    await createRecipeVersion(t, business.businessId, { recipeId: recipe.recipeVersion.recipeId, version: 2, name: recipe.recipeVersion.name, components: recipe.recipeVersion.components });
    const res = await helper.get('/api/batches/recipe-options');
    expect(res.status).toBe(200);
    const mine = res.body.recipes.find((r: { recipeId: string }) => r.recipeId === recipe.recipeVersion.recipeId);
    expect(mine.versions.map((v: { version: number }) => v.version)).toEqual([2, 1]);
  });
});

describe('POST /api/batches/:id/state', () => {
  test('when moves follow the allowed path, then each is recorded with who, when and why', async () => {
    const { baker, business, recipe, lots } = await setUp();
    const { body: batch } = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots });
    for (const toState of ['released', 'sold_out', 'recalled', 'discarded']) {
      const res = await baker.post(`/api/batches/${batch.id}/state`).send({ toState, reason: `Moving to ${toState}` });
      expect(res.status).toBe(200);
      expect(res.body.state).toBe(toState);
    }
    const detail = await baker.get(`/api/batches/${batch.id}`);
    expect(detail.body.stateHistory.map((s: { toState: string }) => s.toState)).toEqual(['in_progress', 'released', 'sold_out', 'recalled', 'discarded']);
    expect(detail.body.stateHistory[1]).toMatchObject({ fromState: 'in_progress', reason: 'Moving to released', changedByName: business.members.baker.displayName });
    expect(detail.body.allowedTransitions).toEqual([]);
    const events = await t.db.select().from(recordEvents).where(and(eq(recordEvents.entityId, batch.id), eq(recordEvents.action, 'state_change')));
    expect(events).toHaveLength(4);
    expect(await verifyBusinessChain(t.db, business.businessId)).toMatchObject({ ok: true });
  });

  test.each([
    ['sold_out', 'in_progress'],
    ['recalled', 'in_progress'],
    ['in_progress', 'in_progress'],
  ])('when moving to %s from %s, then it answers 409 and the state stays', async (toState, from) => {
    const { baker, recipe, lots } = await setUp();
    const { body: batch } = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots });
    const res = await baker.post(`/api/batches/${batch.id}/state`).send({ toState, reason: 'Trying a move' });
    expect(res).toMatchObject({ status: 409, body: { error: { code: 'conflict' } } });
    expect((await baker.get(`/api/batches/${batch.id}`)).body.state).toBe(from);
  });

  test('when the reason is missing, then it answers 400 naming reason', async () => {
    const { baker, recipe, lots } = await setUp();
    const { body: batch } = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots });
    const res = await baker.post(`/api/batches/${batch.id}/state`).send({ toState: 'held', reason: ' ' });
    expect(res).toMatchObject({ status: 400, body: { error: { fieldErrors: { reason: expect.any(Array) } } } });
  });

  test('when a registered release check objects, then release answers 409 listing it, and passes once it is cleared', async () => {
    const { baker, recipe, lots } = await setUp();
    const { body: batch } = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots });
    let blocked = true;
    const check: ReleaseCheck = async (_db, _businessId, batchId) =>
      blocked && batchId === batch.id ? [{ code: 'holding_violation', message: 'A holding time ran over with no action recorded.' }] : [];
    registerReleaseCheck(check);
    try {
      const refused = await baker.post(`/api/batches/${batch.id}/state`).send({ toState: 'released', reason: 'Cooled and packed' });
      expect(refused).toMatchObject({ status: 409, body: { error: { fieldErrors: { toState: ['A holding time ran over with no action recorded.'] } } } });
      expect(refused.body.error.message).toContain('A holding time ran over');
      const held = await baker.post(`/api/batches/${batch.id}/state`).send({ toState: 'held', reason: 'Waiting for the holding review' });
      expect(held.status).toBe(200);
      blocked = false;
      const released = await baker.post(`/api/batches/${batch.id}/state`).send({ toState: 'released', reason: 'Reviewed' });
      expect(released.body.state).toBe('released');
    } finally {
      unregisterReleaseCheck(check);
    }
  });
});

describe('POST /api/batches/:id/versions', () => {
  test('when a correction is saved, then it is a new version with its reason and the original stays unchanged', async () => {
    const { baker, recipe, lots } = await setUp();
    const { body: batch } = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots: [lots[0]], quantityPieces: 24, notes: 'First' });
    const res = await baker.post(`/api/batches/${batch.id}/versions`).send({ quantityPieces: 22, lots, reason: 'Two pops cracked when dipping' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ lotCode: batch.lotCode, recipeVersionId: batch.recipeVersionId, madeOn: batch.madeOn });
    expect(res.body.current).toMatchObject({ version: 2, quantityPieces: 22, notes: 'First', reason: 'Two pops cracked when dipping' });
    expect(res.body.warnings).toEqual([]);
    expect(res.body.versions.map((v: { version: number }) => v.version)).toEqual([2, 1]);
    expect(res.body.versions[1]).toMatchObject({ version: 1, quantityPieces: 24, reason: null });
    expect(res.body.versions[1].inputs.filter((i: { supplierLotId: string | null }) => i.supplierLotId === null)).toHaveLength(1);
    const [v1] = await t.db.select().from(batchVersions).where(and(eq(batchVersions.batchId, batch.id), eq(batchVersions.version, 1)));
    expect(v1!.quantityPieces).toBe(24);
  });

  test('when the reason is missing, then it answers 400 and no version is added', async () => {
    const { baker, recipe, lots } = await setUp();
    const { body: batch } = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots });
    const res = await baker.post(`/api/batches/${batch.id}/versions`).send({ quantityPieces: 3 });
    expect(res).toMatchObject({ status: 400, body: { error: { fieldErrors: { reason: expect.any(Array) } } } });
    expect(await t.db.select().from(batchVersions).where(eq(batchVersions.batchId, batch.id))).toHaveLength(1);
  });

  test('when the body tries to change the recipe version or lot code, then it answers 400', async () => {
    const { baker, recipe, lots } = await setUp();
    const { body: batch } = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots });
    const res = await baker.post(`/api/batches/${batch.id}/versions`).send({ reason: 'Changing recipe', recipeVersionId: recipe.recipeVersion.id });
    expect(res.status).toBe(400);
  });
});

describe('Idempotency-Key', () => {
  test('when one key is sent 3 times in a row and twice at once, then one batch exists and the answers match', async () => {
    const { owner, business, recipe, lots } = await setUp();
    const key = `create-${uniqueSuffix()}`;
    const body = { recipeVersionId: recipe.recipeVersion.id, madeOn: '2025-08-01', lots };
    const sequential: Awaited<ReturnType<typeof owner.get>>[] = [];
    for (let i = 0; i < 3; i++) sequential.push(await owner.post('/api/batches').set('Idempotency-Key', key).send(body));
    const concurrent = await Promise.all([1, 2].map(() => owner.post('/api/batches').set('Idempotency-Key', key).send(body)));
    const all = [...sequential, ...concurrent];
    expect(all.map((r) => r.status)).toEqual([201, 201, 201, 201, 201]);
    expect(new Set(all.map((r) => r.body.id)).size).toBe(1);
    expect(all.every((r) => r.body.lotCode === sequential[0]!.body.lotCode)).toBe(true);
    const rows = await t.db.select().from(batches).where(and(eq(batches.businessId, business.businessId), eq(batches.madeOn, '2025-08-01')));
    expect(rows).toHaveLength(1);
  });

  test('when two different keys race, then two batches are made', async () => {
    const { owner, recipe, lots } = await setUp();
    const body = { recipeVersionId: recipe.recipeVersion.id, madeOn: '2025-08-02', lots };
    const [a, b] = await Promise.all(['a', 'b'].map((k) => owner.post('/api/batches').set('Idempotency-Key', `${k}-${uniqueSuffix()}`).send(body)));
    expect(a!.body.id).not.toBe(b!.body.id);
  });

  test('when a key is reused with a different body, then it answers 422 and makes nothing', async () => {
    const { owner, business, recipe, lots } = await setUp();
    const key = `reuse-${uniqueSuffix()}`;
    await owner.post('/api/batches').set('Idempotency-Key', key).send({ recipeVersionId: recipe.recipeVersion.id, madeOn: '2025-08-03', lots });
    const res = await owner.post('/api/batches').set('Idempotency-Key', key).send({ recipeVersionId: recipe.recipeVersion.id, madeOn: '2025-08-04', lots });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/already used for a different request/);
    const rows = await t.db.select().from(batches).where(and(eq(batches.businessId, business.businessId), eq(batches.madeOn, '2025-08-04')));
    expect(rows).toHaveLength(0);
  });

  test('when a key used for a create is sent with a state change, then it answers 422', async () => {
    const { owner, recipe, lots } = await setUp();
    const key = `cross-${uniqueSuffix()}`;
    const { body: batch } = await owner.post('/api/batches').set('Idempotency-Key', key).send({ recipeVersionId: recipe.recipeVersion.id, lots });
    const res = await owner.post(`/api/batches/${batch.id}/state`).set('Idempotency-Key', key).send({ toState: 'released', reason: 'Packed' });
    expect(res.status).toBe(422);
    expect((await owner.get(`/api/batches/${batch.id}`)).body.state).toBe('in_progress');
  });

  test('when a state change is retried with its key, then only one change is recorded', async () => {
    const { owner, recipe, lots } = await setUp();
    const { body: batch } = await owner.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots });
    const key = `state-${uniqueSuffix()}`;
    const [r1, r2] = await Promise.all([1, 2].map(() => owner.post(`/api/batches/${batch.id}/state`).set('Idempotency-Key', key).send({ toState: 'released', reason: 'Packed' })));
    expect([r1!.status, r2!.status]).toEqual([200, 200]);
    expect(r2!.body.stateHistory).toHaveLength(2);
  });
});

describe('roles and businesses', () => {
  test('helpers read but may not write', async () => {
    const { baker, helper, recipe, lots } = await setUp();
    const { body: batch } = await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots });
    expect((await helper.get('/api/batches')).status).toBe(200);
    expect((await helper.get(`/api/batches/${batch.id}`)).status).toBe(200);
    expect((await helper.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, lots })).status).toBe(403);
    expect((await helper.post(`/api/batches/${batch.id}/state`).send({ toState: 'released', reason: 'Packed' })).status).toBe(403);
    expect((await helper.post(`/api/batches/${batch.id}/versions`).send({ reason: 'Fixing it' })).status).toBe(403);
  });

  test('another business sees 404 for the batch and cannot use its recipe version; its lots are refused', async () => {
    const a = await setUp();
    const { body: batch } = await a.baker.post('/api/batches').send({ recipeVersionId: a.recipe.recipeVersion.id, lots: a.lots });
    const other = await createTestBusiness(t);
    const outsider = await signedInAgent(t, other, 'owner');
    expect((await outsider.get(`/api/batches/${batch.id}`)).status).toBe(404);
    expect((await outsider.get(`/api/batches/${batch.id}/lot-candidates`)).status).toBe(404);
    expect((await outsider.post(`/api/batches/${batch.id}/state`).send({ toState: 'released', reason: 'Packed' })).status).toBe(404);
    expect((await outsider.post(`/api/batches/${batch.id}/versions`).send({ reason: 'Not mine' })).status).toBe(404);
    expect((await outsider.post('/api/batches').send({ recipeVersionId: a.recipe.recipeVersion.id })).status).toBe(404);
    expect((await outsider.get('/api/batches')).body.items).toEqual([]);

    const theirs = await createSimpleRecipe(t, other.businessId, ['Cocoa']);
    const res = await a.baker.post('/api/batches').send({ recipeVersionId: a.recipe.recipeVersion.id, lots: [{ ingredientId: a.lots[0]!.ingredientId, supplierLotId: theirs.ingredients[0]!.lot.id }] });
    expect(res.status).toBe(400);
    const sourceFromOther = await createBatch(t, other.businessId, { recipeVersionId: theirs.recipeVersion.id });
    const res2 = await a.baker.post('/api/batches').send({ recipeVersionId: a.recipe.recipeVersion.id, subRecipeBatches: [{ recipeId: theirs.recipeVersion.recipeId, sourceBatchId: sourceFromOther.id }] });
    expect(res2.status).toBe(400);
  });
});

describe('GET /api/batches', () => {
  test('filters by state, recipe and date range, and pages', async () => {
    const { baker, business, recipe, lots } = await setUp();
    const other = await createSimpleRecipe(t, business.businessId, ['Cocoa']);
    const made: { id: string }[] = [];
    for (const madeOn of ['2025-05-01', '2025-05-02', '2025-05-03']) {
      made.push((await baker.post('/api/batches').send({ recipeVersionId: recipe.recipeVersion.id, madeOn, lots })).body);
    }
    await baker.post('/api/batches').send({ recipeVersionId: other.recipeVersion.id, madeOn: '2025-05-02' });
    await baker.post(`/api/batches/${made[1].id}/state`).send({ toState: 'held', reason: 'Label check' });

    const held = await baker.get('/api/batches?state=held');
    expect(held.body.items.map((i: { id: string }) => i.id)).toEqual([made[1].id]);
    expect(held.body.items[0]).toMatchObject({ state: 'held', recipeName: recipe.recipeVersion.name, recipeVersion: 1, madeByName: business.members.baker.displayName });
    const byRecipe = await baker.get(`/api/batches?recipeId=${recipe.recipeVersion.recipeId}`);
    expect(byRecipe.body.total).toBe(3);
    const range = await baker.get('/api/batches?from=2025-05-02&to=2025-05-02');
    expect(range.body.total).toBe(2);
    const page2 = await baker.get('/api/batches?pageSize=2&page=2');
    expect(page2.body).toMatchObject({ page: 2, pageSize: 2, total: 4 });
    expect(page2.body.items).toHaveLength(2);
    expect(page2.body.items[1].madeOn).toBe('2025-05-01');
    expect((await baker.get('/api/batches?state=baked')).status).toBe(400);
  });

  test('the detail of a missing batch answers 404, a malformed id 400', async () => {
    const { baker } = await setUp();
    expect((await baker.get('/api/batches/00000000-0000-4000-8000-000000000000')).status).toBe(404);
    expect((await baker.get('/api/batches/not-an-id')).status).toBe(400);
  });
});
