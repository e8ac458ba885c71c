import { describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { ApiAgent, businessWithAgents, createTestBusiness, signedInAgent, type TestBusiness } from '../support/agents';
import { createBatch, createSimpleRecipe } from '../support/factories';
import { batches } from '../../server/db/schema/batches';
import { recordEvents } from '../../server/db/schema/record-events';
import { mailOutbox } from '../../server/db/schema/mail';
import { startHoldingPeriod } from '../../server/features/holding/holding.service';
import { runHoldingAlertScan } from '../../server/features/holding/holding-alerts';
import { hasUnresolvedHoldingViolation } from '../../server/features/holding/holding.queries';
import type { Actor } from '../../server/lib/actor';
import type { StartHoldingInput } from '../../shared/contracts/holding';

// The test clock: real time unless a test sets it (the DST case steps it while keeping sessions alive).
let fixedNow: Date | null = null;
const t = makeTestApp({ now: () => fixedNow ?? new Date() });

const MIN = 60_000;
const HOUR = 60 * MIN;
const PROCEDURE = {
  title: 'Cake pops out of the fridge',
  body: 'Cake pops taken out of the fridge at 41 °F or colder are marked with the time and thrown away 4 hours later if not sold.',
};

const actorOf = (b: TestBusiness, role: 'owner' | 'baker' | 'helper'): Actor => ({
  kind: 'member', businessId: b.businessId, userId: b.members[role].userId, name: b.members[role].displayName, role,
});

async function newBatch(businessId: string, holdingPolicy: string | null = null) {
  const { recipeVersion } = await createSimpleRecipe(t, businessId, ['Flour']);
  if (holdingPolicy) {
    const { createRecipeVersion } = await import('../support/factories');
    const v = await createRecipeVersion(t, businessId, { recipeId: recipeVersion.recipeId, version: 2, components: recipeVersion.components, holdingPolicy, name: 'Lemon cake pops' });
    return createBatch(t, businessId, { recipeVersionId: v.id });
  }
  return createBatch(t, businessId, { recipeVersionId: recipeVersion.id });
}

/** Starts a period as if `ago` ms before now (through the service, which takes the clock). */
async function startedAgo(b: TestBusiness, input: StartHoldingInput, ago: number) {
  return startHoldingPeriod(t.db, actorOf(b, 'baker'), input, undefined, new Date(Date.now() - ago));
}

async function withProcedure(owner: ApiAgent) {
  const res = await owner.post('/api/written-procedures').send(PROCEDURE);
  expect(res.status).toBe(201);
}

async function deviceAgent(owner: ApiAgent): Promise<ApiAgent> {
  const created = await owner.post('/api/devices').send({ name: 'Kitchen tablet' });
  expect(created.status).toBe(201);
  const tablet = new ApiAgent(t.app);
  await tablet.refreshCsrf();
  const enrolled = await tablet.post('/api/devices/enrol').send({ code: created.body.enrolmentCode });
  expect(enrolled.status).toBe(201);
  tablet.csrfToken = enrolled.body.csrfToken;
  return tablet;
}

describe('holding periods', () => {
  test('a helper starts a custom setting timer, adds a reading and stops it; times carry the zone offset', async () => {
    const { business, helper } = await businessWithAgents(t);
    const batch = await newBatch(business.businessId);
    const started = await helper.post('/api/holding-periods').set('Idempotency-Key', 'helper-start-0001').send({ batchId: batch.id, kind: 'setting', policy: 'custom', customLimitMinutes: 45 });
    expect(started.status).toBe(201);
    const p = started.body.period;
    expect(p).toMatchObject({ kind: 'setting', policy: 'custom', limitMinutes: 45, policySource: 'chosen', needsAction: false });
    expect(p.evaluation.status).toBe('within_limit');
    expect(p.evaluation.isFoodSafetyLimit).toBe(false);
    // Test businesses are in America/Chicago: −05:00 or −06:00 (U+2212 minus).
    expect(p.started.atLocal).toMatch(/ \u221206:00$| \u221205:00$/);
    expect(p.evaluation.deadlineAt).toBe(new Date(new Date(p.started.at).getTime() + 45 * MIN).toISOString());

    const reading = await helper.post(`/api/holding-periods/${p.id}/readings`).send({ value: '68.5', unit: 'F' });
    expect(reading.status).toBe(201);
    expect(reading.body.period.readings.map((r: { display: string }) => r.display)).toEqual(['68.5 °F (20.3 °C)']);

    const stopped = await helper.post(`/api/holding-periods/${p.id}/stop`).send({});
    expect(stopped.status).toBe(200);
    expect(stopped.body.period.evaluation.status).toBe('completed');
    expect(stopped.body.period.stopped.by).toBe(business.members.helper.displayName);
    expect((await helper.post(`/api/holding-periods/${p.id}/stop`).send({})).status).toBe(409);
    expect((await helper.post(`/api/holding-periods/${p.id}/readings`).send({ value: 70, unit: 'F' })).status).toBe(409);

    const running = await helper.get('/api/holding-periods?state=running');
    expect(running.body.periods.map((x: { id: string }) => x.id)).not.toContain(p.id);
    const all = await helper.get(`/api/holding-periods?state=all&batchId=${batch.id}`);
    expect(all.body.periods.map((x: { id: string }) => x.id)).toEqual([p.id]);
  });

  test('an enrolled kitchen device starts and stops a timer, recorded under the device name', async () => {
    const { business, owner } = await businessWithAgents(t);
    const tablet = await deviceAgent(owner);
    const batch = await newBatch(business.businessId);
    const started = await tablet.post('/api/holding-periods').send({ batchId: batch.id, kind: 'resting', policy: 'none' });
    expect(started.status).toBe(201);
    expect(started.body.period.started.by).toBe('Kitchen tablet');
    expect(started.body.period.evaluation.status).toBe('running');
    const stopped = await tablet.post(`/api/holding-periods/${started.body.period.id}/stop`).send({});
    expect(stopped.status).toBe(200);
    expect(stopped.body.period.stopped.by).toBe('Kitchen tablet');
    expect((await tablet.get('/api/kitchen-board')).status).toBe(200);
    expect((await tablet.get('/api/written-procedures')).status).toBe(403);
  });

  test('policies that need a temperature refuse to start without the first reading (400 naming the field)', async () => {
    const { business, owner, baker } = await businessWithAgents(t);
    await withProcedure(owner);
    const batch = await newBatch(business.businessId);
    for (const policy of ['tphc_4h', 'tphc_6h', 'cooling']) {
      const res = await baker.post('/api/holding-periods').send({ batchId: batch.id, kind: 'display', policy });
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
      expect(res.body.error.message).toContain('firstReading');
      expect(res.body.error.fieldErrors.firstReading).toHaveLength(1);
    }
    // FDA Food Code 2022 3-501.19(B)(1): 42 °F at removal is neither cold (≤ 41 °F) nor hot (≥ 135 °F).
    const warm = await baker.post('/api/holding-periods').send({ batchId: batch.id, kind: 'display', policy: 'tphc_4h', firstReading: { value: 42, unit: 'F' } });
    expect(warm.status).toBe(400);
    expect(warm.body.error.fieldErrors.firstReading[0]).toMatch(/42 °F/);
    // 3-501.19(C): the 6-hour option is for cold food only.
    const hot = await baker.post('/api/holding-periods').send({ batchId: batch.id, kind: 'display', policy: 'tphc_6h', firstReading: { value: 140, unit: 'F' } });
    expect(hot.status).toBe(400);
    const noUnit = await baker.post('/api/holding-periods').send({ batchId: batch.id, kind: 'display', policy: 'cooling', firstReading: { value: 140 } });
    expect(noUnit.status).toBe(400);
    expect(noUnit.body.error.fieldErrors['firstReading.unit']).toBeDefined();
  });

  test('TPHC is refused until the owner records the written procedure (FDA Food Code 3-501.19(A))', async () => {
    const { business, owner, baker, helper } = await businessWithAgents(t);
    const batch = await newBatch(business.businessId);
    const body = { batchId: batch.id, kind: 'display', policy: 'tphc_4h', firstReading: { value: 38, unit: 'F' } };
    const refused = await baker.post('/api/holding-periods').send(body);
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toMatch(/written procedure/);
    expect(refused.body.error.fieldErrors.policy).toBeDefined();

    expect((await helper.post('/api/written-procedures').send(PROCEDURE)).status).toBe(403);
    expect((await baker.post('/api/written-procedures').send(PROCEDURE)).status).toBe(403);
    expect((await owner.post('/api/written-procedures').send({ title: 'x', body: 'short' })).status).toBe(400);
    await withProcedure(owner);
    const list = await helper.get('/api/written-procedures');
    expect(list.body.current).toMatchObject({ version: 1, title: PROCEDURE.title });

    const ok = await baker.post('/api/holding-periods').send(body);
    expect(ok.status).toBe(201);
    expect(ok.body.period.limitMinutes).toBe(240);
    expect(ok.body.period.evaluation.deadlineAt).toBe(new Date(new Date(ok.body.period.started.at).getTime() + 4 * HOUR).toISOString());
  });

  test('the policy comes from the recipe version, else from the rule profile', async () => {
    const { business, owner, baker } = await businessWithAgents(t);
    await withProcedure(owner);
    const fromRecipe = await newBatch(business.businessId, 'cooling');
    const a = await baker.post('/api/holding-periods').send({ batchId: fromRecipe.id, kind: 'cooling', firstReading: { value: 60, unit: 'C' } });
    expect(a.status).toBe(201);
    expect(a.body.period).toMatchObject({ policy: 'cooling', policySource: 'recipe', limitMinutes: 360 });
    // Test businesses use the federal baseline profile, whose default is 3-501.19(B), 4 hours.
    const plain = await newBatch(business.businessId);
    const b = await baker.post('/api/holding-periods').send({ batchId: plain.id, kind: 'display', firstReading: { value: 4, unit: 'C' } });
    expect(b.status).toBe(201);
    expect(b.body.period).toMatchObject({ policy: 'tphc_4h', policySource: 'rule_profile' });
  });

  test('a reading above 70 °F (21 °C) on the 6-hour option requires a discard (3-501.19(C))', async () => {
    const { business, owner, baker } = await businessWithAgents(t);
    await withProcedure(owner);
    const batch = await newBatch(business.businessId);
    const start = await baker.post('/api/holding-periods').send({ batchId: batch.id, kind: 'display', policy: 'tphc_6h', firstReading: { value: 4, unit: 'C' } });
    expect(start.body.period.evaluation.status).toBe('within_limit');
    const warm = await baker.post(`/api/holding-periods/${start.body.period.id}/readings`).send({ value: '21.5', unit: 'C' });
    expect(warm.body.period.evaluation).toMatchObject({ status: 'over_limit', requiredAction: 'discard' });
    expect(warm.body.period.needsAction).toBe(true);
    const reason = await baker.post(`/api/holding-periods/${start.body.period.id}/actions`).send({ action: 'reason', reason: 'It still looked fine' });
    expect(reason.status).toBe(409);
    expect(reason.body.error.message).toMatch(/food-safety limit/);
    const reheat = await baker.post(`/api/holding-periods/${start.body.period.id}/actions`).send({ action: 'reheated' });
    expect(reheat.status).toBe(409);
  });

  test('release is blocked until the discard is recorded; the discard stops the timer and discards the batch', async () => {
    const { business, owner } = await businessWithAgents(t);
    await withProcedure(owner);
    const batch = await newBatch(business.businessId);
    const p = await startedAgo(business, { batchId: batch.id, kind: 'display', policy: 'tphc_4h', firstReading: { value: 38, unit: 'F' } }, 4 * HOUR + 10 * MIN);
    expect(await hasUnresolvedHoldingViolation(t.db, business.businessId, batch.id)).toBe(true);
    const release = await owner.post(`/api/batches/${batch.id}/state`).send({ toState: 'released', reason: 'Ready for the market' });
    expect(release.status).toBe(409);
    expect(release.body.error.message).toMatch(/went over its limit/);

    const action = await owner.post(`/api/holding-periods/${p.id}/actions`).set('Idempotency-Key', 'discard-key-0001').send({ action: 'discarded', reason: 'Binned at the end of the market' });
    expect(action.status).toBe(201);
    expect(action.body.period.needsAction).toBe(false);
    expect(action.body.period.stopped).not.toBeNull();
    expect(action.body.period.actions.map((a: { action: string }) => a.action)).toEqual(['discarded']);
    expect(await hasUnresolvedHoldingViolation(t.db, business.businessId, batch.id)).toBe(false);
    const [row] = await t.db.select({ state: batches.state }).from(batches).where(eq(batches.id, batch.id));
    expect(row!.state).toBe('discarded');
    // A retried tap answers the same result and records nothing twice.
    const retry = await owner.post(`/api/holding-periods/${p.id}/actions`).set('Idempotency-Key', 'discard-key-0001').send({ action: 'discarded', reason: 'Binned at the end of the market' });
    expect(retry.status).toBe(201);
    expect(retry.body.period.actions).toHaveLength(1);
    // The owner's alert was noticed once, as a record event.
    const notices = await t.db.select().from(recordEvents).where(eq(recordEvents.idempotencyKey, `holding-violation-notice:${p.id}`));
    expect(notices).toHaveLength(1);
    const mail = await t.db.select().from(mailOutbox).where(eq(mailOutbox.dedupeKey, `holding-violation:${p.id}:${business.members.owner.userId}`));
    expect(mail).toHaveLength(1);
    expect(mail[0]).toMatchObject({ toAddress: business.members.owner.email, kind: 'holding_alert' });
    expect(mail[0]!.textBody).toMatch(/Discard the food/);
  });

  test('a limit passed while nobody looks is noticed by the background scan and mailed to the owner once', async () => {
    const { business } = await businessWithAgents(t);
    const batch = await newBatch(business.businessId);
    // A custom 30-minute limit started 25 minutes ago: within its limit at start, so nothing is noticed yet.
    const p = await startedAgo(business, { batchId: batch.id, kind: 'setting', policy: 'custom', customLimitMinutes: 30 }, 25 * MIN);
    const outbox = () => t.db.select().from(mailOutbox).where(eq(mailOutbox.dedupeKey, `holding-violation:${p.id}:${business.members.owner.userId}`));
    expect(await outbox()).toHaveLength(0);
    const later = () => new Date(Date.now() + 10 * MIN);
    expect(await runHoldingAlertScan({ db: t.db, now: later })).toBeGreaterThanOrEqual(1);
    await runHoldingAlertScan({ db: t.db, now: later });
    expect(await outbox()).toHaveLength(1);
  });

  test('a failed first cooling stage may be reheated; then the batch can be released (3-501.14(A)(1))', async () => {
    const { business, owner, baker } = await businessWithAgents(t);
    const batch = await newBatch(business.businessId);
    const p = await startedAgo(business, { batchId: batch.id, kind: 'cooling', policy: 'cooling', firstReading: { value: 140, unit: 'F' } }, 2 * HOUR + 5 * MIN);
    const list = await baker.get(`/api/holding-periods?batchId=${batch.id}`);
    expect(list.body.periods[0].evaluation).toMatchObject({ status: 'over_limit', requiredAction: 'reheat_or_discard' });
    expect((await owner.post(`/api/batches/${batch.id}/state`).send({ toState: 'released', reason: 'Ready for the market' })).status).toBe(409);
    const reheat = await baker.post(`/api/holding-periods/${p.id}/actions`).send({ action: 'reheated', reason: 'Reheated to 165 °F and cooling started again' });
    expect(reheat.status).toBe(201);
    expect((await owner.post(`/api/batches/${batch.id}/state`).send({ toState: 'released', reason: 'Ready for the market' })).status).toBe(200);
  });

  test('a custom (quality) limit can be closed with a documented reason', async () => {
    const { business, owner, helper } = await businessWithAgents(t);
    const batch = await newBatch(business.businessId);
    const within = await helper.post('/api/holding-periods').send({ batchId: batch.id, kind: 'custom', label: 'Chocolate shell drying', policy: 'custom', customLimitMinutes: 60 });
    expect((await helper.post(`/api/holding-periods/${within.body.period.id}/actions`).send({ action: 'reason', reason: 'Nothing wrong yet' })).status).toBe(409);
    await helper.post(`/api/holding-periods/${within.body.period.id}/stop`).send({});

    const p = await startedAgo(business, { batchId: batch.id, kind: 'setting', policy: 'custom', customLimitMinutes: 30 }, 50 * MIN);
    expect(p.evaluation.requiredAction).toBe(null);
    const board = await helper.get('/api/kitchen-board');
    const timers = board.body.sections.find((s: { kind: string }) => s.kind === 'holding_timers');
    expect(timers.periods[0]).toMatchObject({ id: p.id, needsAction: true });
    expect(timers.periods[0].evaluation.requiredAction).toBe('record_reason');
    expect((await owner.post(`/api/batches/${batch.id}/state`).send({ toState: 'released', reason: 'Ready for the market' })).status).toBe(409);
    const tooShort = await helper.post(`/api/holding-periods/${p.id}/actions`).send({ action: 'reason', reason: 'ok' });
    expect(tooShort.status).toBe(400);
    expect(tooShort.body.error.fieldErrors.reason).toBeDefined();
    const closed = await helper.post(`/api/holding-periods/${p.id}/actions`).send({ action: 'reason', reason: 'Humid day; the coating set firm at 50 minutes' });
    expect(closed.status).toBe(201);
    expect(closed.body.period.needsAction).toBe(false);
    expect(closed.body.period.evaluation.messages.join(' ')).toMatch(/Reason: Humid day/);
    expect((await owner.post(`/api/batches/${batch.id}/state`).send({ toState: 'released', reason: 'Ready for the market' })).status).toBe(200);
  });

  test('Idempotency-Key: a retried start makes no duplicate; the same key with another body is refused', async () => {
    const { business, baker } = await businessWithAgents(t);
    const batch = await newBatch(business.businessId);
    const body = { batchId: batch.id, kind: 'resting', policy: 'custom', customLimitMinutes: 20 };
    const first = await baker.post('/api/holding-periods').set('Idempotency-Key', 'retry-start-0001').send(body);
    const second = await baker.post('/api/holding-periods').set('Idempotency-Key', 'retry-start-0001').send(body);
    expect(first.status).toBe(201);
    expect(second.status).toBe(201);
    expect(second.body.period.id).toBe(first.body.period.id);
    const other = await baker.post('/api/holding-periods').set('Idempotency-Key', 'retry-start-0001').send({ ...body, customLimitMinutes: 25 });
    expect(other.status).toBe(422);
    const id = first.body.period.id;
    const [r1, r2] = await Promise.all([0, 1].map(() => baker.post(`/api/holding-periods/${id}/readings`).set('Idempotency-Key', 'retry-reading-0001').send({ value: 70, unit: 'F' })));
    expect([r1!.status, r2!.status]).toEqual([201, 201]);
    const s1 = await baker.post(`/api/holding-periods/${id}/stop`).set('Idempotency-Key', 'retry-stop-0001').send({});
    const s2 = await baker.post(`/api/holding-periods/${id}/stop`).set('Idempotency-Key', 'retry-stop-0001').send({});
    expect([s1.status, s2.status]).toEqual([200, 200]);
    const all = await baker.get(`/api/holding-periods?state=all&batchId=${batch.id}`);
    expect(all.body.periods).toHaveLength(1);
    expect(all.body.periods[0].readings).toHaveLength(1);
  });

  test('roles, anonymous callers and another business', async () => {
    const a = await businessWithAgents(t);
    const other = await createTestBusiness(t);
    const intruder = await signedInAgent(t, other, 'owner');
    const batch = await newBatch(a.business.businessId);
    const started = await a.helper.post('/api/holding-periods').send({ batchId: batch.id, kind: 'resting', policy: 'none' });
    const id = started.body.period.id;
    expect((await a.anonymous.get('/api/kitchen-board')).status).toBe(401);
    expect((await a.anonymous.get('/api/holding-periods')).status).toBe(401);
    expect((await intruder.get(`/api/holding-periods/${id}`)).status).toBe(404);
    expect((await intruder.post(`/api/holding-periods/${id}/readings`).send({ value: 40, unit: 'F' })).status).toBe(404);
    expect((await intruder.post(`/api/holding-periods/${id}/stop`).send({})).status).toBe(404);
    expect((await intruder.post(`/api/holding-periods/${id}/actions`).send({ action: 'discarded' })).status).toBe(404);
    expect((await intruder.post('/api/holding-periods').send({ batchId: batch.id, kind: 'resting', policy: 'none' })).status).toBe(404);
    const theirs = await intruder.get('/api/holding-periods?state=all');
    expect(theirs.body.periods).toEqual([]);
    const board = await intruder.get('/api/kitchen-board');
    expect(board.body.sections.find((s: { kind: string }) => s.kind === 'holding_timers').periods).toEqual([]);
    expect((await a.helper.get('/api/holding-periods/not-a-uuid')).status).toBe(400);
  });

  test('kitchen board: over-limit first, then due soon, then within limit; batches in progress listed', async () => {
    const { business, owner, helper } = await businessWithAgents(t);
    await withProcedure(owner);
    const batch = await newBatch(business.businessId);
    const within = await startedAgo(business, { batchId: batch.id, kind: 'setting', policy: 'custom', customLimitMinutes: 120 }, 5 * MIN);
    const dueSoon = await startedAgo(business, { batchId: batch.id, kind: 'display', policy: 'tphc_4h', firstReading: { value: 38, unit: 'F' } }, 3 * HOUR + 40 * MIN);
    const over = await startedAgo(business, { batchId: batch.id, kind: 'display', policy: 'tphc_4h', firstReading: { value: 140, unit: 'F' } }, 4 * HOUR + 1 * MIN);
    const res = await helper.get('/api/kitchen-board');
    expect(res.status).toBe(200);
    expect(Math.abs(new Date(res.body.serverNow).getTime() - Date.now())).toBeLessThan(60_000);
    const timers = res.body.sections.find((s: { kind: string }) => s.kind === 'holding_timers');
    expect(timers.periods.map((p: { id: string }) => p.id)).toEqual([over.id, dueSoon.id, within.id]);
    expect(timers.periods.map((p: { evaluation: { status: string } }) => p.evaluation.status)).toEqual(['over_limit', 'due_soon', 'within_limit']);
    const inProgress = res.body.sections.find((s: { kind: string }) => s.kind === 'batches_in_progress');
    expect(inProgress.batches.map((b: { id: string }) => b.id)).toContain(batch.id);
  });

  test('DST: a period across the America/New_York spring-forward change has the exact duration and shows both offsets', async () => {
    const business = await createTestBusiness(t, { timeZone: 'America/New_York' });
    const owner = await signedInAgent(t, business, 'owner');
    await withProcedure(owner);
    const batch = await newBatch(business.businessId);
    try {
      // 2026-03-08 01:30 EST (−05:00) = 06:30Z; clocks jump from 02:00 to 03:00 local.
      fixedNow = new Date('2026-03-08T06:30:00Z');
      const agent = await signedInAgent(t, business, 'baker');
      const start = await agent.post('/api/holding-periods').send({ batchId: batch.id, kind: 'display', policy: 'tphc_4h', firstReading: { value: 40, unit: 'F' } });
      expect(start.status).toBe(201);
      const p = start.body.period;
      expect(p.started.atLocal).toBe('2026-03-08 01:30 \u221205:00');
      // 3-501.19(B): 4 hours of real time later is 06:30 on the new clocks (10:30Z), not 05:30.
      expect(p.evaluation.deadlineAt).toBe('2026-03-08T10:30:00.000Z');
      expect(p.evaluation.deadlineAtLocal).toBe('2026-03-08 06:30 \u221204:00');
      // Step the clock 3 hours in 15-minute steps (the member session idles out after 30 minutes).
      for (let i = 1; i <= 12; i += 1) {
        fixedNow = new Date(Date.parse('2026-03-08T06:30:00Z') + i * 15 * MIN);
        expect((await agent.get('/api/kitchen-board')).status).toBe(200);
      }
      const stop = await agent.post(`/api/holding-periods/${p.id}/stop`).send({});
      expect(stop.status).toBe(200);
      expect(stop.body.period.stopped.atLocal).toBe('2026-03-08 05:30 \u221204:00');
      // Wall clocks moved 4 hours (01:30 → 05:30); the food was out for exactly 3.
      expect(stop.body.period.evaluation.elapsedMs).toBe(3 * HOUR);
      expect(stop.body.period.evaluation.status).toBe('completed');
      expect(stop.body.period.started.at).toBe('2026-03-08T06:30:00.000Z');
    } finally {
      fixedNow = null;
    }
  });
});
