import { describe, expect, test } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { TEST_PASSWORD, businessWithAgents, enrolledDeviceAgent } from '../support/agents';
import { createBatch, createSimpleRecipe } from '../support/factories';
import { CHLORINE_FAIL, CHLORINE_PASS, cleaningSetup, completedRun } from '../support/cleaning';
import { cleaningSignatures, cleaningStepEntries } from '../../server/db/schema/cleaning';
import { recordEvents } from '../../server/db/schema/record-events';
import { SANITISER_CAUTIONS } from '../../shared/domain/sanitiser-checks';

const t = makeTestApp();

describe('equipment, sanitiser products and checklists', () => {
  test('owners and bakers edit; helpers and devices read; every change is a record event', async () => {
    const { business, owner, baker, helper } = await businessWithAgents(t);
    const { equipmentId, templateId } = await cleaningSetup(baker);
    expect((await helper.post('/api/equipment').send({ name: 'Sheet pan', kind: 'utensil', isFoodContact: true })).status).toBe(403);
    expect((await helper.patch(`/api/cleaning-templates/${templateId}`).send({ archived: true })).status).toBe(403);
    expect((await helper.post('/api/sanitiser-products').send({ name: 'X', sanitiser: 'label_product', labelMinPpm: 1, labelMaxPpm: 2 })).status).toBe(403);
    const device = (await enrolledDeviceAgent(t, owner)).agent;
    const list = await device.get('/api/equipment');
    expect(list.status).toBe(200);
    expect(list.body).toEqual([{ id: equipmentId, name: 'Stand mixer bowl', kind: 'utensil', isFoodContact: true, location: 'Counter by the window', archived: false }]);

    const tpl = (await helper.get('/api/cleaning-templates')).body;
    expect(tpl[0].steps).toEqual([
      { key: 's1', kind: 'wash', label: 'Wash' }, { key: 's2', kind: 'rinse', label: 'Rinse' },
      { key: 's3', kind: 'sanitise', label: 'Sanitise' }, { key: 's4', kind: 'air_dry', label: 'Air-dry' },
    ]);
    // A custom step needs a name; the contract's message reaches the field.
    const bad = await owner.post('/api/cleaning-templates').send({ name: 'Moulds', frequency: 'per_batch', steps: [{ kind: 'custom' }] });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fieldErrors['steps.0.label']).toEqual(['Name the step']);

    const archived = await owner.patch(`/api/equipment/${equipmentId}`).send({ archived: true });
    expect(archived.body.archived).toBe(true);
    expect((await helper.get('/api/equipment')).body).toEqual([]);
    expect((await helper.get('/api/equipment?includeArchived=true')).body).toHaveLength(1);

    const range = await owner.post('/api/sanitiser-products').send({ name: 'Bad range', sanitiser: 'label_product', labelMinPpm: 400, labelMaxPpm: 200 });
    expect(range.status).toBe(400);
    expect(range.body.error.fieldErrors.labelMaxPpm).toBeDefined();

    const events = await t.db.select().from(recordEvents).where(and(eq(recordEvents.businessId, business.businessId), eq(recordEvents.entityId, equipmentId)));
    expect(events.map((e) => e.action)).toEqual(['create', 'archive']);
  });

  test('another business\u2019s equipment, checklists and products answer 404', async () => {
    const a = await businessWithAgents(t);
    const b = await businessWithAgents(t);
    const { equipmentId, templateId } = await cleaningSetup(a.owner);
    const product = await a.owner.post('/api/sanitiser-products').send({ name: 'Quat tabs', sanitiser: 'quaternary_ammonium', labelMinPpm: 200, labelMaxPpm: 400 });
    expect((await b.owner.patch(`/api/equipment/${equipmentId}`).send({ name: 'Mine now' })).status).toBe(404);
    expect((await b.owner.patch(`/api/cleaning-templates/${templateId}`).send({ archived: true })).status).toBe(404);
    expect((await b.owner.patch(`/api/sanitiser-products/${product.body.id}`).send({ archived: true })).status).toBe(404);
    expect((await b.owner.post('/api/cleaning-templates').send({ name: 'X', frequency: 'daily', steps: [{ kind: 'wash' }], equipmentIds: [equipmentId] })).status).toBe(400);
    expect((await b.owner.post('/api/cleaning-runs').send({ templateId })).status).toBe(404);
    expect((await b.owner.get('/api/equipment')).body).toEqual([]);
  });
});

describe('cleaning runs and sanitiser checks', () => {
  test('a helper records steps; a failed chlorine check is stored with its problems and must be redone before signing', async () => {
    const { owner, helper } = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(owner);
    const started = await helper.post('/api/cleaning-runs').send({ templateId, notes: 'Closing down' });
    expect(started.status).toBe(201);
    const run = started.body;
    expect(run).toMatchObject({ templateName: 'Close of day', frequency: 'daily', status: 'in_progress', currentVersion: 1, batchId: null });
    expect(run.started.atLocal).toMatch(/ (\u2212|\+)\d\d:\d\d$/);
    const id = run.id;
    await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's1' });
    await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's2' });
    // Sanitising needs its measurements; other steps refuse them.
    const missing = await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's3' });
    expect(missing.status).toBe(400);
    expect(missing.body.error.fieldErrors.sanitising).toBeDefined();
    expect((await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's1', sanitising: CHLORINE_PASS })).status).toBe(400);
    expect((await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's9' })).status).toBe(400);

    // "chlorine 50 ppm, 80 °F, pH 9" fails: 4-501.114(A) needs 100 °F at pH ≤ 10 for 50–99 mg/L.
    const failed = await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's3', sanitising: CHLORINE_FAIL });
    expect(failed.status).toBe(201);
    const failedEntry = failed.body.versions[0].entries.at(-1);
    expect(failedEntry.sanitising).toMatchObject({ sanitiser: 'chlorine', concentrationPpm: '50.00', ph: '9.00', passed: false });
    expect(failedEntry.sanitising.waterTemperature.display).toBe('80 °F (26.7 °C)');
    expect(failedEntry.sanitising.problems.map((p: { field: string }) => p.field)).toEqual(['waterTemperature']);
    const [row] = await t.db.select().from(cleaningStepEntries).where(eq(cleaningStepEntries.id, failedEntry.id));
    expect(row).toMatchObject({ checkPassed: false, sanitiser: 'chlorine', temperatureValue: '80.00', temperatureUnit: 'F' });
    await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's4' });

    const blocked = await helper.get(`/api/cleaning-runs/${id}`);
    expect(blocked.body.status).toBe('in_progress');
    expect(blocked.body.blockers).toEqual(['Sanitise failed its check: redo it, or give the reason it was accepted.']);
    const refused = await helper.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD });
    expect(refused.status).toBe(409);
    expect(await t.db.select().from(cleaningSignatures).where(eq(cleaningSignatures.runId, id))).toEqual([]);

    // Redone with a fresh solution: "chlorine 50 ppm, 80 °F, pH 7.5, 8 s" passes (4-501.114(A), 4-703.11(C)).
    const redone = await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's3', sanitising: CHLORINE_PASS, note: 'Fresh solution' });
    expect(redone.body.status).toBe('ready_to_sign');
    expect(redone.body.versions[0].entries.filter((e: { stepKey: string }) => e.stepKey === 's3').map((e: { sanitising: { passed: boolean } }) => e.sanitising.passed)).toEqual([false, true]);
    const signed = await helper.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD });
    expect(signed.status).toBe(201);
    expect(signed.body.status).toBe('signed');
  });

  test('a failed check can be explained instead, at the time or afterwards; explaining a pass is refused', async () => {
    const { owner, baker } = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(owner);
    const id = (await baker.post('/api/cleaning-runs').send({ templateId })).body.id;
    for (const k of ['s1', 's2', 's4']) await baker.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: k });
    const failed = await baker.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's3', sanitising: { ...CHLORINE_FAIL, concentrationPpm: 250 } });
    const entry = failed.body.versions[0].entries.at(-1);
    // 250 ppm is over the 200 ppm no-rinse limit (40 CFR 180.940, value from memory): too strong fails too.
    expect(entry.sanitising.problems.map((p: { field: string }) => p.field)).toContain('concentrationPpm');
    expect((await baker.post(`/api/cleaning-runs/${id}/steps`).send({ explainsEntryId: entry.id, reason: 'no' })).status).toBe(400);
    const explained = await baker.post(`/api/cleaning-runs/${id}/steps`).send({ explainsEntryId: entry.id, reason: 'Bowl re-washed and sanitised in the dishwasher\u2019s hot cycle instead' });
    expect(explained.status).toBe(201);
    expect(explained.body.status).toBe('ready_to_sign');

    const id2 = (await baker.post('/api/cleaning-runs').send({ templateId })).body.id;
    for (const k of ['s1', 's2', 's4']) await baker.post(`/api/cleaning-runs/${id2}/steps`).send({ stepKey: k });
    const withReason = await baker.post(`/api/cleaning-runs/${id2}/steps`).send({ stepKey: 's3', sanitising: CHLORINE_FAIL, failureReason: 'Only the outside of the mixer was wiped; no food contact today' });
    expect(withReason.body.status).toBe('ready_to_sign');
    expect(withReason.body.versions[0].entries.at(-1).failureReason).toMatch(/outside of the mixer/);
    const passEntry = (await baker.post(`/api/cleaning-runs/${id2}/steps`).send({ stepKey: 's3', sanitising: CHLORINE_PASS })).body.versions[0].entries.at(-1);
    expect((await baker.post(`/api/cleaning-runs/${id2}/steps`).send({ explainsEntryId: passEntry.id, reason: 'Nothing to explain here' })).status).toBe(400);
  });

  test.each([
    // "quat, 70 °F" fails: quaternary ammonium needs at least 75 °F (24 °C), 4-501.114(C).
    ['quaternary_ammonium at 70 °F', { sanitiser: 'quaternary_ammonium', concentrationPpm: 300, waterTemperature: { value: 70, unit: 'F' }, hardnessPpm: 200, contactSeconds: 60 }, false, ['waterTemperature']],
    ['quaternary_ammonium at 75 °F', { sanitiser: 'quaternary_ammonium', concentrationPpm: 300, waterTemperature: { value: 75, unit: 'F' }, hardnessPpm: 200, contactSeconds: 60 }, true, []],
    // "iodine 30 ppm" fails: over the 12.5–25 mg/L range, 4-501.114(B).
    ['iodine 30 ppm', { sanitiser: 'iodine', concentrationPpm: 30, waterTemperature: { value: 75, unit: 'F' }, ph: 4, contactSeconds: 30 }, false, ['concentrationPpm']],
    // Hot water: 171 °F for 30 s passes, 4-501.111 and 4-703.11(A).
    ['hot water 171 °F 30 s', { sanitiser: 'hot_water', waterTemperature: { value: 171, unit: 'F' }, contactSeconds: 30 }, true, []],
    ['hot water 165 °F', { sanitiser: 'hot_water', waterTemperature: { value: 165, unit: 'F' }, contactSeconds: 30 }, false, ['waterTemperature']],
  ])('%s: stored with the verdict of the shared check', async (_name, sanitising, passed, fields) => {
    const { owner, helper } = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(owner);
    // Quaternary ammonium is checked against its label: an invented product labelled 200–400 ppm.
    const quat = await owner.post('/api/sanitiser-products').send({ name: 'Quat tablets', sanitiser: 'quaternary_ammonium', labelMinPpm: 200, labelMaxPpm: 400, labelContactSeconds: 60 });
    const id = (await helper.post('/api/cleaning-runs').send({ templateId })).body.id;
    const body = sanitising.sanitiser === 'quaternary_ammonium' ? { ...sanitising, productId: quat.body.id } : sanitising;
    const res = await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's3', sanitising: body });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    const entry = res.body.versions[0].entries.at(-1);
    expect(entry.sanitising.passed).toBe(passed);
    expect(entry.sanitising.problems.map((p: { field: string }) => p.field)).toEqual(fields);
    const [row] = await t.db.select().from(cleaningStepEntries).where(eq(cleaningStepEntries.id, entry.id));
    expect(row!.checkPassed).toBe(passed);
  });

  test('a product is checked against its own label range: too weak and too strong both fail; quat needs its product', async () => {
    const { owner, helper } = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(owner);
    // An invented label: 150–400 ppm, 60 s contact.
    const product = (await owner.post('/api/sanitiser-products').send({ name: 'Juniper no-rinse', sanitiser: 'label_product', labelMinPpm: 150, labelMaxPpm: 400, labelContactSeconds: 60 })).body;
    const id = (await helper.post('/api/cleaning-runs').send({ templateId })).body.id;
    const verdict = async (ppm: number) => {
      const res = await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's3', sanitising: { sanitiser: 'label_product', productId: product.id, concentrationPpm: ppm, contactSeconds: 60 } });
      return res.body.versions[0].entries.at(-1).sanitising.passed;
    };
    expect([await verdict(149), await verdict(150), await verdict(400), await verdict(401)]).toEqual([false, true, true, false]);
    const noProduct = await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's3', sanitising: { sanitiser: 'quaternary_ammonium', concentrationPpm: 300 } });
    expect(noProduct.status).toBe(400);
    expect(noProduct.body.error.fieldErrors['sanitising.productId']).toBeDefined();
    const mismatch = await helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's3', sanitising: { sanitiser: 'iodine', productId: product.id, concentrationPpm: 20 } });
    expect(mismatch.status).toBe(400);
  });

  test('per-batch runs list by batch; a template change leaves started runs alone', async () => {
    const a = await businessWithAgents(t);
    const b = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(a.owner, 'per_batch');
    const { recipeVersion } = await createSimpleRecipe(t, a.business.businessId);
    const batch = await createBatch(t, a.business.businessId, { recipeVersionId: recipeVersion.id });
    const otherRecipe = await createSimpleRecipe(t, b.business.businessId);
    const otherBatch = await createBatch(t, b.business.businessId, { recipeVersionId: otherRecipe.recipeVersion.id });
    expect((await a.helper.post('/api/cleaning-runs').send({ templateId, batchId: otherBatch.id })).status).toBe(404);
    const id = await completedRun(a.helper, templateId, { batchId: batch.id });
    await a.owner.patch(`/api/cleaning-templates/${templateId}`).send({ steps: [{ kind: 'wash' }] });
    const byBatch = await a.helper.get(`/api/cleaning-runs?batchId=${batch.id}`);
    expect(byBatch.body.runs.map((r: { id: string }) => r.id)).toEqual([id]);
    expect(byBatch.body.runs[0].batchLotCode).toBe(batch.lotCode);
    expect(byBatch.body.runs[0].steps).toHaveLength(4);
    const today = await a.helper.get('/api/cleaning-runs');
    expect(today.body.runs.map((r: { id: string }) => r.id)).toEqual([id]);
    expect((await b.helper.get(`/api/cleaning-runs?batchId=${batch.id}`)).body.runs).toEqual([]);
  });

  test('another business\u2019s run answers 404 for read, step, sign and correct, and stays unchanged', async () => {
    const a = await businessWithAgents(t);
    const b = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(a.owner);
    const id = await completedRun(a.helper, templateId);
    expect((await b.owner.get(`/api/cleaning-runs/${id}`)).status).toBe(404);
    expect((await b.helper.post(`/api/cleaning-runs/${id}/steps`).send({ stepKey: 's1' })).status).toBe(404);
    expect((await b.helper.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD })).status).toBe(404);
    expect((await b.owner.post(`/api/cleaning-runs/${id}/corrections`).send({ reason: 'Trying to change it' })).status).toBe(404);
    const run = (await a.owner.get(`/api/cleaning-runs/${id}`)).body;
    expect(run.versions[0].entries).toHaveLength(4);
    expect(run.versions[0].signature).toBeNull();
    expect((await b.owner.get('/api/cleaning-runs')).body.runs).toEqual([]);
  });

  test('idempotent retries: a step or a signature sent twice with one key is recorded once; a reused key with another body is refused', async () => {
    const { business, owner, helper } = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(owner);
    const id = (await helper.post('/api/cleaning-runs').set('Idempotency-Key', 'start-run-0001').send({ templateId })).body.id;
    const again = await helper.post('/api/cleaning-runs').set('Idempotency-Key', 'start-run-0001').send({ templateId });
    expect(again.body.id).toBe(id);
    const step = () => helper.post(`/api/cleaning-runs/${id}/steps`).set('Idempotency-Key', 'step-wash-0001').send({ stepKey: 's1' });
    const [r1, r2] = await Promise.all([step(), step()]);
    expect([r1.status, r2.status]).toEqual([201, 201]);
    const r3 = await step();
    expect(r3.body.versions[0].entries).toHaveLength(1);
    const other = await helper.post(`/api/cleaning-runs/${id}/steps`).set('Idempotency-Key', 'step-wash-0001').send({ stepKey: 's2' });
    expect(other.status).toBe(422);
    for (const s of [{ stepKey: 's2' }, { stepKey: 's3', sanitising: CHLORINE_PASS }, { stepKey: 's4' }]) await helper.post(`/api/cleaning-runs/${id}/steps`).send(s);
    const sign = () => helper.post(`/api/cleaning-runs/${id}/signatures`).set('Idempotency-Key', 'sign-run-00001').send({ password: TEST_PASSWORD });
    const s1 = await sign();
    const s2 = await sign();
    expect([s1.status, s2.status]).toEqual([201, 201]);
    expect(s2.body.versions[0].signature.id).toBe(s1.body.versions[0].signature.id);
    expect(await t.db.select().from(cleaningSignatures).where(eq(cleaningSignatures.runId, id))).toHaveLength(1);
    const signEvents = await t.db.select().from(recordEvents).where(and(eq(recordEvents.businessId, business.businessId), eq(recordEvents.entityId, id), eq(recordEvents.action, 'sign')));
    expect(signEvents).toHaveLength(1);
    // The journal keeps no password, not even hashed with the request.
    expect(JSON.stringify(signEvents[0]!.payload)).not.toContain(TEST_PASSWORD);
  });

  test('a kitchen device records steps and signs with the chosen person\u2019s own password; the signature names the person', async () => {
    const { business, owner } = await businessWithAgents(t);
    const { templateId } = await cleaningSetup(owner);
    const { agent: tablet } = await enrolledDeviceAgent(t, owner, 'Prep tablet');
    const id = await completedRun(tablet, templateId);
    const signers = (await tablet.get('/api/cleaning-runs/signers')).body.signers;
    expect(signers.map((s: { userId: string }) => s.userId).sort()).toEqual(Object.values(business.members).map((m) => m.userId).sort());
    expect((await tablet.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD })).status).toBe(400);
    const signed = await tablet.post(`/api/cleaning-runs/${id}/signatures`).send({ password: TEST_PASSWORD, signerUserId: business.members.helper.userId });
    expect(signed.status).toBe(201);
    expect(signed.body.versions[0].signature).toMatchObject({ printedName: business.members.helper.displayName, deviceName: 'Prep tablet', meaning: 'Cleaned and sanitised', validity: 'valid' });
    // Devices record and sign but do not correct: a correction is a person's decision.
    expect((await tablet.post(`/api/cleaning-runs/${id}/corrections`).send({ reason: 'Tablet tries to correct' })).status).toBe(403);
  });

  test('cautions come from the shared sanitiser module; the Kitchen board shows food-contact surfaces due every 4 hours', async () => {
    expect(SANITISER_CAUTIONS.join(' ')).toMatch(/Never mix/);
    const { business, owner, helper } = await businessWithAgents(t);
    const { templateId, equipmentId } = await cleaningSetup(owner);
    await owner.post('/api/equipment').send({ name: 'Shelf label', kind: 'other', isFoodContact: false });
    // In use: a batch made today and still in progress; no cleaning yet → overdue (FDA Food Code 2022 4-602.11(C)).
    const { recipeVersion } = await createSimpleRecipe(t, business.businessId);
    await createBatch(t, business.businessId, { recipeVersionId: recipeVersion.id });
    const due = await helper.get('/api/cleaning-runs/due');
    expect(due.body.dailyTemplatesNotStarted.map((x: { id: string }) => x.id)).toEqual([templateId]);
    expect(due.body.equipment).toEqual([expect.objectContaining({ equipmentId, status: 'overdue' })]);
    const board = await helper.get('/api/kitchen-board');
    const section = board.body.sections.find((s: { kind: string }) => s.kind === 'cleanings_due');
    expect(section.items).toEqual([expect.objectContaining({ id: equipmentId, title: 'Clean and sanitise: Stand mixer bowl', isOverdue: true })]);

    await completedRun(helper, templateId);
    const after = await helper.get('/api/cleaning-runs/due');
    expect(after.body.dailyTemplatesNotStarted).toEqual([]);
    expect(after.body.equipment[0].status).toBe('ok');
    // Next due 4 hours after the passed sanitising step.
    const sanitisedAt = (await helper.get('/api/cleaning-runs')).body.runs[0].versions[0].entries.find((e: { stepKey: string }) => e.stepKey === 's3').at;
    expect(after.body.equipment[0].nextDueAt).toBe(new Date(new Date(sanitisedAt).getTime() + 4 * 3_600_000).toISOString());
    const boardAfter = await helper.get('/api/kitchen-board');
    expect(boardAfter.body.sections.find((s: { kind: string }) => s.kind === 'cleanings_due')).toBeUndefined();
  });
});
