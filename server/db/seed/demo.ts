import { eq } from 'drizzle-orm';
import type { Db } from '../client';
import { businesses } from '../schema/business';
import { memberships, users } from '../schema/auth';
import { hashPassword } from '../../features/auth/passwords';
import { appendRecordEvent } from '../../features/records/record-events.service';
import type { Actor } from '../../lib/actor';
import { DEMO_ACCOUNTS } from './demo-accounts';
import type { Role } from '../../../shared/contracts/auth';

/** What every seed step gets: the invented demo business, its people, and the clock. */
export interface SeedContext {
  db: Db;
  now: Date;
  businessId: string;
  actors: Record<Role, Actor>;
  publicBaseUrl: string;
  uploadDir: string;
  /** Lets a later step find what an earlier one made (e.g. recipe ids by name). */
  shared: Map<string, unknown>;
}
export interface SeedStep { name: string; run: (ctx: SeedContext) => Promise<void> }

/**
 * The invented demo bakery: Juniper Lane Cake Pops, a home kitchen in the invented town of Millbrook.
 * Feature steps run in dependency order after the business and its people exist.
 */
export async function seedDemo(db: Db, steps: SeedStep[], options: { now?: Date; publicBaseUrl: string; uploadDir: string; log?: (m: string) => void }): Promise<boolean> {
  const log = options.log ?? (() => undefined);
  const [existing] = await db.select({ id: businesses.id }).from(businesses).where(eq(businesses.isDemo, true)).limit(1);
  if (existing) {
    log('Demo data already loaded.');
    return false;
  }
  const now = options.now ?? new Date();
  // One transaction: a step that fails leaves no half-loaded demo behind (services nest as savepoints).
  return db.transaction(async (transaction) => {
  const db = transaction as unknown as Db;
  const [business] = await db
    .insert(businesses)
    .values({
      name: 'Juniper Lane Cake Pops',
      addressLine: '14 Juniper Lane',
      city: 'Millbrook',
      region: 'TX',
      postalCode: '78999',
      country: 'US',
      phone: '(555) 010-4477',
      email: 'hello@juniperlane.test',
      registrationNumber: 'CF-DEMO-0427',
      registrationAuthority: 'Millbrook County Health Department (invented)',
      timeZone: 'America/Chicago',
      ruleProfileId: 'us-tx-2025-09',
      lotCodePrefix: 'JL',
      isDemo: true,
    })
    .returning();
  const businessId = business!.id;
  const actors = {} as Record<Role, Actor>;
  for (const account of DEMO_ACCOUNTS) {
    const [user] = await db.insert(users).values({ email: account.email, displayName: account.displayName, passwordHash: await hashPassword(account.password) }).returning();
    await db.insert(memberships).values({ businessId, userId: user!.id, role: account.role });
    actors[account.role] = { kind: 'member', businessId, userId: user!.id, name: account.displayName, role: account.role };
  }
  await db.transaction(async (tx) => {
    await appendRecordEvent(tx, actors.owner, { entityType: 'business', entityId: businessId, action: 'create', payload: { name: business!.name } }, now);
    for (const role of ['owner', 'baker', 'helper'] as const) {
      await appendRecordEvent(tx, actors.owner, { entityType: 'member', entityId: actors[role].userId!, action: 'create', payload: { role, displayName: actors[role].name } }, now);
    }
  });
  const ctx: SeedContext = { db, now, businessId, actors, publicBaseUrl: options.publicBaseUrl, uploadDir: options.uploadDir, shared: new Map() };
  for (const step of steps) {
    log(`Demo: ${step.name}`);
    await step.run(ctx);
  }
  return true;
  });
}
