import { and, eq, isNull } from 'drizzle-orm';
import { holdingPeriods, holdingStops } from '../../db/schema/holding';
import { loadHoldingPeriods } from './holding.queries';
import type { Db, DbOrTx } from '../../db/client';
import { memberships, users } from '../../db/schema/auth';
import { queueMail } from '../mail/mail.service';
import type { Actor } from '../../lib/actor';
import { appendRecordEvent, findByIdempotencyKey } from '../records/record-events.service';
import type { HoldingPeriod } from '../../../shared/contracts/holding';

// Automatic notices are recorded under this name; no person or device did them.
const SYSTEM_ACTOR: Pick<Actor, 'userId' | 'name' | 'role'> = { userId: null, name: 'Crumbtrail (automatic check)', role: 'system' as Actor['role'] };

/** What the owner is told when a holding limit is passed. */
export interface HoldingViolationNotice {
  businessId: string;
  periodId: string;
  batchId: string;
  lotCode: string;
  productName: string;
  policyName: string;
  requiredAction: NonNullable<HoldingPeriod['evaluation']['requiredAction']>;
  deadlineAtLocal: string | null;
  messages: string[];
}

const ACTION_WORDS = { discard: 'Discard the food.', reheat_or_discard: 'Reheat the food or discard it.', record_reason: 'Record why the food was still fine to use, or discard it.' } as const;

/**
 * E-mails every active owner about one violation (queued in the caller's transaction, one message per
 * owner and period ever). Called once per violation by noticeHoldingViolations.
 */
export async function notifyHoldingViolation(tx: DbOrTx, notice: HoldingViolationNotice, now: Date): Promise<void> {
  const owners = await tx
    .select({ userId: users.id, email: users.email, name: users.displayName })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.businessId, notice.businessId), eq(memberships.role, 'owner'), eq(memberships.isActive, true)));
  const text = [
    `A holding timer went over its limit: ${notice.productName}, lot ${notice.lotCode}.`,
    '',
    `Limit: ${notice.policyName}${notice.deadlineAtLocal ? `, deadline ${notice.deadlineAtLocal}` : ''}.`,
    ...notice.messages,
    '',
    `What to do: ${ACTION_WORDS[notice.requiredAction]} Record it on the Kitchen board; the batch cannot be released or labelled until you do.`,
    '',
    'These are model FDA Food Code values; your local rules and your local health authority decide.',
  ].join('\n');
  for (const owner of owners) {
    await queueMail(tx, {
      businessId: notice.businessId, to: owner.email, kind: 'holding_alert',
      subject: `Holding limit passed: ${notice.productName} (${notice.lotCode})`, text,
      dedupeKey: `holding-violation:${notice.periodId}:${owner.userId}`,
    }, now);
  }
}

const noticeKey = (periodId: string) => `holding-violation-notice:${periodId}`;

/**
 * For each period that needs an action and was not noticed before, records one 'violation_noticed'
 * event (its idempotency key makes it once per period) and calls notifyHoldingViolation.
 */
export async function noticeHoldingViolations(db: Db, businessId: string, periods: readonly HoldingPeriod[], now: Date): Promise<number> {
  let sent = 0;
  for (const p of periods) {
    if (!p.needsAction || !p.evaluation.requiredAction) continue;
    const key = noticeKey(p.id);
    if (await findByIdempotencyKey(db, businessId, key)) continue;
    const notice: HoldingViolationNotice = {
      businessId, periodId: p.id, batchId: p.batchId, lotCode: p.lotCode, productName: p.productName, policyName: p.policyName,
      requiredAction: p.evaluation.requiredAction, deadlineAtLocal: p.evaluation.deadlineAtLocal, messages: p.evaluation.messages,
    };
    try {
      await db.transaction(async (tx) => {
        await appendRecordEvent(tx, { ...SYSTEM_ACTOR, businessId }, {
          entityType: 'holding_period', entityId: p.id, action: 'violation_noticed', idempotencyKey: key,
          payload: { requiredAction: notice.requiredAction, deadlineAt: p.evaluation.deadlineAt, lotCode: p.lotCode },
        }, now);
        await notifyHoldingViolation(tx, notice, now);
      });
      sent += 1;
    } catch (err) {
      // Another request noticed it at the same moment: once is enough.
      const code = (err as { code?: string; cause?: { code?: string } }).cause?.code ?? (err as { code?: string }).code;
      if (code !== '23505') throw err;
    }
  }
  return sent;
}

/**
 * Background check (every few seconds, from server/index.ts): notices limits passed while nobody has the
 * Kitchen board open, so the owner's e-mail does not wait for someone to look. Safe with several
 * processes: each period is noticed once (unique idempotency key).
 */
export async function runHoldingAlertScan({ db, now }: { db: Db; now: () => Date }): Promise<number> {
  const running = await db
    .selectDistinct({ businessId: holdingPeriods.businessId })
    .from(holdingPeriods)
    .leftJoin(holdingStops, eq(holdingStops.periodId, holdingPeriods.id))
    .where(isNull(holdingStops.id));
  let noticed = 0;
  for (const { businessId } of running) {
    const at = now();
    const periods = await loadHoldingPeriods(db, businessId, { runningOnly: true }, at);
    noticed += await noticeHoldingViolations(db, businessId, periods, at);
  }
  return noticed;
}
