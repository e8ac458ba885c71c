import { pgTable, text, uuid, integer, jsonb, uniqueIndex, index } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';
import type { RuleProfile } from '../../../shared/contracts/rule-profiles';

/** A business's own rule profile: the identity; its content lives in append-only versions. */
export const customRuleProfiles = pgTable(
  'custom_rule_profiles',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    /** The shipped or custom profile it was copied from. */
    basedOnId: text().notNull(),
    ...timestamps,
  },
  (t) => [index('custom_rule_profiles_business_id_idx').on(t.businessId)],
);

/**
 * Append-only: each edit is a new version with a reason; the highest version is in force. `profile` is a
 * whole RuleProfile validated with RuleProfileSchema, with `id` equal to the custom profile's id.
 */
export const customRuleProfileVersions = pgTable(
  'custom_rule_profile_versions',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    profileId: uuid().notNull().references(() => customRuleProfiles.id),
    version: integer().notNull(),
    profile: jsonb().$type<RuleProfile>().notNull(),
    reason: text(),
    createdByUserId: uuid().references(() => users.id),
    ...timestamps,
  },
  (t) => [
    uniqueIndex('custom_rule_profile_versions_profile_id_version_key').on(t.profileId, t.version),
    index('custom_rule_profile_versions_business_id_idx').on(t.businessId),
  ],
);
