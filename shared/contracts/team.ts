import { z } from 'zod';
import { EmailSchema, PasswordSchema, RoleSchema } from './auth';

export const NameSchema = z.string().trim().min(1, 'Enter a name').max(120, 'Keep the name under 120 characters');
const UuidSchema = z.string().uuid('That id is not valid');

/**
 * One member of the business. Owners get every field; bakers and helpers get only userId,
 * displayName and role (the optional fields are left out of their answer).
 */
export const MemberSchema = z.object({
  userId: z.string().uuid(),
  displayName: z.string(),
  role: RoleSchema,
  email: z.string().optional(),
  isActive: z.boolean().optional(),
  joinedAt: z.string().optional(),
});
export type Member = z.infer<typeof MemberSchema>;

/** GET /api/team/members */
export const MemberListSchema = z.object({ members: z.array(MemberSchema) });
export type MemberList = z.infer<typeof MemberListSchema>;

/** Params of /api/team/members/:userId… */
export const MemberParamsSchema = z.object({ userId: UuidSchema });

/** PATCH /api/team/members/:userId (owner): only the role can change here. */
export const ChangeMemberRoleInputSchema = z.object({ role: RoleSchema }).strict();
export type ChangeMemberRoleInput = z.infer<typeof ChangeMemberRoleInputSchema>;

export const INVITE_STATUSES = ['pending', 'accepted', 'revoked', 'expired'] as const;
export const InviteSchema = z.object({
  id: z.string().uuid(),
  email: z.string(),
  displayName: z.string().nullable(),
  role: RoleSchema,
  status: z.enum(INVITE_STATUSES),
  invitedBy: z.string(),
  createdAt: z.string(),
  expiresAt: z.string(),
});
export type Invite = z.infer<typeof InviteSchema>;

/** GET /api/team/invites (owner): invites not yet accepted, revoked or expired. */
export const InviteListSchema = z.object({ invites: z.array(InviteSchema) });
export type InviteList = z.infer<typeof InviteListSchema>;

/** POST /api/team/invites (owner). */
export const CreateInviteInputSchema = z
  .object({
    email: EmailSchema,
    role: RoleSchema,
    displayName: NameSchema.optional(),
  })
  .strict();
export type CreateInviteInput = z.infer<typeof CreateInviteInputSchema>;

/** 201 answer of POST /api/team/invites: the code is shown this once and never stored in clear. */
export const CreatedInviteSchema = z.object({ invite: InviteSchema, code: z.string() });
export type CreatedInvite = z.infer<typeof CreatedInviteSchema>;

export const InviteParamsSchema = z.object({ inviteId: UuidSchema });

const InviteCodeSchema = z.string().trim().min(1, 'Enter the invite code').max(200, 'That invite code is not valid');

/** POST /api/team/invites/preview (public): what a code invites to, before choosing a password. */
export const PreviewInviteInputSchema = z.object({ code: InviteCodeSchema }).strict();
export const InvitePreviewSchema = z.object({
  businessName: z.string(),
  email: z.string(),
  role: RoleSchema,
  displayName: z.string().nullable(),
  /** True when that e-mail already has a Crumbtrail account: accept then asks for its current password. */
  hasAccount: z.boolean(),
  expiresAt: z.string(),
});
export type InvitePreview = z.infer<typeof InvitePreviewSchema>;

/**
 * POST /api/team/invites/accept (public). Creates the account (or, for an existing account, checks
 * its password and adds the membership) and signs in; answers SessionInfoSchema.
 */
export const AcceptInviteInputSchema = z
  .object({
    code: InviteCodeSchema,
    displayName: NameSchema,
    password: PasswordSchema,
  })
  .strict();
export type AcceptInviteInput = z.infer<typeof AcceptInviteInputSchema>;
