import { and, asc, desc, eq } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { businesses } from '../../db/schema/business';
import { customRuleProfiles, customRuleProfileVersions } from '../../db/schema/rule-profiles';
import { users } from '../../db/schema/auth';
import { appendRecordEvent } from '../records/record-events.service';
import { badRequest, conflict, notFound } from '../../lib/http-error';
import type { Actor } from '../../lib/actor';
import { RuleProfileSchema, type RuleProfile, type RuleSource } from '../../../shared/contracts/rule-profiles';
import type {
  CopyRuleProfileInput, RuleProfileDetail, RuleProfileSummary, SaveRuleProfileVersionInput,
} from '../../../shared/contracts/custom-rule-profiles';
import { copyRuleProfile as copyProfile, getRuleProfile, SHIPPED_RULE_PROFILES } from '../../../shared/domain/rule-profiles';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

type VersionRow = typeof customRuleProfileVersions.$inferSelect;

async function customVersions(db: DbOrTx, businessId: string, profileId?: string): Promise<VersionRow[]> {
  const where = [eq(customRuleProfileVersions.businessId, businessId)];
  if (profileId) where.push(eq(customRuleProfileVersions.profileId, profileId));
  return db.select().from(customRuleProfileVersions).where(and(...where)).orderBy(asc(customRuleProfileVersions.profileId), asc(customRuleProfileVersions.version));
}

/**
 * A rule profile the business may use: a shipped one by id, or one of its own custom profiles (current
 * version). Null when neither exists (another business's custom profile is never returned).
 */
export async function loadRuleProfile(db: DbOrTx, businessId: string, profileId: string): Promise<{ profile: RuleProfile; version: number | null } | null> {
  const shipped = getRuleProfile(profileId);
  if (shipped) return { profile: shipped, version: null };
  if (!UUID.test(profileId)) return null;
  const [row] = await db
    .select()
    .from(customRuleProfileVersions)
    .where(and(eq(customRuleProfileVersions.businessId, businessId), eq(customRuleProfileVersions.profileId, profileId)))
    .orderBy(desc(customRuleProfileVersions.version))
    .limit(1);
  return row ? { profile: row.profile, version: row.version } : null;
}

/** The business's chosen rule profile (falls back to the US federal baseline if the choice is gone). */
export async function businessRuleProfile(db: DbOrTx, businessId: string): Promise<RuleProfile> {
  const [b] = await db.select({ ruleProfileId: businesses.ruleProfileId }).from(businesses).where(eq(businesses.id, businessId));
  if (!b) throw notFound('That business');
  return (await loadRuleProfile(db, businessId, b.ruleProfileId))?.profile ?? SHIPPED_RULE_PROFILES[0]!;
}

/** Every RuleSource in a profile, to count the unverified ones. */
export function profileSources(p: RuleProfile): RuleSource[] {
  return [
    p.effectiveSource, p.allergenRegime.source, p.homeKitchenStatement.source, p.tcsStatement.source,
    ...p.requiredLabelElements.map((e) => e.source), ...p.tcsRequiredLabelElements.map((e) => e.source),
    p.netQuantity.source, p.salesCap.source, p.salesChannels.source, p.allowsTcsFoods.source, p.holdingPolicy.source, p.sanitisers.source,
  ];
}

function summary(p: RuleProfile, version: number | null, inUse: string): RuleProfileSummary {
  return {
    id: p.id, name: p.name, jurisdiction: p.jurisdiction, effectiveFrom: p.effectiveFrom, effectiveTo: p.effectiveTo,
    isCustom: p.isCustom, basedOnId: p.basedOnId, version, unverifiedCount: profileSources(p).filter((s) => !s.verified).length, isInUse: p.id === inUse,
  };
}

async function chosenProfileId(db: DbOrTx, businessId: string): Promise<string> {
  const [b] = await db.select({ id: businesses.ruleProfileId }).from(businesses).where(eq(businesses.id, businessId));
  return b?.id ?? '';
}

/** Shipped profiles, then the business's own (current versions). */
export async function listRuleProfiles(db: Db, actor: Actor): Promise<RuleProfileSummary[]> {
  const inUse = await chosenProfileId(db, actor.businessId);
  const latest = new Map<string, VersionRow>();
  for (const r of await customVersions(db, actor.businessId)) latest.set(r.profileId, r);
  return [
    ...SHIPPED_RULE_PROFILES.map((p) => summary(p, null, inUse)),
    ...[...latest.values()].sort((a, b) => a.profile.name.localeCompare(b.profile.name)).map((r) => summary(r.profile, r.version, inUse)),
  ];
}

export async function getRuleProfileDetail(db: DbOrTx, actor: Actor, id: string): Promise<RuleProfileDetail> {
  const inUse = await chosenProfileId(db, actor.businessId);
  const shipped = getRuleProfile(id);
  if (shipped) return { profile: shipped, version: null, versions: [], isInUse: id === inUse };
  if (!UUID.test(id)) throw notFound('That rule profile');
  const rows = await db
    .select({ v: customRuleProfileVersions, by: users.displayName })
    .from(customRuleProfileVersions)
    .leftJoin(users, eq(users.id, customRuleProfileVersions.createdByUserId))
    .where(and(eq(customRuleProfileVersions.businessId, actor.businessId), eq(customRuleProfileVersions.profileId, id)))
    .orderBy(asc(customRuleProfileVersions.version));
  const last = rows[rows.length - 1];
  if (!last) throw notFound('That rule profile');
  return {
    profile: last.v.profile,
    version: last.v.version,
    versions: rows.map((r) => ({ version: r.v.version, reason: r.v.reason, createdAt: r.v.createdAt.toISOString(), createdBy: r.by })),
    isInUse: id === inUse,
  };
}

/** The owner copies a shipped or custom profile into an editable custom one (version 1). */
export async function copyRuleProfile(db: Db, actor: Actor, input: CopyRuleProfileInput, now: Date): Promise<RuleProfileDetail> {
  const base = await loadRuleProfile(db, actor.businessId, input.basedOnId);
  if (!base) throw badRequest('That rule profile does not exist.', { basedOnId: ['Choose a profile from the list'] });
  const id = await db.transaction(async (tx) => {
    const [identity] = await tx.insert(customRuleProfiles).values({ businessId: actor.businessId, basedOnId: base.profile.id, createdAt: now, updatedAt: now }).returning();
    const profile = copyProfile(base.profile, identity!.id, input.name);
    await tx.insert(customRuleProfileVersions).values({
      businessId: actor.businessId, profileId: identity!.id, version: 1, profile, reason: `Copied from ${base.profile.name}`,
      createdByUserId: actor.userId, createdAt: now, updatedAt: now,
    });
    await appendRecordEvent(tx, actor, { entityType: 'rule_profile', entityId: identity!.id, action: 'create', payload: { version: 1, basedOnId: base.profile.id, name: input.name } }, now);
    return identity!.id;
  });
  return getRuleProfileDetail(db, actor, id);
}

/**
 * The owner saves an edited custom profile as a new version. The id, custom flag and origin are kept from
 * the stored profile whatever the body says; a stale basedOnVersion answers 409.
 */
export async function saveRuleProfileVersion(db: Db, actor: Actor, id: string, input: SaveRuleProfileVersionInput, now: Date): Promise<RuleProfileDetail> {
  if (getRuleProfile(id)) throw badRequest('Shipped profiles cannot be edited. Copy it first, then edit the copy.');
  const current = await getRuleProfileDetail(db, actor, id);
  await db.transaction(async (tx) => {
    // Lock the identity row (versions are append-only) so two saves cannot both become version N + 1.
    await tx.select({ id: customRuleProfiles.id }).from(customRuleProfiles).where(eq(customRuleProfiles.id, id)).for('update');
    const [head] = await tx
      .select({ version: customRuleProfileVersions.version })
      .from(customRuleProfileVersions)
      .where(eq(customRuleProfileVersions.profileId, id))
      .orderBy(desc(customRuleProfileVersions.version))
      .limit(1);
    const version = head!.version;
    if (input.basedOnVersion !== version) throw conflict(`Someone saved version ${version} of this profile while you were editing. Reload it and make your change again.`);
    const profile = RuleProfileSchema.parse({ ...input.profile, id, isCustom: true, basedOnId: current.profile.basedOnId });
    await tx.insert(customRuleProfileVersions).values({
      businessId: actor.businessId, profileId: id, version: version + 1, profile, reason: input.reason,
      createdByUserId: actor.userId, createdAt: now, updatedAt: now,
    });
    await appendRecordEvent(tx, actor, { entityType: 'rule_profile', entityId: id, action: 'update', payload: { version: version + 1 }, reason: input.reason }, now);
  });
  return getRuleProfileDetail(db, actor, id);
}
