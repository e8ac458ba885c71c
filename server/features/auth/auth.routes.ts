import { Router } from 'express';
import type { AppDeps } from '../../app';
import { allow } from '../../middleware/access';
import { SignInInputSchema, SignUpInputSchema } from '../../../shared/contracts/auth';
import { HttpError } from '../../lib/http-error';
import { signIn, signUp, type SignedInMember } from './auth.service';
import { destroySession, startMemberSession } from './session-helpers';
import { buildSessionInfo } from './session-info';

export function authRouter(deps: AppDeps) {
  const { db, config, logger } = deps;

  return Router()
    .get('/session', allow('public'), async (req, res) => {
      res.json(await buildSessionInfo(deps, req));
    })
    .post('/sign-up', allow('public'), deps.limits.signUp, async (req, res) => {
      if (!config.signupEnabled) throw new HttpError(403, 'forbidden', 'New sign-ups are turned off on this server.');
      const input = SignUpInputSchema.parse(req.body);
      const member = await signUp(db, input, config.hashParams, deps.now());
      await startMemberSession(req, member, deps.now());
      logger.info({ event: 'authn_signup', userId: member.userId, businessId: member.businessId }, 'sign-up');
      req.actor = { kind: 'member', businessId: member.businessId, userId: member.userId, name: member.displayName, role: member.role };
      res.status(201).json(await buildSessionInfo(deps, req));
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
      res.json(await buildSessionInfo(deps, req));
    })
    .post('/sign-out', allow('public'), async (req, res) => {
      await destroySession(req);
      res.clearCookie(config.cookieName, { path: '/', httpOnly: true, sameSite: 'lax', secure: config.secureCookies });
      res.set('Clear-Site-Data', '"cache", "storage"');
      res.status(204).end();
    });
}
