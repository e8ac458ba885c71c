import { beforeAll, describe, expect, test } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { businessWithAgents, type ApiAgent } from '../support/agents';
import { uniqueSuffix } from '../support/db';
import { recordEvents } from '../../server/db/schema/record-events';
import { ingredientVersions } from '../../server/db/schema/ingredients';
import { loadIngredientDecls } from '../../server/features/ingredients/ingredients.queries';

const t = makeTestApp();
type Agents = Awaited<ReturnType<typeof businessWithAgents>>;
let a: Agents;
let other: Agents;

beforeAll(async () => {
  a = await businessWithAgents(t);
  other = await businessWithAgents(t);
});

// A compound ingredient: sub-ingredients in package order (21 CFR 101.4(b)(2)); milk and soy declared
// as major allergens (21 U.S.C. 321(qq)).
const coating = () => ({
  labelName: `White candy coating ${uniqueSuffix()}`,
  subIngredients: ['sugar', 'palm kernel oil', 'whey powder', 'nonfat milk', 'soy lecithin', 'vanilla'],
  allergens: [{ source: 'milk' }, { source: 'soy' }],
  allergensConfirmed: true,
  supplierName: 'Millbrook Baking Supply',
  supplierItemCode: 'WCC-25',
});

async function create(agent: ApiAgent, body: object = coating()) {
  const res = await agent.post('/api/ingredients').send(body);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body;
}

describe('POST /api/ingredients', () => {
  test('when a baker creates a compound ingredient, then it reads back with its order, allergens and one record event', async () => {
    const input = coating();
    const created = await create(a.baker, input);
    expect(created).toMatchObject({ version: 1, labelName: input.labelName, subIngredients: input.subIngredients, allergens: input.allergens, isVerified: false, needsTimeTemperatureControl: false });
    const read = await a.helper.get(`/api/ingredients/${created.id}`);
    expect(read.status).toBe(200);
    expect(read.body.versions).toHaveLength(1);
    expect(read.body.versions[0]).toMatchObject({ change: 'create', createdBy: { name: a.business.members.baker.displayName } });
    const events = await t.db.select().from(recordEvents).where(and(eq(recordEvents.entityId, created.id), eq(recordEvents.entityType, 'ingredient')));
    expect(events.map((e) => e.action)).toEqual(['create']);
  });

  test('when a tree nut has no kind, then it answers 400 naming allergens.0.kind (21 U.S.C. 343(w)(2))', async () => {
    const res = await a.owner.post('/api/ingredients').send({ labelName: 'Nut flour', allergens: [{ source: 'tree_nut' }] });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.fieldErrors['allergens.0.kind'][0]).toMatch(/tree nut/);
  });

  test('when the label name is blank or sulphites negative, then the field errors name those fields', async () => {
    const res = await a.owner.post('/api/ingredients').send({ labelName: '  ', sulphitesMgPerKg: -1 });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fieldErrors).sort()).toEqual(['labelName', 'sulphitesMgPerKg']);
  });

  test('when a helper creates one, then it answers 403 and nothing is written; anonymous gets 401', async () => {
    const input = coating();
    expect((await a.helper.post('/api/ingredients').send(input)).status).toBe(403);
    await a.anonymous.refreshCsrf();
    expect((await a.anonymous.post('/api/ingredients').send(input)).status).toBe(401);
    const rows = await t.db.select().from(ingredientVersions).where(eq(ingredientVersions.labelName, input.labelName));
    expect(rows).toHaveLength(0);
  });
});

describe('PATCH /api/ingredients/:id (edit = new version)', () => {
  test('when the reason is missing, then it answers 400 naming reason and no version is added', async () => {
    const created = await create(a.owner);
    const res = await a.owner.patch(`/api/ingredients/${created.id}`).send({ labelName: 'Renamed' });
    expect(res.status).toBe(400);
    expect(res.body.error.fieldErrors.reason).toBeDefined();
    expect(await t.db.select().from(ingredientVersions).where(eq(ingredientVersions.ingredientId, created.id))).toHaveLength(1);
  });

  test('when edited with a reason, then version 2 holds the change, version 1 is unchanged, and verification is cleared', async () => {
    const created = await create(a.owner);
    const verified = await a.baker.post(`/api/ingredients/${created.id}/verify`).send({});
    expect(verified.body).toMatchObject({ version: 2, isVerified: true, verifiedBy: { name: a.business.members.baker.displayName } });
    const edited = await a.owner.patch(`/api/ingredients/${created.id}`).send({ subIngredients: ['sugar', 'palm kernel oil', 'whey', 'soy lecithin'], reason: 'Supplier reformulated: nonfat milk removed' });
    expect(edited.status).toBe(200);
    expect(edited.body).toMatchObject({ version: 3, isVerified: false, subIngredients: ['sugar', 'palm kernel oil', 'whey', 'soy lecithin'] });
    expect(edited.body.versions.map((v: { change: string }) => v.change)).toEqual(['edit', 'verify', 'create']);
    expect(edited.body.versions[0].reason).toBe('Supplier reformulated: nonfat milk removed');
    const v1 = await a.owner.get(`/api/ingredients/${created.id}/versions`);
    expect(v1.body.items.at(-1).subIngredients).toContain('nonfat milk');
    const decls = await loadIngredientDecls(t.db, a.business.businessId, [created.id]);
    expect(decls.get(created.id)).toMatchObject({ subIngredients: ['sugar', 'palm kernel oil', 'whey', 'soy lecithin'], isVerified: false, allergensConfirmed: true });
  });

  test('when baseVersion is stale, then it answers 409', async () => {
    const created = await create(a.owner);
    await a.owner.patch(`/api/ingredients/${created.id}`).send({ notes: 'first', reason: 'note added' });
    const res = await a.baker.patch(`/api/ingredients/${created.id}`).send({ notes: 'second', reason: 'note changed', baseVersion: 1 });
    expect(res.status).toBe(409);
  });

  test('when archived, then it leaves the default list, shows with includeArchived, and a second archive is 409', async () => {
    const created = await create(a.owner);
    const res = await a.owner.post(`/api/ingredients/${created.id}/archive`).send({ reason: 'No longer stocked' });
    expect(res.body).toMatchObject({ isArchived: true, version: 2 });
    const list = await a.owner.get('/api/ingredients');
    expect(list.body.items.map((i: { id: string }) => i.id)).not.toContain(created.id);
    const all = await a.owner.get('/api/ingredients?includeArchived=true');
    expect(all.body.items.map((i: { id: string }) => i.id)).toContain(created.id);
    expect((await a.owner.post(`/api/ingredients/${created.id}/archive`).send({ reason: 'again' })).status).toBe(409);
  });

  test('when a helper edits, verifies or archives, then 403', async () => {
    const created = await create(a.owner);
    expect((await a.helper.patch(`/api/ingredients/${created.id}`).send({ notes: 'x', reason: 'helper try' })).status).toBe(403);
    expect((await a.helper.post(`/api/ingredients/${created.id}/verify`).send({})).status).toBe(403);
    expect((await a.helper.post(`/api/ingredients/${created.id}/archive`).send({ reason: 'helper try' })).status).toBe(403);
  });
});

describe('GET /api/ingredients', () => {
  test('search, allergen filter and status filters answer only matching current versions', async () => {
    const tag = uniqueSuffix();
    const almond = await create(a.owner, { labelName: `Blanched almond flour ${tag}`, subIngredients: [], allergens: [{ source: 'tree_nut', kind: 'almond' }] });
    // Cream cheese needs time/temperature control (FDA Food Code 2022 1-201.10 "TCS food"; value from memory).
    const cheese = await create(a.owner, { labelName: `Cream cheese ${tag}`, allergens: [{ source: 'milk' }], needsTimeTemperatureControl: true });
    const byText = await a.helper.get(`/api/ingredients?q=${encodeURIComponent(tag)}`);
    expect(byText.body.items.map((i: { id: string }) => i.id).sort()).toEqual([almond.id, cheese.id].sort());
    const nuts = await a.helper.get(`/api/ingredients?q=${tag}&allergen=tree_nut`);
    expect(nuts.body.items.map((i: { id: string }) => i.id)).toEqual([almond.id]);
    const tcs = await a.helper.get(`/api/ingredients?q=${tag}&status=tcs`);
    expect(tcs.body.items.map((i: { id: string }) => i.id)).toEqual([cheese.id]);
    expect((await a.helper.get('/api/ingredients?allergen=gluten')).status).toBe(400);
  });
});

describe('another business', () => {
  test('its ingredient ids answer 404 for read, edit, verify, versions, lots and files, and never appear in lists', async () => {
    const theirs = await create(other.owner);
    for (const res of [
      await a.owner.get(`/api/ingredients/${theirs.id}`),
      await a.owner.patch(`/api/ingredients/${theirs.id}`).send({ notes: 'x', reason: 'cross tenant' }),
      await a.owner.post(`/api/ingredients/${theirs.id}/verify`).send({}),
      await a.owner.get(`/api/ingredients/${theirs.id}/versions`),
      await a.owner.get(`/api/ingredients/${theirs.id}/lots`),
      await a.owner.post(`/api/ingredients/${theirs.id}/lots`).send({ lotCode: 'X1', receivedOn: '2026-01-01' }),
      await a.owner.get(`/api/ingredients/${theirs.id}/label-files`),
    ]) expect(res.status).toBe(404);
    const list = await a.owner.get(`/api/ingredients?q=${encodeURIComponent(theirs.labelName)}`);
    expect(list.body.items).toEqual([]);
    const versions = await t.db.select().from(ingredientVersions).where(eq(ingredientVersions.ingredientId, theirs.id));
    expect(versions).toHaveLength(1);
    expect((await loadIngredientDecls(t.db, a.business.businessId, [theirs.id])).size).toBe(0);
  });
});

describe('supplier lots and label re-checks', () => {
  test('a new lot needs a label re-check until someone records one, and shows who did', async () => {
    const created = await create(a.owner);
    const today = t.clock.now.toISOString().slice(0, 10);
    const lot = await a.baker.post(`/api/ingredients/${created.id}/lots`).send({ lotCode: 'L2611A', receivedOn: today, quantity: '2 × 5 lb' });
    expect(lot.status).toBe(201);
    expect(lot.body).toMatchObject({ lotCode: 'L2611A', needsLabelRecheck: true, labelChecks: [] });
    expect((await a.owner.get(`/api/ingredients/${created.id}`)).body.needsLabelRecheck).toBe(true);
    const pending = await a.helper.get('/api/supplier-lots?needsRecheck=true');
    expect(pending.body.items.map((l: { id: string }) => l.id)).toContain(lot.body.id);

    expect((await a.helper.post(`/api/supplier-lots/${lot.body.id}/label-checks`).send({ outcome: 'matches' })).status).toBe(403);
    const noNotes = await a.baker.post(`/api/supplier-lots/${lot.body.id}/label-checks`).send({ outcome: 'changed' });
    expect(noNotes.status).toBe(400);
    expect(noNotes.body.error.fieldErrors.notes).toBeDefined();

    const check = await a.baker.post(`/api/supplier-lots/${lot.body.id}/label-checks`).send({ outcome: 'matches', notes: 'Same panel as stored photo' });
    expect(check.status).toBe(201);
    expect(check.body).toMatchObject({ needsLabelRecheck: false, labelChecks: [{ outcome: 'matches', checkedBy: { name: a.business.members.baker.displayName } }] });
    expect((await a.owner.get(`/api/ingredients/${created.id}`)).body.needsLabelRecheck).toBe(false);
    const events = await t.db.select().from(recordEvents).where(eq(recordEvents.entityId, lot.body.id));
    expect(events.map((e) => e.action)).toEqual(['receive', 'label_check']);
  });

  test('a received date in the future or best-by before arrival answers 400 naming the field', async () => {
    const created = await create(a.owner);
    const future = await a.owner.post(`/api/ingredients/${created.id}/lots`).send({ lotCode: 'F1', receivedOn: '2999-01-01' });
    expect(future.status).toBe(400);
    expect(future.body.error.fieldErrors.receivedOn).toBeDefined();
    const early = await a.owner.post(`/api/ingredients/${created.id}/lots`).send({ lotCode: 'F2', receivedOn: '2026-01-10', bestBy: '2026-01-01' });
    expect(early.body.error.fieldErrors.bestBy).toBeDefined();
  });

  test("another business's lot answers 404 to a label check", async () => {
    const theirs = await create(other.owner);
    const lot = await other.owner.post(`/api/ingredients/${theirs.id}/lots`).send({ lotCode: 'T1', receivedOn: '2026-01-05' });
    expect((await a.owner.post(`/api/supplier-lots/${lot.body.id}/label-checks`).send({ outcome: 'matches' })).status).toBe(404);
  });
});
