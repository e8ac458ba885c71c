import { and, asc, eq, gt, isNull } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { memberships, users } from '../../db/schema/auth';
import { businesses } from '../../db/schema/business';
import { invites, type InviteRow } from '../../db/schema/team';
import type { Actor } from '../../lib/actor';
import { HttpError, badRequest, conflict, notFound } from '../../lib/http-error';
import { codeHash, newOneTimeCode } from '../../lib/tokens';
import type { Role } from '../../../shared/contracts/auth';
import type { AcceptInviteInput, ChangeMemberRoleInput, CreateInviteInput, CreatedInvite, Invite, InvitePreview, Member } from '../../../shared/contracts/team';
import type { SessionSummary } from '../../../shared/contracts/account';
import { appendRecordEvent } from '../records/record-events.service';
import { assertAcceptablePassword, type SignedInMember } from '../auth/auth.service';
import { hashPassword, verifyPassword, type HashParams } from '../auth/passwords';
import { endMemberSessions, memberSessionsOf, toSessionSummary } from '../auth/session-store';

// A5-6.4.1: invite codes are random (160 bits), short-lived and single-use.
export const INVITE_LIFETIME_MS = 72 * 60 * 60 * 1000;

const memberNotFound = () => notFound('That team member');

/** Owners see every member with e-mail and status; bakers and helpers see active members' names and roles only. */
export async function listMembers(db: Db, actor: Actor): Promise<Member[]> {
  const rows = await db
    .select({ userId: users.id, displayName: users.displayName, email: users.email, role: memberships.role, isActive: memberships.isActive, joinedAt: memberships.createdAt })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.businessId, actor.businessId))
    .orderBy(asc(users.displayName));
  if (actor.role === 'owner') return rows.map((r) => ({ ...r, joinedAt: r.joinedAt.toISOString() }));
  return rows.filter((r) => r.isActive).map((r) => ({ userId: r.userId, displayName: r.displayName, role: r.role }));
}

async function lockedMembership(tx: DbOrTx, businessId: string, userId: string) {
  // Team changes of one business run one at a time: locking every membership row in id order
  // avoids deadlocks and lets the last-owner check see a stable set of owners.
  await tx.select({ id: memberships.id }).from(memberships).where(eq(memberships.businessId, businessId)).orderBy(asc(memberships.id)).for('update');
  const [row] = await tx
    .select({ id: memberships.id, role: memberships.role, isActive: memberships.isActive, displayName: users.displayName })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.businessId, businessId), eq(memberships.userId, userId)))
    .for('update', { of: memberships });
  if (!row) throw memberNotFound();
  return row;
}

/** The business must always keep one active owner who can manage the team and its records. */
async function assertAnotherActiveOwner(tx: DbOrTx, businessId: string, userId: string, doing: string) {
  // The rows are already locked by lockedMembership, so two owners demoting each other cannot both succeed.
  const owners = await tx
    .select({ userId: memberships.userId })
    .from(memberships)
    .where(and(eq(memberships.businessId, businessId), eq(memberships.role, 'owner'), eq(memberships.isActive, true)));
  if (!owners.some((o) => o.userId !== userId)) {
    throw conflict(`You cannot ${doing} the last active owner. Make another member an owner first.`);
  }
}

export async function changeMemberRole(db: Db, actor: Actor, userId: string, input: ChangeMemberRoleInput, now: Date): Promise<Member> {
  await db.transaction(async (tx) => {
    const m = await lockedMembership(tx, actor.businessId, userId);
    if (m.role === input.role) return;
    if (m.role === 'owner' && m.isActive) await assertAnotherActiveOwner(tx, actor.businessId, userId, 'change the role of');
    await tx.update(memberships).set({ role: input.role, updatedAt: now }).where(eq(memberships.id, m.id));
    await appendRecordEvent(tx, actor, { entityType: 'member', entityId: userId, action: 'change_role', payload: { from: m.role, to: input.role } }, now);
  });
  return getMember(db, actor, userId);
}

/** Disabling ends all of the member's sessions in this business at once (A5-7.4.2). */
export async function setMemberActive(db: Db, actor: Actor, userId: string, isActive: boolean, now: Date): Promise<Member> {
  await db.transaction(async (tx) => {
    const m = await lockedMembership(tx, actor.businessId, userId);
    if (m.isActive === isActive) return;
    if (!isActive && m.role === 'owner') await assertAnotherActiveOwner(tx, actor.businessId, userId, 'disable');
    await tx.update(memberships).set({ isActive, updatedAt: now }).where(eq(memberships.id, m.id));
    const endedSessions = isActive ? 0 : await endMemberSessions(tx, userId, { businessId: actor.businessId });
    await appendRecordEvent(tx, actor, { entityType: 'member', entityId: userId, action: isActive ? 'enable' : 'disable', payload: isActive ? {} : { endedSessions } }, now);
  });
  return getMember(db, actor, userId);
}

/** Removes the membership (the person's account and their past records stay). */
export async function removeMember(db: Db, actor: Actor, userId: string, now: Date): Promise<void> {
  await db.transaction(async (tx) => {
    const m = await lockedMembership(tx, actor.businessId, userId);
    if (m.role === 'owner' && m.isActive) await assertAnotherActiveOwner(tx, actor.businessId, userId, 'remove');
    await tx.delete(memberships).where(eq(memberships.id, m.id));
    const endedSessions = await endMemberSessions(tx, userId, { businessId: actor.businessId });
    await appendRecordEvent(tx, actor, { entityType: 'member', entityId: userId, action: 'remove', payload: { role: m.role, displayName: m.displayName, endedSessions } }, now);
  });
}

async function getMember(db: Db, actor: Actor, userId: string): Promise<Member> {
  const member = (await listMembers(db, actor)).find((m) => m.userId === userId);
  if (!member) throw memberNotFound();
  return member;
}

/** A member's sessions in this business (owner: A5-7.4.5). */
export async function listMemberSessions(db: Db, actor: Actor, userId: string): Promise<SessionSummary[]> {
  await getMember(db, actor, userId);
  const rows = await memberSessionsOf(db, userId, actor.businessId);
  return rows.map((r) => toSessionSummary(r, actor.sessionId));
}

/** Ends every session a member has in this business (owner: A5-7.4.5). */
export async function endAllMemberSessions(db: Db, actor: Actor, userId: string, now: Date): Promise<number> {
  await getMember(db, actor, userId);
  return db.transaction(async (tx) => {
    const endedSessions = await endMemberSessions(tx, userId, { businessId: actor.businessId });
    await appendRecordEvent(tx, actor, { entityType: 'member', entityId: userId, action: 'end_sessions', payload: { endedSessions } }, now);
    return endedSessions;
  });
}

function inviteStatus(row: InviteRow, now: Date): Invite['status'] {
  if (row.acceptedAt) return 'accepted';
  if (row.revokedAt) return 'revoked';
  return row.expiresAt <= now ? 'expired' : 'pending';
}

function toInvite(row: InviteRow, invitedBy: string, now: Date): Invite {
  return {
    id: row.id,
    email: row.email,
    displayName: row.displayName,
    role: row.role,
    status: inviteStatus(row, now),
    invitedBy,
    createdAt: row.createdAt.toISOString(),
    expiresAt: row.expiresAt.toISOString(),
  };
}

/**
 * Creates an invite and returns its one-time code, which exists only in this answer (the table
 * keeps its SHA-256). The mail feature calls this and e-mails `code`; the code never goes in a URL.
 */
export async function createInvite(
  db: Db,
  actor: Actor,
  input: CreateInviteInput,
  now: Date,
  /** Runs in the same transaction (the mail feature queues the invite e-mail here). */
  afterCreate?: (tx: DbOrTx, created: CreatedInvite) => Promise<unknown>,
): Promise<CreatedInvite> {
  const code = newOneTimeCode();
  return db.transaction(async (tx) => {
    const [already] = await tx
      .select({ id: memberships.id })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.businessId, actor.businessId), eq(users.email, input.email)));
    if (already) throw conflict('That person is already on the team.', { email: ['That e-mail already belongs to a team member.'] });
    const [row] = await tx
      .insert(invites)
      .values({
        businessId: actor.businessId,
        email: input.email,
        displayName: input.displayName ?? null,
        role: input.role,
        codeHash: codeHash(code),
        invitedByUserId: actor.userId!,
        expiresAt: new Date(now.getTime() + INVITE_LIFETIME_MS),
        createdAt: now,
        updatedAt: now,
      })
      .returning();
    await appendRecordEvent(tx, actor, { entityType: 'invite', entityId: row!.id, action: 'create', payload: { email: input.email, role: input.role } }, now);
    const created = { invite: toInvite(row!, actor.name, now), code };
    await afterCreate?.(tx, created);
    return created;
  });
}

/** Pending invites only (not accepted, revoked or expired). */
export async function listInvites(db: Db, actor: Actor, now: Date): Promise<Invite[]> {
  const rows = await db
    .select({ invite: invites, invitedBy: users.displayName })
    .from(invites)
    .innerJoin(users, eq(users.id, invites.invitedByUserId))
    .where(and(eq(invites.businessId, actor.businessId), isNull(invites.acceptedAt), isNull(invites.revokedAt), gt(invites.expiresAt, now)))
    .orderBy(asc(invites.createdAt));
  return rows.map((r) => toInvite(r.invite, r.invitedBy, now));
}

export async function revokeInvite(db: Db, actor: Actor, inviteId: string, now: Date): Promise<void> {
  await db.transaction(async (tx) => {
    const [row] = await tx.select().from(invites).where(and(eq(invites.id, inviteId), eq(invites.businessId, actor.businessId))).for('update');
    if (!row) throw notFound('That invite');
    if (inviteStatus(row, now) !== 'pending') throw conflict('That invite is no longer pending.');
    await tx.update(invites).set({ revokedAt: now, updatedAt: now }).where(eq(invites.id, row.id));
    await appendRecordEvent(tx, actor, { entityType: 'invite', entityId: row.id, action: 'revoke', payload: { email: row.email } }, now);
  });
}

// One answer for an unknown, used, revoked or expired code: the code is the only secret.
const badCode = () => new HttpError(410, 'gone', 'That invite code is not valid any more. Ask the owner for a new invite.', { code: ['That invite code is not valid any more.'] });

async function pendingInviteByCode(tx: DbOrTx, code: string, now: Date, lock: boolean) {
  const query = tx.select().from(invites).where(eq(invites.codeHash, codeHash(code)));
  const [row] = lock ? await query.for('update') : await query;
  if (!row || inviteStatus(row, now) !== 'pending') throw badCode();
  return row;
}

export async function previewInvite(db: Db, code: string, now: Date): Promise<InvitePreview> {
  const row = await pendingInviteByCode(db, code, now, false);
  const [business] = await db.select({ name: businesses.name }).from(businesses).where(eq(businesses.id, row.businessId));
  const [user] = await db.select({ id: users.id }).from(users).where(eq(users.email, row.email));
  return { businessName: business!.name, email: row.email, role: row.role, displayName: row.displayName, hasAccount: Boolean(user), expiresAt: row.expiresAt.toISOString() };
}

/**
 * Redeems an invite: a new person gets an account with the chosen password; someone who already
 * has an account proves it with that account's password and gains the membership. Single use.
 */
export async function acceptInvite(db: Db, input: AcceptInviteInput, hashParams: HashParams, now: Date): Promise<SignedInMember> {
  const preview = await pendingInviteByCode(db, input.code, now, false);
  const [existing] = await db.select().from(users).where(eq(users.email, preview.email));
  if (existing) {
    if (!(await verifyPassword(existing.passwordHash, input.password))) {
      throw badRequest('Enter the password of your existing account.', { password: ['That e-mail already has an account: enter its current password.'] });
    }
  } else {
    assertAcceptablePassword(input.password);
  }
  const passwordHash = existing ? null : await hashPassword(input.password, hashParams);
  return db.transaction(async (tx) => {
    const invite = await pendingInviteByCode(tx, input.code, now, true);
    let userId = existing?.id;
    let displayName = existing?.displayName ?? input.displayName;
    if (!userId) {
      const [user] = await tx.insert(users).values({ email: invite.email, displayName: input.displayName, passwordHash: passwordHash!, createdAt: now, updatedAt: now }).returning();
      userId = user!.id;
      displayName = user!.displayName;
    }
    const [member] = await tx.select({ id: memberships.id }).from(memberships).where(and(eq(memberships.businessId, invite.businessId), eq(memberships.userId, userId)));
    if (member) throw conflict('You are already on this team. Sign in instead.');
    await tx.insert(memberships).values({ businessId: invite.businessId, userId, role: invite.role, createdAt: now, updatedAt: now });
    await tx.update(invites).set({ acceptedAt: now, acceptedByUserId: userId, updatedAt: now }).where(eq(invites.id, invite.id));
    const actor = { businessId: invite.businessId, userId, name: displayName, role: invite.role as Role };
    await appendRecordEvent(tx, actor, { entityType: 'member', entityId: userId, action: 'join', payload: { role: invite.role, inviteId: invite.id, displayName } }, now);
    return { userId, businessId: invite.businessId, role: invite.role, displayName };
  });
}
