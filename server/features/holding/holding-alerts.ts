import type { Db, DbOrTx } from '../../db/client';
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

/**
 * Hook for the owner's e-mail alert, called once per violation inside the transaction that records
 * the notice. The mail queue has no table yet, so this only returns for now.
 */
export async function notifyHoldingViolation(_tx: DbOrTx, _notice: HoldingViolationNotice, _now: Date): Promise<void> {}

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
