import { Router } from 'express';
import { eq } from 'drizzle-orm';
import type { AppDeps } from '../../app';
import { allow } from '../../middleware/access';
import { SignInInputSchema, SignUpInputSchema, type SessionInfo } from '../../../shared/contracts/auth';
import { HttpError } from '../../lib/http-error';
import { businesses } from '../../db/schema/business';
import { users } from '../../db/schema/auth';
import { signIn, signUp, type SignedInMember } from './auth.service';
import { destroySession, ensureCsrfToken, regenerateSession, saveSession } from './session-helpers';
import { IDLE_TIMEOUT_MS, ABSOLUTE_TIMEOUT_MS } from '../../middleware/actor';
import type { Request } from 'express';

async function startMemberSession(req: Request, member: SignedInMember, now: Date) {
  await regenerateSession(req);
  Object.assign(req.session, {
    kind: 'member',
    userId: member.userId,
    businessId: member.businessId,
    createdAt: now.getTime(),
    lastSeenAt: now.getTime(),
  });
  ensureCsrfToken(req);
  await saveSession(req);
}

export function authRouter(deps: AppDeps) {
  const { db, config, logger } = deps;

  async function sessionInfo(req: Request): Promise<SessionInfo> {
    const csrfToken = ensureCsrfToken(req);
    const base = {
      csrfToken,
      signupEnabled: config.signupEnabled,
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

  return Router()
    .get('/session', allow('public'), async (req, res) => {
      res.json(await sessionInfo(req));
    })
    .post('/sign-up', allow('public'), deps.limits.signUp, async (req, res) => {
      if (!config.signupEnabled) throw new HttpError(403, 'forbidden', 'New sign-ups are turned off on this server.');
      const input = SignUpInputSchema.parse(req.body);
      const member = await signUp(db, input, config.hashParams, deps.now());
      await startMemberSession(req, member, deps.now());
      logger.info({ event: 'authn_signup', userId: member.userId, businessId: member.businessId }, 'sign-up');
      req.actor = { kind: 'member', businessId: member.businessId, userId: member.userId, name: member.displayName, role: member.role };
      res.status(201).json(await sessionInfo(req));
    })
    .post('/sign-in', allow('public'), deps.limits.signInByAddress, deps.limits.signInByAccount, async (req, res) => {
      const input = SignInInputSchema.parse(req.body);
      let member: SignedInMember;
      try {
        member = await signIn(db, input, config.hashParams);
      } catch (err) {
        logger.warn({ event: 'authn_login_fail', ip: req.ip }, 'sign-in failed');
        throw err;
      }
      await startMemberSession(req, member, deps.now());
      logger.info({ event: 'authn_login_success', userId: member.userId }, 'sign-in');
      req.actor = { kind: 'member', businessId: member.businessId, userId: member.userId, name: member.displayName, role: member.role };
      res.json(await sessionInfo(req));
    })
    .post('/sign-out', allow('public'), async (req, res) => {
      await destroySession(req);
      res.clearCookie(config.cookieName, { path: '/' });
      res.set('Clear-Site-Data', '"cache", "storage"');
      res.status(204).end();
    });
}
