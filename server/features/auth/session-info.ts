import type { Request } from 'express';
import { eq } from 'drizzle-orm';
import type { AppDeps } from '../../app';
import type { SessionInfo } from '../../../shared/contracts/auth';
import { businesses } from '../../db/schema/business';
import { users } from '../../db/schema/auth';
import { IDLE_TIMEOUT_MS, ABSOLUTE_TIMEOUT_MS } from '../../middleware/actor';
import { ensureCsrfToken } from './session-helpers';

/** The GET /api/auth/session answer; sign-in, invite acceptance and device enrolment answer it too. */
export async function buildSessionInfo(deps: Pick<AppDeps, 'db' | 'config'>, req: Request): Promise<SessionInfo> {
  const { db, config } = deps;
  const csrfToken = ensureCsrfToken(req);
  const base = {
    csrfToken,
    signupEnabled: config.signupEnabled,
    // Demo sign-in details exist only in demo mode (A5-6.3.2: no default accounts otherwise).
    demoAccounts: config.demoMode ? config.demoAccounts : [],
  };
  const actor = req.actor;
  if (!actor) return { ...base, kind: 'anonymous', user: null, business: null, idleExpiresAt: null, absoluteExpiresAt: null };
  const [business] = await db.select().from(businesses).where(eq(businesses.id, actor.businessId));
  const [user] = actor.userId ? await db.select().from(users).where(eq(users.id, actor.userId)) : [];
  const s = req.session;
  const isMember = actor.kind === 'member';
  return {
    ...base,
    kind: actor.kind,
    user: user && isMember ? { id: user.id, email: user.email, displayName: user.displayName, role: actor.role as 'owner' } : null,
    business: business ? { id: business.id, name: business.name, timeZone: business.timeZone, ruleProfileId: business.ruleProfileId, isDemo: business.isDemo } : null,
    idleExpiresAt: isMember ? new Date((s.lastSeenAt ?? 0) + IDLE_TIMEOUT_MS).toISOString() : null,
    absoluteExpiresAt: isMember ? new Date((s.createdAt ?? 0) + ABSOLUTE_TIMEOUT_MS).toISOString() : null,
  };
}
