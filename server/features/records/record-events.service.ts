import { and, asc, desc, eq, gt, sql } from 'drizzle-orm';
import { recordEvents, type RecordEventRow } from '../../db/schema/record-events';
import type { DbOrTx } from '../../db/client';
import { GENESIS_HASH, createChainVerifier, hashEntry, type ChainEntry, type ChainVerdict } from '../../../shared/domain/record-chain';
import type { Actor } from '../../lib/actor';

export interface NewRecordEvent {
  entityType: string;
  entityId: string;
  action: string;
  payload: unknown;
  reason?: string | null;
  occurredAt?: Date;
  idempotencyKey?: string | null;
  requestId?: string | null;
}

/**
 * Appends one entry to the business's chain. Call it inside the same transaction as the change it
 * records; the advisory lock serialises writers of one business so seq stays gapless.
 */
export async function appendRecordEvent(tx: DbOrTx, actor: Pick<Actor, 'businessId' | 'userId' | 'name' | 'role'>, event: NewRecordEvent, now: Date = new Date()): Promise<RecordEventRow> {
  await tx.execute(sql`select pg_advisory_xact_lock(hashtextextended(${actor.businessId}::text, 0))`);
  const [head] = await tx
    .select({ seq: recordEvents.seq, hash: recordEvents.hash })
    .from(recordEvents)
    .where(eq(recordEvents.businessId, actor.businessId))
    .orderBy(desc(recordEvents.seq))
    .limit(1);
  const entry: ChainEntry = {
    businessId: actor.businessId,
    seq: (head?.seq ?? 0) + 1,
    actorUserId: actor.userId ?? null,
    actorName: actor.name,
    actorRole: actor.role,
    entityType: event.entityType,
    entityId: event.entityId,
    action: event.action,
    payload: JSON.parse(JSON.stringify(event.payload ?? {})),
    reason: event.reason ?? null,
    occurredAt: (event.occurredAt ?? now).toISOString(),
    recordedAt: now.toISOString(),
    idempotencyKey: event.idempotencyKey ?? null,
    prevHash: head?.hash ?? GENESIS_HASH,
  };
  const [row] = await tx
    .insert(recordEvents)
    .values({
      ...entry,
      occurredAt: new Date(entry.occurredAt),
      recordedAt: new Date(entry.recordedAt),
      requestId: event.requestId ?? null,
      hash: hashEntry(entry),
    })
    .returning();
  return row!;
}

export function toChainEntry(r: RecordEventRow): ChainEntry & { hash: string } {
  return {
    businessId: r.businessId,
    seq: r.seq,
    actorUserId: r.actorUserId,
    actorName: r.actorName,
    actorRole: r.actorRole,
    entityType: r.entityType,
    entityId: r.entityId,
    action: r.action,
    payload: r.payload,
    reason: r.reason,
    occurredAt: r.occurredAt.toISOString(),
    recordedAt: r.recordedAt.toISOString(),
    idempotencyKey: r.idempotencyKey,
    prevHash: r.prevHash,
    hash: r.hash,
  };
}

const VERIFY_PAGE = 2000;

/** Verifies one business's whole chain, reading it in pages of seq so memory stays flat. */
export async function verifyBusinessChain(db: DbOrTx, businessId: string): Promise<ChainVerdict> {
  const verifier = createChainVerifier();
  for (let after = -1; ; ) {
    const rows = await db.select().from(recordEvents).where(and(eq(recordEvents.businessId, businessId), gt(recordEvents.seq, after))).orderBy(asc(recordEvents.seq)).limit(VERIFY_PAGE);
    for (const r of rows) verifier.push(toChainEntry(r));
    if (rows.length < VERIFY_PAGE) return verifier.result();
    after = rows[rows.length - 1]!.seq;
  }
}

/** An earlier event with this idempotency key, if the same request already ran. */
export async function findByIdempotencyKey(db: DbOrTx, businessId: string, key: string): Promise<RecordEventRow | undefined> {
  const [row] = await db
    .select()
    .from(recordEvents)
    .where(sql`${recordEvents.businessId} = ${businessId} and ${recordEvents.idempotencyKey} = ${key}`)
    .limit(1);
  return row;
}
