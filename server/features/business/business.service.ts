import { eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { businesses, type BusinessRow } from '../../db/schema/business';
import { appendRecordEvent } from '../records/record-events.service';
import { badRequest, notFound } from '../../lib/http-error';
import type { Actor } from '../../lib/actor';
import type { Business, UpdateBusinessInput } from '../../../shared/contracts/business';
import { loadRuleProfile } from '../rule-profiles/rule-profiles.service';

async function toBusiness(db: Db, b: BusinessRow): Promise<Business> {
  const profile = await loadRuleProfile(db, b.id, b.ruleProfileId);
  return {
    id: b.id, name: b.name, addressLine: b.addressLine, city: b.city, region: b.region, postalCode: b.postalCode, country: b.country,
    phone: b.phone, email: b.email, registrationNumber: b.registrationNumber, registrationAuthority: b.registrationAuthority,
    timeZone: b.timeZone, ruleProfileId: b.ruleProfileId, ruleProfileName: profile?.profile.name ?? 'Unknown profile',
    lotCodePrefix: b.lotCodePrefix, lotCodeTemplate: b.lotCodeScheme, isDemo: b.isDemo,
  };
}

async function row(db: Db, businessId: string): Promise<BusinessRow> {
  const [b] = await db.select().from(businesses).where(eq(businesses.id, businessId));
  if (!b) throw notFound('That business');
  return b;
}

export async function getBusiness(db: Db, actor: Actor): Promise<Business> {
  return toBusiness(db, await row(db, actor.businessId));
}

/** The owner edits the business profile; one record event lists every changed field (before and after). */
export async function updateBusiness(db: Db, actor: Actor, input: UpdateBusinessInput, now: Date): Promise<Business> {
  if (input.ruleProfileId !== undefined && !(await loadRuleProfile(db, actor.businessId, input.ruleProfileId))) {
    throw badRequest('That rule profile does not exist.', { ruleProfileId: ['Choose a rule profile from the list'] });
  }
  const { lotCodeTemplate, ...rest } = input;
  const patch: Partial<BusinessRow> = { ...rest, ...(lotCodeTemplate !== undefined ? { lotCodeScheme: lotCodeTemplate } : {}) };
  await db.transaction(async (tx) => {
    const [before] = await tx.select().from(businesses).where(eq(businesses.id, actor.businessId)).for('update');
    if (!before) throw notFound('That business');
    const changes: Record<string, { from: unknown; to: unknown }> = {};
    for (const [k, v] of Object.entries(patch) as [keyof BusinessRow, unknown][]) {
      if (before[k] !== v) changes[k === 'lotCodeScheme' ? 'lotCodeTemplate' : k] = { from: before[k], to: v };
    }
    if (Object.keys(changes).length === 0) return;
    await tx.update(businesses).set({ ...patch, updatedAt: now }).where(eq(businesses.id, actor.businessId));
    await appendRecordEvent(tx, actor, { entityType: 'business', entityId: actor.businessId, action: 'update', payload: { changes } }, now);
  });
  return getBusiness(db, actor);
}
