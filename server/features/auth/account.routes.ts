import { Router } from 'express';
import type { AppDeps } from '../../app';
import { allow, MEMBERS } from '../../middleware/access';
import { ChangePasswordInputSchema } from '../../../shared/contracts/auth';
import { SessionParamsSchema, UpdateProfileInputSchema, type PasswordChanged } from '../../../shared/contracts/account';
import type { Actor } from '../../lib/actor';
import { changePassword, endOwnSession, listOwnSessions, updateProfile } from './account.service';
import { destroySession, reissueSession } from './session-helpers';
import { sessionHandle } from './session-store';

// Routes under /api/account act on the signed-in member themself.
const member = (actor: Actor | undefined) => actor as Actor & { userId: string };

export function accountRouter(deps: AppDeps) {
  const { db, config } = deps;
  return Router()
    .post('/password', allow(...MEMBERS), async (req, res) => {
      const input = ChangePasswordInputSchema.parse(req.body);
      const endedSessions = await changePassword(db, member(req.actor), input, req.sessionID, config.hashParams, deps.now());
      await reissueSession(req);
      const body: PasswordChanged = { endedSessions, csrfToken: req.session.csrfToken! };
      res.json(body);
    })
    .patch('/profile', allow(...MEMBERS), async (req, res) => {
      const input = UpdateProfileInputSchema.parse(req.body);
      res.json(await updateProfile(db, member(req.actor), input, deps.now()));
    })
    .get('/sessions', allow(...MEMBERS), async (req, res) => {
      res.json({ sessions: await listOwnSessions(db, member(req.actor), req.sessionID) });
    })
    .delete('/sessions/:sessionId', allow(...MEMBERS), async (req, res) => {
      const { sessionId } = SessionParamsSchema.parse(req.params);
      await endOwnSession(db, member(req.actor), sessionId, deps.now());
      // Otherwise express-session would save the current session again at the end of this request.
      if (sessionId === sessionHandle(req.sessionID)) await destroySession(req);
      res.status(204).end();
    });
}
