import { HttpError } from '../../lib/http-error';
import type { DbOrTx } from '../../db/client';
import { findByIdempotencyKey } from './record-events.service';

/**
 * Runs `write` once per Idempotency-Key (IETF draft-ietf-httpapi-idempotency-key-header). A retry with
 * the same key and request hash answers the entity id the first run recorded; the same key with a
 * different request is refused (422). `write` must append a record event of `entityType` carrying
 * `{ requestHash }` in its payload and the key in its idempotencyKey.
 */
export async function onceForIdempotencyKey(
  db: DbOrTx,
  businessId: string,
  key: string | undefined,
  entityType: string,
  requestHash: string,
  write: () => Promise<string>,
): Promise<string> {
  const replay = async () => {
    const earlier = key ? await findByIdempotencyKey(db, businessId, key) : undefined;
    if (!earlier) return undefined;
    if (earlier.entityType !== entityType || (earlier.payload as { requestHash?: string } | null)?.requestHash !== requestHash) {
      throw new HttpError(422, 'conflict', 'This Idempotency-Key was already used for a different request. Send a new key for a new action.');
    }
    return earlier.entityId;
  };
  const earlier = await replay();
  if (earlier) return earlier;
  try {
    return await write();
  } catch (err) {
    // Two copies of one tap racing: the loser hits the unique key; answer with the winner's result.
    const code = (err as { cause?: { code?: string } }).cause?.code ?? (err as { code?: string }).code;
    if (key && code === '23505') {
      const winner = await replay();
      if (winner) return winner;
    }
    throw err;
  }
}
