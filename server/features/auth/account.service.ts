import { eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { users } from '../../db/schema/auth';
import type { Actor } from '../../lib/actor';
import { badRequest, notFound } from '../../lib/http-error';
import type { ChangePasswordInput } from '../../../shared/contracts/auth';
import type { SessionSummary, UpdateProfileInput } from '../../../shared/contracts/account';
import { appendRecordEvent } from '../records/record-events.service';
import { hashPassword, verifyPassword, type HashParams } from './passwords';
import { assertAcceptablePassword } from './auth.service';
import { endMemberSessions, memberSessionsOf, sessionHandle, toSessionSummary } from './session-store';

type MemberActor = Actor & { userId: string };

/**
 * Changes the signed-in member's password (A5-6.2.2/6.2.3: the current one is required). With
 * endOtherSessions, every other session of this person ends (A5-7.4.3); the caller re-issues the
 * current session id. Returns how many sessions ended.
 */
export async function changePassword(db: Db, actor: MemberActor, input: ChangePasswordInput, currentSid: string, hashParams: HashParams, now: Date): Promise<number> {
  const [user] = await db.select().from(users).where(eq(users.id, actor.userId));
  if (!user) throw notFound('That account');
  if (!(await verifyPassword(user.passwordHash, input.currentPassword))) {
    throw badRequest('The current password is not right.', { currentPassword: ['That is not your current password.'] });
  }
  assertAcceptablePassword(input.newPassword, 'newPassword');
  const passwordHash = await hashPassword(input.newPassword, hashParams);
  return db.transaction(async (tx) => {
    await tx.update(users).set({ passwordHash, passwordChangedAt: now, updatedAt: now }).where(eq(users.id, actor.userId));
    const ended = input.endOtherSessions ? await endMemberSessions(tx, actor.userId, { exceptSid: currentSid }) : 0;
    await appendRecordEvent(tx, actor, { entityType: 'member', entityId: actor.userId, action: 'change_password', payload: { endedOtherSessions: ended } }, now);
    return ended;
  });
}

export async function updateProfile(db: Db, actor: MemberActor, input: UpdateProfileInput, now: Date): Promise<{ displayName: string }> {
  return db.transaction(async (tx) => {
    await tx.update(users).set({ displayName: input.displayName, updatedAt: now }).where(eq(users.id, actor.userId));
    await appendRecordEvent(tx, actor, { entityType: 'member', entityId: actor.userId, action: 'update_profile', payload: { displayName: input.displayName } }, now);
    return { displayName: input.displayName };
  });
}

/** The member's own sessions, in every business they belong to (A5-7.5.2). */
export async function listOwnSessions(db: Db, actor: MemberActor, currentSid: string): Promise<SessionSummary[]> {
  const rows = await memberSessionsOf(db, actor.userId);
  return rows.map((r) => toSessionSummary(r, currentSid)).sort((a, b) => b.lastSeenAt.localeCompare(a.lastSeenAt));
}

/** Ends one of the member's own sessions, named by its handle. */
export async function endOwnSession(db: Db, actor: MemberActor, handle: string, now: Date): Promise<void> {
  const rows = await memberSessionsOf(db, actor.userId);
  const target = rows.find((r) => sessionHandle(r.sid) === handle);
  if (!target) throw notFound('That session');
  await db.transaction(async (tx) => {
    await endMemberSessions(tx, actor.userId, { onlySid: target.sid });
    await appendRecordEvent(tx, actor, { entityType: 'member', entityId: actor.userId, action: 'end_session', payload: { session: handle } }, now);
  });
}
