import { and, asc, eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { businesses } from '../../db/schema/business';
import { memberships, users } from '../../db/schema/auth';
import { HttpError } from '../../lib/http-error';
import type { SignInInput, SignUpInput, Role } from '../../../shared/contracts/auth';
import { appendRecordEvent } from '../records/record-events.service';
import { dummyPasswordHash, hashPassword, needsRehash, verifyPassword, type HashParams } from './passwords';
import { isCommonPassword } from './common-passwords';

export interface SignedInMember {
  userId: string;
  businessId: string;
  role: Role;
  displayName: string;
}

// One answer for an unknown e-mail and a wrong password, so sign-in reveals nothing about accounts.
const BAD_CREDENTIALS = new HttpError(401, 'unauthenticated', 'That e-mail and password do not match an active account.');

export function assertAcceptablePassword(password: string, field = 'password'): void {
  if (isCommonPassword(password)) {
    throw new HttpError(400, 'validation_failed', 'Choose a less common password.', {
      [field]: ['That password is on the list of commonly used passwords. Choose another; a short phrase works well.'],
    });
  }
}

export async function signUp(db: Db, input: SignUpInput, hashParams?: HashParams, now = new Date()): Promise<SignedInMember> {
  assertAcceptablePassword(input.password);
  const passwordHash = await hashPassword(input.password, hashParams);
  return db.transaction(async (tx) => {
    const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, input.email));
    if (existing) throw new HttpError(409, 'conflict', 'An account with that e-mail already exists. Sign in instead.', { email: ['An account with that e-mail already exists.'] });
    const [business] = await tx.insert(businesses).values({ name: input.businessName }).returning();
    const [user] = await tx.insert(users).values({ email: input.email, displayName: input.displayName, passwordHash }).returning();
    await tx.insert(memberships).values({ businessId: business!.id, userId: user!.id, role: 'owner' });
    const actor = { businessId: business!.id, userId: user!.id, name: user!.displayName, role: 'owner' as const };
    await appendRecordEvent(tx, actor, { entityType: 'business', entityId: business!.id, action: 'create', payload: { name: business!.name } }, now);
    await appendRecordEvent(tx, actor, { entityType: 'member', entityId: user!.id, action: 'create', payload: { role: 'owner', displayName: user!.displayName } }, now);
    return { userId: user!.id, businessId: business!.id, role: 'owner', displayName: user!.displayName };
  });
}

export async function signIn(db: Db, input: SignInInput, hashParams?: HashParams): Promise<SignedInMember> {
  const [user] = await db.select().from(users).where(eq(users.email, input.email));
  if (!user) {
    await verifyPassword(await dummyPasswordHash(), input.password);
    throw BAD_CREDENTIALS;
  }
  if (!(await verifyPassword(user.passwordHash, input.password))) throw BAD_CREDENTIALS;
  const [membership] = await db
    .select()
    .from(memberships)
    .where(and(eq(memberships.userId, user.id), eq(memberships.isActive, true)))
    .orderBy(asc(memberships.createdAt))
    .limit(1);
  if (!membership) throw BAD_CREDENTIALS;
  if (needsRehash(user.passwordHash, hashParams)) {
    const passwordHash = await hashPassword(input.password, hashParams);
    await db.update(users).set({ passwordHash, updatedAt: new Date() }).where(eq(users.id, user.id));
  }
  return { userId: user.id, businessId: membership.businessId, role: membership.role, displayName: user.displayName };
}
