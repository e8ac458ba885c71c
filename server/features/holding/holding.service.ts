import { onceForIdempotencyKey } from '../records/idempotent-write';
import { createHash } from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import type { Actor } from '../../lib/actor';
import { HttpError, badRequest, conflict, notFound } from '../../lib/http-error';
import { appendRecordEvent } from '../records/record-events.service';
import { holdingActions, holdingPeriods, holdingReadings, holdingStops, writtenProcedures } from '../../db/schema/holding';
import { evaluateHolding, type HoldingPolicy } from '../../../shared/domain/holding-policies';
import {
  actionsAllowedFor,
  holdingLimitMinutes,
  normalizeHoldingPolicy,
  policyNeedsFirstReading,
  policyNeedsWrittenProcedure,
} from '../../../shared/domain/holding-rules';
import { getRuleProfile } from '../../../shared/domain/rule-profiles';
import {
  AddReadingInputSchema,
  RecordHoldingActionInputSchema,
  StartHoldingInputSchema,
  StopHoldingInputSchema,
  WrittenProcedureInputSchema,
  type AddReadingInput,
  type HoldingPeriod,
  type HoldingPeriodList,
  type HoldingListQuery,
  type RecordHoldingActionInput,
  type StartHoldingInput,
  type StopHoldingInput,
  type WrittenProcedureInput,
  type WrittenProcedureList,
} from '../../../shared/contracts/holding';
import { businessTimeZone, currentWrittenProcedure, findBatchForHolding, loadHoldingPeriods, toWrittenProcedureView } from './holding.queries';
import { noticeHoldingViolations } from './holding-alerts';
import { discardBatchForHolding } from './batch-link';

const ENTITY = 'holding_period';
// Batches in these states are finished with; nothing more happens to them in the kitchen.
const CLOSED_BATCH_STATES = ['discarded', 'recalled', 'sold_out'];

const whoFields = (actor: Actor) => ({ userId: actor.userId, name: actor.name, role: String(actor.role) });

function requestHash(operation: string, body: unknown): string {
  return createHash('sha256').update(JSON.stringify([operation, body ?? null])).digest('hex');
}

/** Runs `write` once per Idempotency-Key (see onceForIdempotencyKey). */
const onceForKey = (db: Db, actor: Actor, key: string | undefined, hash: string, write: () => Promise<string>) =>
  onceForIdempotencyKey(db, actor.businessId, key, ENTITY, hash, write);

async function onePeriod(db: DbOrTx, businessId: string, id: string, now: Date): Promise<HoldingPeriod> {
  const [p] = await loadHoldingPeriods(db, businessId, { periodIds: [id] }, now);
  if (!p) throw notFound('That holding period');
  return p;
}

async function findPeriodRow(db: DbOrTx, businessId: string, id: string) {
  const [row] = await db.select().from(holdingPeriods).where(and(eq(holdingPeriods.id, id), eq(holdingPeriods.businessId, businessId)));
  if (!row) throw notFound('That holding period');
  const [stop] = await db.select().from(holdingStops).where(eq(holdingStops.periodId, id));
  return { row, stop };
}

/** Lists periods: running ones (default) or all, optionally for one batch; most urgent first. */
export async function listHoldingPeriods(db: Db, actor: Actor, query: HoldingListQuery, now: Date): Promise<HoldingPeriodList> {
  // Reads never write: limits passed while nobody acts are noticed by the background scan (runHoldingAlertScan).
  const periods = await loadHoldingPeriods(db, actor.businessId, { batchId: query.batchId, runningOnly: query.state !== 'all' }, now);
  return { periods, serverNow: now.toISOString() };
}

export async function getHoldingPeriod(db: Db, actor: Actor, id: string, now: Date): Promise<HoldingPeriod> {
  return onePeriod(db, actor.businessId, id, now);
}

interface ResolvedPolicy {
  policy: HoldingPolicy;
  customLimitMinutes: number | null;
  source: 'recipe' | 'rule_profile' | 'chosen';
}

function resolvePolicy(input: { policy?: HoldingPolicy; customLimitMinutes?: number }, recipePolicy: string | null, ruleProfileId: string): ResolvedPolicy {
  if (input.policy) return { policy: input.policy, customLimitMinutes: input.customLimitMinutes ?? null, source: 'chosen' };
  const fromRecipe = normalizeHoldingPolicy(recipePolicy);
  if (fromRecipe) return { policy: fromRecipe, customLimitMinutes: input.customLimitMinutes ?? null, source: 'recipe' };
  const profile = getRuleProfile(ruleProfileId)?.holdingPolicy.value;
  return {
    policy: normalizeHoldingPolicy(profile?.kind) ?? 'none',
    customLimitMinutes: input.customLimitMinutes ?? profile?.customLimitMinutes ?? null,
    source: 'rule_profile',
  };
}

/**
 * Starts a holding period for a batch. The policy is the one chosen, else the recipe version's, else
 * the rule profile's default, and is kept with the period as it stood at the start.
 */
export async function startHoldingPeriod(db: Db, actor: Actor, rawInput: StartHoldingInput, idempotencyKey: string | undefined, now: Date): Promise<HoldingPeriod> {
  const input = StartHoldingInputSchema.parse(rawInput);
  const hash = requestHash('start', input);
  const id = await onceForKey(db, actor, idempotencyKey, hash, async () => {
    const batch = await findBatchForHolding(db, actor.businessId, input.batchId);
    if (!batch) throw new HttpError(404, 'not_found', 'That batch does not exist.', { batchId: ['Choose a batch of this bakery'] });
    if (CLOSED_BATCH_STATES.includes(batch.state)) throw conflict(`Batch ${batch.lotCode} is ${batch.state.replace('_', ' ')}; a holding timer cannot be started for it.`, { batchId: ['Choose a batch that is still in use'] });
    const business = await businessTimeZone(db, actor.businessId);
    const resolved = resolvePolicy(input, batch.holdingPolicy, business.ruleProfileId);
    const { policy } = resolved;
    if (policy === 'custom' && !resolved.customLimitMinutes) {
      throw badRequest('Enter your own time limit in minutes.', { customLimitMinutes: ['Enter the limit in minutes'] });
    }
    if (policyNeedsFirstReading(policy) && !input.firstReading) {
      throw badRequest('firstReading is required: take the food\u2019s temperature now, because this time limit depends on it.', {
        firstReading: ['Enter the temperature now (°F or °C); this time limit depends on it'],
      });
    }
    const procedure = policyNeedsWrittenProcedure(policy) ? await currentWrittenProcedure(db, actor.businessId) : undefined;
    if (policyNeedsWrittenProcedure(policy) && !procedure) {
      throw conflict('Time as a public health control needs your written procedure first (FDA Food Code 3-501.19(A)). The owner records it under Written procedures.', {
        policy: ['Record the written procedure before using time as a public health control'],
      });
    }
    const readings = input.firstReading ? [{ ...input.firstReading, at: now.toISOString() }] : [];
    const check = evaluateHolding({ policy, customLimitMinutes: resolved.customLimitMinutes, startedAt: now.toISOString(), readings, now: now.toISOString(), timeZone: business.timeZone });
    if (check.status === 'not_permitted') {
      throw badRequest(check.messages.join(' '), { [policy === 'custom' ? 'customLimitMinutes' : 'firstReading']: check.messages });
    }
    const who = whoFields(actor);
    return db.transaction(async (tx) => {
      const [period] = await tx
        .insert(holdingPeriods)
        .values({
          businessId: actor.businessId,
          batchId: batch.id,
          kind: input.kind,
          label: input.label ?? '',
          policy,
          customLimitMinutes: policy === 'custom' ? resolved.customLimitMinutes : null,
          limitMinutes: holdingLimitMinutes(policy, resolved.customLimitMinutes),
          policySource: resolved.source,
          ruleProfileId: business.ruleProfileId,
          writtenProcedureId: procedure?.id ?? null,
          startedAt: now,
          startedByUserId: who.userId,
          startedByName: who.name,
          startedByRole: who.role,
        })
        .returning();
      if (input.firstReading) {
        await tx.insert(holdingReadings).values({
          businessId: actor.businessId, periodId: period!.id, value: input.firstReading.value, unit: input.firstReading.unit,
          takenAt: now, takenByUserId: who.userId, takenByName: who.name, takenByRole: who.role,
        });
      }
      await appendRecordEvent(tx, actor, {
        entityType: ENTITY, entityId: period!.id, action: 'start', idempotencyKey: idempotencyKey ?? null, occurredAt: now,
        payload: { requestHash: hash, batchId: batch.id, lotCode: batch.lotCode, kind: input.kind, policy, limitMinutes: period!.limitMinutes, policySource: resolved.source, firstReading: input.firstReading ?? null, writtenProcedureId: procedure?.id ?? null },
      }, now);
      return period!.id;
    });
  });
  return onePeriod(db, actor.businessId, id, now);
}

/** Adds a temperature reading to a running period. */
export async function addHoldingReading(db: Db, actor: Actor, periodId: string, rawInput: AddReadingInput, idempotencyKey: string | undefined, now: Date): Promise<HoldingPeriod> {
  const input = AddReadingInputSchema.parse(rawInput);
  const hash = requestHash(`reading:${periodId}`, input);
  await onceForKey(db, actor, idempotencyKey, hash, async () => {
    const { row, stop } = await findPeriodRow(db, actor.businessId, periodId);
    if (stop) throw conflict('This timer was already stopped; readings can only be added while it runs.');
    const who = whoFields(actor);
    await db.transaction(async (tx) => {
      const [reading] = await tx.insert(holdingReadings).values({
        businessId: actor.businessId, periodId: row.id, value: input.value, unit: input.unit,
        takenAt: now, takenByUserId: who.userId, takenByName: who.name, takenByRole: who.role,
      }).returning();
      await appendRecordEvent(tx, actor, {
        entityType: ENTITY, entityId: row.id, action: 'reading', idempotencyKey: idempotencyKey ?? null, occurredAt: now,
        payload: { requestHash: hash, readingId: reading!.id, value: input.value, unit: input.unit },
      }, now);
    });
    return row.id;
  });
  const period = await onePeriod(db, actor.businessId, periodId, now);
  await noticeHoldingViolations(db, actor.businessId, [period], now);
  return period;
}

/** Stops a running period. */
export async function stopHoldingPeriod(db: Db, actor: Actor, periodId: string, rawInput: StopHoldingInput, idempotencyKey: string | undefined, now: Date): Promise<HoldingPeriod> {
  const input = StopHoldingInputSchema.parse(rawInput);
  const hash = requestHash(`stop:${periodId}`, input);
  await onceForKey(db, actor, idempotencyKey, hash, async () => {
    const { row, stop } = await findPeriodRow(db, actor.businessId, periodId);
    if (stop) throw conflict('This timer was already stopped.');
    await db.transaction(async (tx) => {
      await insertStop(tx, actor, row.id, input.note ?? '', now);
      await appendRecordEvent(tx, actor, {
        entityType: ENTITY, entityId: row.id, action: 'stop', idempotencyKey: idempotencyKey ?? null, occurredAt: now,
        payload: { requestHash: hash, note: input.note ?? '' },
      }, now);
    });
    return row.id;
  });
  const period = await onePeriod(db, actor.businessId, periodId, now);
  await noticeHoldingViolations(db, actor.businessId, [period], now);
  return period;
}

async function insertStop(tx: DbOrTx, actor: Actor, periodId: string, note: string, now: Date) {
  const who = whoFields(actor);
  await tx.insert(holdingStops).values({ businessId: actor.businessId, periodId, stoppedAt: now, stoppedByUserId: who.userId, stoppedByName: who.name, stoppedByRole: who.role, note });
}

const ACTION_WORDS = { discarded: 'a discard', reheated: 'a reheat', reason: 'a reason' } as const;

/**
 * Records the corrective action for a period over its limit: the Food Code's discard (or, after a
 * failed first cooling stage, reheat), or a reason for a custom quality limit. Stops the timer if it
 * still runs; a discard also moves the batch to discarded.
 */
export async function recordHoldingAction(db: Db, actor: Actor, periodId: string, rawInput: RecordHoldingActionInput, idempotencyKey: string | undefined, now: Date): Promise<HoldingPeriod> {
  const input = RecordHoldingActionInputSchema.parse(rawInput);
  const hash = requestHash(`action:${periodId}`, input);
  await onceForKey(db, actor, idempotencyKey, hash, async () => {
    const current = await onePeriod(db, actor.businessId, periodId, now);
    const required = current.evaluation.requiredAction;
    // The owner hears of every violation, also one that is actioned on the spot.
    await noticeHoldingViolations(db, actor.businessId, [current], now);
    if (!current.needsAction || !required) {
      throw conflict(current.actions.length ? 'The action for this timer is already recorded.' : 'This timer is within its limit; there is nothing to record.');
    }
    const allowed = actionsAllowedFor(required);
    if (!allowed.includes(input.action)) {
      const message = input.action === 'reason'
        ? 'A reason can close only your own quality limit. This is a food-safety limit: the food must be discarded (FDA Food Code 3-501.19 / 3-501.14).'
        : `Reheating is only for food that missed the first cooling stage (FDA Food Code 3-501.14(A)(1)); this food must be discarded.`;
      throw conflict(message, { action: [`Record ${allowed.map((a) => ACTION_WORDS[a]).join(' or ')}`] });
    }
    const who = whoFields(actor);
    await db.transaction(async (tx) => {
      if (!current.stopped) await insertStop(tx, actor, periodId, `Stopped when ${ACTION_WORDS[input.action]} was recorded`, now);
      const [action] = await tx.insert(holdingActions).values({
        businessId: actor.businessId, periodId, action: input.action, reason: input.reason ?? '',
        recordedAt: now, recordedByUserId: who.userId, recordedByName: who.name, recordedByRole: who.role,
      }).returning();
      await appendRecordEvent(tx, actor, {
        entityType: ENTITY, entityId: periodId, action: `action_${input.action}`, reason: input.reason ?? null, idempotencyKey: idempotencyKey ?? null, occurredAt: now,
        payload: { requestHash: hash, actionId: action!.id, requiredAction: required, batchId: current.batchId, wasRunning: !current.stopped },
      }, now);
      if (input.action === 'discarded') {
        await discardBatchForHolding(tx, actor, current.batchId, `Holding limit passed (${current.policyName}); discarded at ${current.evaluation.deadlineAtLocal ?? ''}`.trim(), now);
      }
    });
    return periodId;
  });
  return onePeriod(db, actor.businessId, periodId, now);
}

/** The written TPHC procedure: current version and history. */
export async function listWrittenProcedures(db: Db, actor: Actor): Promise<WrittenProcedureList> {
  const { timeZone } = await businessTimeZone(db, actor.businessId);
  const rows = await db.select().from(writtenProcedures).where(and(eq(writtenProcedures.businessId, actor.businessId), eq(writtenProcedures.topic, 'tphc')));
  const versions = rows.sort((a, b) => b.version - a.version).map((r) => toWrittenProcedureView(r, timeZone));
  return { current: versions[0] ?? null, versions };
}

/** Saves a new version of the written TPHC procedure (FDA Food Code 3-501.19(A)). */
export async function saveWrittenProcedure(db: Db, actor: Actor, rawInput: WrittenProcedureInput, now: Date): Promise<WrittenProcedureList> {
  const input = WrittenProcedureInputSchema.parse(rawInput);
  await db.transaction(async (tx) => {
    const current = await currentWrittenProcedure(tx, actor.businessId);
    const [row] = await tx.insert(writtenProcedures).values({
      businessId: actor.businessId, topic: 'tphc', version: (current?.version ?? 0) + 1, title: input.title, body: input.body,
      createdByUserId: actor.userId, createdByName: actor.name, createdAt: now, updatedAt: now,
    }).returning();
    await appendRecordEvent(tx, actor, { entityType: 'written_procedure', entityId: row!.id, action: current ? 'revise' : 'create', payload: { topic: 'tphc', version: row!.version, title: input.title } }, now);
  });
  return listWrittenProcedures(db, actor);
}
