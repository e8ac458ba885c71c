import { Router } from 'express';
import type { AppDeps } from '../../app';
import { allow, MEMBERS } from '../../middleware/access';
import {
  AcceptInviteInputSchema,
  ChangeMemberRoleInputSchema,
  CreateInviteInputSchema,
  InviteParamsSchema,
  MemberParamsSchema,
  PreviewInviteInputSchema,
} from '../../../shared/contracts/team';
import type { Actor } from '../../lib/actor';
import {
  acceptInvite,
  changeMemberRole,
  createInvite,
  endAllMemberSessions,
  listInvites,
  listMembers,
  listMemberSessions,
  previewInvite,
  removeMember,
  revokeInvite,
  setMemberActive,
} from './team.service';
import { destroySession, startMemberSession } from '../auth/session-helpers';
import { buildSessionInfo } from '../auth/session-info';
import { queueInviteMail } from '../mail/mail-messages';

export function teamRouter(deps: AppDeps) {
  const { db, config } = deps;
  const actorOf = (a: Actor | undefined) => a!;
  return Router()
    .get('/members', allow(...MEMBERS), async (req, res) => {
      res.json({ members: await listMembers(db, actorOf(req.actor)) });
    })
    .patch('/members/:userId', allow('owner'), async (req, res) => {
      const { userId } = MemberParamsSchema.parse(req.params);
      const input = ChangeMemberRoleInputSchema.parse(req.body);
      res.json(await changeMemberRole(db, actorOf(req.actor), userId, input, deps.now()));
    })
    .post('/members/:userId/disable', allow('owner'), async (req, res) => {
      const { userId } = MemberParamsSchema.parse(req.params);
      res.json(await setMemberActive(db, actorOf(req.actor), userId, false, deps.now()));
    })
    .post('/members/:userId/enable', allow('owner'), async (req, res) => {
      const { userId } = MemberParamsSchema.parse(req.params);
      res.json(await setMemberActive(db, actorOf(req.actor), userId, true, deps.now()));
    })
    .delete('/members/:userId', allow('owner'), async (req, res) => {
      const { userId } = MemberParamsSchema.parse(req.params);
      await removeMember(db, actorOf(req.actor), userId, deps.now());
      res.status(204).end();
    })
    .get('/members/:userId/sessions', allow('owner'), async (req, res) => {
      const { userId } = MemberParamsSchema.parse(req.params);
      res.json({ sessions: await listMemberSessions(db, actorOf(req.actor), userId) });
    })
    .delete('/members/:userId/sessions', allow('owner'), async (req, res) => {
      const { userId } = MemberParamsSchema.parse(req.params);
      await endAllMemberSessions(db, actorOf(req.actor), userId, deps.now());
      // Otherwise express-session would save the owner's own current session again.
      if (userId === req.actor?.userId) await destroySession(req);
      res.status(204).end();
    })
    .get('/invites', allow('owner'), async (req, res) => {
      res.json({ invites: await listInvites(db, actorOf(req.actor), deps.now()) });
    })
    .post('/invites', allow('owner'), async (req, res) => {
      const input = CreateInviteInputSchema.parse(req.body);
      const actor = actorOf(req.actor);
      const now = deps.now();
      res.status(201).json(await createInvite(db, actor, input, now, (tx, created) => queueInviteMail(tx, actor, created, config.publicBaseUrl, now)));
    })
    .delete('/invites/:inviteId', allow('owner'), async (req, res) => {
      const { inviteId } = InviteParamsSchema.parse(req.params);
      await revokeInvite(db, actorOf(req.actor), inviteId, deps.now());
      res.status(204).end();
    })
    .post('/invites/preview', allow('public'), async (req, res) => {
      const { code } = PreviewInviteInputSchema.parse(req.body);
      res.json(await previewInvite(db, code, deps.now()));
    })
    .post('/invites/accept', allow('public'), async (req, res) => {
      const input = AcceptInviteInputSchema.parse(req.body);
      const member = await acceptInvite(db, input, config.hashParams, deps.now());
      await startMemberSession(req, member, deps.now());
      req.actor = { kind: 'member', businessId: member.businessId, userId: member.userId, name: member.displayName, role: member.role };
      res.status(201).json(await buildSessionInfo(deps, req));
    });
}
