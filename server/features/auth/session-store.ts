import { sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { sha256Hex } from '../../lib/tokens';
import type { SessionSummary } from '../../../shared/contracts/account';

/**
 * Rows of the express-session store (user_sessions). Ending a session is deleting its row: the
 * next request with that cookie finds nothing and is anonymous (A5-7.4.1, 7.4.2).
 */

/** A handle that names a session in the API without revealing its id (the id is the bearer token). */
export const sessionHandle = (sid: string) => sha256Hex(`session:${sid}`).slice(0, 32);

interface StoredSession {
  sid: string;
  sess: { kind?: string; createdAt?: number; lastSeenAt?: number; userAgent?: string };
}

export async function memberSessionsOf(db: DbOrTx, userId: string, businessId?: string): Promise<StoredSession[]> {
  const result = await db.execute(sql`
    select sid, sess from user_sessions
    where sess->>'kind' = 'member' and sess->>'userId' = ${userId} and expire > now()
      ${businessId ? sql`and sess->>'businessId' = ${businessId}` : sql``}`);
  return result.rows as unknown as StoredSession[];
}

export function toSessionSummary(s: StoredSession, currentSid?: string): SessionSummary {
  return {
    id: sessionHandle(s.sid),
    kind: s.sess.kind === 'device' ? 'device' : 'member',
    createdAt: new Date(s.sess.createdAt ?? 0).toISOString(),
    lastSeenAt: new Date(s.sess.lastSeenAt ?? 0).toISOString(),
    userAgent: s.sess.userAgent ?? null,
    isCurrent: s.sid === currentSid,
  };
}

/** Ends a member's sessions (in one business, or all of them), optionally keeping one; returns how many ended. */
export async function endMemberSessions(db: DbOrTx, userId: string, options: { businessId?: string; exceptSid?: string; onlySid?: string } = {}): Promise<number> {
  const result = await db.execute(sql`
    delete from user_sessions
    where sess->>'kind' = 'member' and sess->>'userId' = ${userId}
      ${options.businessId ? sql`and sess->>'businessId' = ${options.businessId}` : sql``}
      ${options.exceptSid ? sql`and sid <> ${options.exceptSid}` : sql``}
      ${options.onlySid ? sql`and sid = ${options.onlySid}` : sql``}`);
  return result.rowCount ?? 0;
}

/** Ends the session of one kitchen device at once (revocation). */
export async function endDeviceSessions(db: DbOrTx, deviceId: string): Promise<number> {
  const result = await db.execute(sql`delete from user_sessions where sess->>'kind' = 'device' and sess->>'deviceId' = ${deviceId}`);
  return result.rowCount ?? 0;
}
