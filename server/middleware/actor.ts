import type { Request, RequestHandler } from 'express';
import type { Actor } from '../lib/actor';
import { and, eq } from 'drizzle-orm';
import type { Db } from '../db/client';
import { memberships, users } from '../db/schema/auth';
import type { Role } from '../../shared/contracts/auth';

// QUALITY/NIST SP 800-63B AAL2: 30 minutes idle, 12 hours absolute, both enforced on the server.
export const IDLE_TIMEOUT_MS = 30 * 60 * 1000;
export const ABSOLUTE_TIMEOUT_MS = 12 * 60 * 60 * 1000;

/**
 * lastSeenAt is rewritten (and so the session row saved) at most this often, so an active member's requests do not
 * each write the session. The idle limit is measured from the recorded value: a member is signed out between
 * 29 and 30 minutes after their last request, never later (decision 013).
 */
export const LAST_SEEN_RESOLUTION_MS = 60 * 1000;

/** Requests with this header set to '1' (background polling) do not count as a member's activity. */
export const BACKGROUND_REFRESH_HEADER = 'X-Background-Refresh';

export interface ActorResolver {
  /** Resolves non-member sessions (kitchen devices, inspector links); added by those features. */
  (db: Db, session: Request['session'], now: Date): Promise<Actor | undefined>;
}

/**
 * Loads the acting member from the session on every request, re-reading role and active flag from
 * the database so a role change or a disabled member takes effect at once.
 */
export function loadActor(db: Db, now: () => Date, resolvers: Partial<Record<'device' | 'inspector', ActorResolver>> = {}): RequestHandler {
  return async (req, res, next) => {
    const s = req.session;
    if (!s?.kind) return next();
    const t = now().getTime();
    const idleLimit = s.kind === 'member' ? IDLE_TIMEOUT_MS : Number.POSITIVE_INFINITY;
    const absoluteLimit = s.kind === 'member' ? ABSOLUTE_TIMEOUT_MS : Number.POSITIVE_INFINITY;
    if (t - (s.lastSeenAt ?? 0) > idleLimit || t - (s.createdAt ?? 0) > absoluteLimit) {
      res.locals.sessionExpired = true;
      await new Promise<void>((resolve) => s.destroy(() => resolve()));
      return next();
    }
    if (s.kind === 'member') {
      const [row] = await db
        .select({ userId: users.id, name: users.displayName, role: memberships.role, businessId: memberships.businessId })
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(and(eq(memberships.userId, s.userId!), eq(memberships.businessId, s.businessId!), eq(memberships.isActive, true)));
      if (!row) {
        await new Promise<void>((resolve) => s.destroy(() => resolve()));
        return next();
      }
      req.actor = { kind: 'member', businessId: row.businessId, userId: row.userId, name: row.name, role: row.role as Role, sessionId: req.sessionID };
    } else {
      const resolver = resolvers[s.kind];
      req.actor = resolver ? await resolver(db, s, now()) : undefined;
      if (!req.actor) {
        await new Promise<void>((resolve) => s.destroy(() => resolve()));
        return next();
      }
    }
    // Devices and inspector links have no idle limit but still need the occasional save to keep their store row.
    const isBackground = s.kind === 'member' && req.get(BACKGROUND_REFRESH_HEADER) === '1';
    if (!isBackground && t - (s.lastSeenAt ?? 0) >= LAST_SEEN_RESOLUTION_MS) s.lastSeenAt = t;
    res.locals.actor = req.actor;
    next();
  };
}
