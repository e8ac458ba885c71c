import { z } from 'zod';
import { NameSchema } from './team';

// POST /api/account/password takes ChangePasswordInputSchema from ./auth.

/** A signed-in session, named by an opaque handle (never the session token itself). */
export const SessionSummarySchema = z.object({
  id: z.string(),
  kind: z.enum(['member', 'device']),
  createdAt: z.string(),
  lastSeenAt: z.string(),
  userAgent: z.string().nullable(),
  isCurrent: z.boolean(),
});
export type SessionSummary = z.infer<typeof SessionSummarySchema>;

/** GET /api/account/sessions (own) and GET /api/team/members/:userId/sessions (owner). */
export const SessionListSchema = z.object({ sessions: z.array(SessionSummarySchema) });
export type SessionList = z.infer<typeof SessionListSchema>;

export const SessionParamsSchema = z.object({ sessionId: z.string().regex(/^[0-9a-f]{32}$/, 'That session id is not valid') });

/** PATCH /api/account/profile: a member may change only their own display name. */
export const UpdateProfileInputSchema = z.object({ displayName: NameSchema }).strict();
export type UpdateProfileInput = z.infer<typeof UpdateProfileInputSchema>;

/** Answer of POST /api/account/password. */
export const PasswordChangedSchema = z.object({ endedSessions: z.number().int(), csrfToken: z.string() });
export type PasswordChanged = z.infer<typeof PasswordChangedSchema>;
