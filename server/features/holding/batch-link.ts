import type { DbOrTx } from '../../db/client';
import type { Actor } from '../../lib/actor';
import { canTransition, type BatchState } from '../../../shared/domain/batch-states';
import { changeBatchState } from '../batches/batches.service';
import { findBatchForHolding } from './holding.queries';

/**
 * After a recorded discard, moves the batch to discarded through the batches service (in the same
 * transaction). A batch already discarded, or in a state that cannot be discarded, is left alone.
 */
export async function discardBatchForHolding(tx: DbOrTx, actor: Actor, batchId: string, reason: string, now: Date): Promise<boolean> {
  const batch = await findBatchForHolding(tx, actor.businessId, batchId);
  if (!batch || !canTransition(batch.state as BatchState, 'discarded')) return false;
  await changeBatchState(tx, actor, batchId, { toState: 'discarded', reason }, now);
  return true;
}
