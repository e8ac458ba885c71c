import { z } from 'zod';
import { RuleProfileSchema, type RuleProfile } from './rule-profiles';

/** One row of GET /api/rule-profiles: shipped profiles and the business's own copies. */
export interface RuleProfileSummary {
  id: string;
  name: string;
  jurisdiction: RuleProfile['jurisdiction'];
  effectiveFrom: string;
  effectiveTo: string | null;
  isCustom: boolean;
  basedOnId: string | null;
  /** Version of a custom profile; null for shipped ones. */
  version: number | null;
  /** How many values carry `verified: false`. */
  unverifiedCount: number;
  /** The business's chosen profile. */
  isInUse: boolean;
}

export interface RuleProfileVersionMeta { version: number; reason: string | null; createdAt: string; createdBy: string | null }

/** GET /api/rule-profiles/:id */
export interface RuleProfileDetail {
  profile: RuleProfile;
  version: number | null;
  versions: RuleProfileVersionMeta[];
  isInUse: boolean;
}

export const RuleProfileParamsSchema = z.object({ id: z.string().trim().min(1).max(64).regex(/^[a-z0-9-]+$/, 'That profile id is not valid') });

/** POST /api/rule-profiles (owner): copy a shipped or custom profile. */
export const CopyRuleProfileInputSchema = z.object({
  basedOnId: z.string('Choose the profile to copy').trim().min(1, 'Choose the profile to copy').max(64),
  name: z.string('Enter a name').trim().min(1, 'Enter a name').max(120, 'Keep the name under 120 characters'),
}).strict();
export type CopyRuleProfileInput = z.infer<typeof CopyRuleProfileInputSchema>;

/** POST /api/rule-profiles/:id/versions (owner): the edited profile as a new version. */
export const SaveRuleProfileVersionInputSchema = z.object({
  profile: RuleProfileSchema,
  reason: z.string('Say why you are changing the profile').trim().min(1, 'Say why you are changing the profile').max(500, 'Keep the reason under 500 characters'),
  basedOnVersion: z.number().int().positive(),
}).strict();
export type SaveRuleProfileVersionInput = z.input<typeof SaveRuleProfileVersionInputSchema>;
