import { and, asc, desc, eq, inArray, isNull, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { holdingActions, holdingPeriods, holdingReadings, holdingStops, writtenProcedures, type HoldingPeriodRow } from '../../db/schema/holding';
import { batches } from '../../db/schema/batches';
import { recipeVersions } from '../../db/schema/recipes';
import { businesses } from '../../db/schema/business';
import { evaluateHolding, type HoldingPolicy } from '../../../shared/domain/holding-policies';
import { holdingPolicyName, holdingUrgencyRank, needsHoldingAction, type RecordedHoldingAction } from '../../../shared/domain/holding-rules';
import { formatTemperatureBoth, type TemperatureUnit } from '../../../shared/domain/temperature';
import { formatZonedDateTime } from '../../../shared/domain/zoned-time';
import type { HoldingKind, HoldingPeriod, WrittenProcedure } from '../../../shared/contracts/holding';
import type { ReleaseBlocker } from '../batches/release-checks';

// The app's clock for checks called without one (release and label checks): set from deps.now.
let clock: () => Date = () => new Date();
/** Sets the clock used when a caller passes no `now` (the app passes deps.now). */
export function setHoldingClock(now: () => Date): void {
  clock = now;
}

export async function businessTimeZone(db: DbOrTx, businessId: string): Promise<{ timeZone: string; name: string; ruleProfileId: string }> {
  const [row] = await db.select({ timeZone: businesses.timeZone, name: businesses.name, ruleProfileId: businesses.ruleProfileId }).from(businesses).where(eq(businesses.id, businessId));
  return row ?? { timeZone: 'UTC', name: '', ruleProfileId: '' };
}

/** The batch with its product name and pinned recipe version's holding policy, or undefined (also for another business). */
export async function findBatchForHolding(db: DbOrTx, businessId: string, batchId: string) {
  const [row] = await db
    .select({ id: batches.id, lotCode: batches.lotCode, state: batches.state, productName: recipeVersions.name, holdingPolicy: recipeVersions.holdingPolicy })
    .from(batches)
    .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
    .where(and(eq(batches.id, batchId), eq(batches.businessId, businessId)));
  return row;
}

/** The current (highest) version of the business's written procedure on `topic`, if any. */
export async function currentWrittenProcedure(db: DbOrTx, businessId: string, topic = 'tphc') {
  const [row] = await db
    .select()
    .from(writtenProcedures)
    .where(and(eq(writtenProcedures.businessId, businessId), eq(writtenProcedures.topic, topic)))
    .orderBy(desc(writtenProcedures.version))
    .limit(1);
  return row;
}

export function toWrittenProcedureView(row: typeof writtenProcedures.$inferSelect, timeZone: string): WrittenProcedure {
  return {
    id: row.id,
    topic: 'tphc',
    version: row.version,
    title: row.title,
    body: row.body,
    createdBy: row.createdByName,
    createdAt: row.createdAt.toISOString(),
    createdAtLocal: formatZonedDateTime(row.createdAt, timeZone),
  };
}

export interface PeriodFilter {
  periodIds?: string[];
  batchId?: string;
  runningOnly?: boolean;
  /** Periods stopped but still needing an action count as open for the board. */
  includeUnresolved?: boolean;
  limit?: number;
}

/**
 * Loads periods with their readings, stop and actions and evaluates each with
 * shared/domain/holding-policies.ts at `now`. Sorted most urgent first, then newest.
 */
export async function loadHoldingPeriods(db: DbOrTx, businessId: string, filter: PeriodFilter, now: Date): Promise<HoldingPeriod[]> {
  const { timeZone } = await businessTimeZone(db, businessId);
  const where = [eq(holdingPeriods.businessId, businessId)];
  if (filter.periodIds) {
    if (filter.periodIds.length === 0) return [];
    where.push(inArray(holdingPeriods.id, filter.periodIds));
  }
  if (filter.batchId) where.push(eq(holdingPeriods.batchId, filter.batchId));
  if (filter.runningOnly) {
    where.push(
      filter.includeUnresolved
        ? sql`(${holdingStops.id} is null or not exists (select 1 from ${holdingActions} a where a.period_id = ${holdingPeriods.id}))`
        : isNull(holdingStops.id),
    );
  }
  const rows = await db
    .select({ period: holdingPeriods, stop: holdingStops, lotCode: batches.lotCode, productName: recipeVersions.name })
    .from(holdingPeriods)
    .innerJoin(batches, eq(batches.id, holdingPeriods.batchId))
    .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
    .leftJoin(holdingStops, eq(holdingStops.periodId, holdingPeriods.id))
    .where(and(...where))
    .orderBy(desc(holdingPeriods.startedAt))
    .limit(filter.limit ?? 500);
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.period.id);
  const [readings, actions] = await Promise.all([
    db.select().from(holdingReadings).where(and(eq(holdingReadings.businessId, businessId), inArray(holdingReadings.periodId, ids))).orderBy(asc(holdingReadings.takenAt)),
    db.select().from(holdingActions).where(and(eq(holdingActions.businessId, businessId), inArray(holdingActions.periodId, ids))).orderBy(asc(holdingActions.recordedAt)),
  ]);
  const local = (d: Date) => formatZonedDateTime(d, timeZone);
  const views = rows.map(({ period, stop, lotCode, productName }) => {
    const own = readings.filter((r) => r.periodId === period.id);
    const acts = actions.filter((a) => a.periodId === period.id);
    return toView(period, stop, own, acts, { lotCode, productName, timeZone, now, local });
  });
  return views.sort((a, b) => rank(a) - rank(b) || b.started.at.localeCompare(a.started.at));
}

const rank = (p: HoldingPeriod) => holdingUrgencyRank(p.evaluation.status, p.needsAction);

function toView(
  period: HoldingPeriodRow,
  stop: typeof holdingStops.$inferSelect | null,
  readings: Array<typeof holdingReadings.$inferSelect>,
  actions: Array<typeof holdingActions.$inferSelect>,
  c: { lotCode: string; productName: string; timeZone: string; now: Date; local: (d: Date) => string },
): HoldingPeriod {
  const policy = period.policy as HoldingPolicy;
  const reason = actions.find((a) => a.action === 'reason')?.reason ?? null;
  const e = evaluateHolding({
    policy,
    customLimitMinutes: period.customLimitMinutes,
    startedAt: period.startedAt.toISOString(),
    stoppedAt: stop?.stoppedAt.toISOString() ?? null,
    readings: readings.map((r) => ({ value: r.value, unit: r.unit as TemperatureUnit, at: r.takenAt.toISOString() })),
    // A stopped period is judged as it stood at the stop; `now` only matters while running.
    now: (stop && stop.stoppedAt > c.now ? stop.stoppedAt : c.now).toISOString(),
    closeReason: reason,
    timeZone: c.timeZone,
  });
  const recorded = actions.map((a) => a.action as RecordedHoldingAction);
  return {
    id: period.id,
    batchId: period.batchId,
    lotCode: c.lotCode,
    productName: c.productName,
    kind: period.kind as HoldingKind,
    label: period.label,
    policy,
    policyName: holdingPolicyName(policy, period.customLimitMinutes),
    policySource: period.policySource as HoldingPeriod['policySource'],
    customLimitMinutes: period.customLimitMinutes,
    limitMinutes: period.limitMinutes,
    timeZone: c.timeZone,
    started: { at: period.startedAt.toISOString(), atLocal: c.local(period.startedAt), by: period.startedByName },
    stopped: stop ? { at: stop.stoppedAt.toISOString(), atLocal: c.local(stop.stoppedAt), by: stop.stoppedByName, note: stop.note } : null,
    readings: readings.map((r) => ({
      id: r.id,
      value: r.value,
      unit: r.unit as TemperatureUnit,
      display: formatTemperatureBoth({ value: r.value, unit: r.unit as TemperatureUnit }),
      at: r.takenAt.toISOString(),
      atLocal: c.local(r.takenAt),
      by: r.takenByName,
    })),
    actions: actions.map((a) => ({ id: a.id, action: a.action as RecordedHoldingAction, reason: a.reason, at: a.recordedAt.toISOString(), atLocal: c.local(a.recordedAt), by: a.recordedByName })),
    evaluation: { ...e, deadlineAtLocal: e.deadlineAt ? c.local(new Date(e.deadlineAt)) : null },
    needsAction: needsHoldingAction(e, recorded),
  };
}

/**
 * True when a holding period of the batch went over a limit and the required corrective action
 * (discard; reheat or discard; or a reason for a custom limit) is not recorded. Release and labels
 * refuse such a batch. Uses the app clock when `now` is omitted.
 */
export async function hasUnresolvedHoldingViolation(db: DbOrTx, businessId: string, batchId: string, now: Date = clock()): Promise<boolean> {
  const periods = await loadHoldingPeriods(db, businessId, { batchId }, now);
  return periods.some((p) => p.needsAction);
}

/** Release check registered with the batches feature. */
export async function holdingReleaseCheck(db: DbOrTx, businessId: string, batchId: string): Promise<ReleaseBlocker[]> {
  const periods = await loadHoldingPeriods(db, businessId, { batchId }, clock());
  return periods
    .filter((p) => p.needsAction)
    .map((p) => ({
      code: 'holding_violation',
      message: `A ${p.kind === 'custom' ? p.label : p.kind} period started ${p.started.atLocal} went over its limit; record ${p.evaluation.requiredAction === 'record_reason' ? 'a reason or a discard' : p.evaluation.requiredAction === 'reheat_or_discard' ? 'the reheat or the discard' : 'the discard'} first.`,
    }));
}
