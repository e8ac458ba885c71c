import { z } from 'zod';

export const ROLES = ['owner', 'baker', 'helper'] as const;
export const RoleSchema = z.enum(ROLES);
export type Role = z.infer<typeof RoleSchema>;

// A5-6.2.1 / 6.2.9: at least 8, up to 128 characters, no composition rules.
export const PasswordSchema = z
  .string()
  .min(8, 'Use at least 8 characters')
  .max(128, 'Keep the password to 128 characters or fewer');

export const EmailSchema = z.string().trim().toLowerCase().pipe(z.email('Enter an e-mail address such as name@example.com'));

export const SignInInputSchema = z.object({
  email: EmailSchema,
  password: z.string().min(1, 'Enter your password').max(1024, 'That password is too long'),
});
export type SignInInput = z.infer<typeof SignInInputSchema>;

export const SignUpInputSchema = z.object({
  businessName: z.string().trim().min(1, 'Enter the business name').max(120, 'Keep the name under 120 characters'),
  displayName: z.string().trim().min(1, 'Enter your name').max(120, 'Keep the name under 120 characters'),
  email: EmailSchema,
  password: PasswordSchema,
});
export type SignUpInput = z.infer<typeof SignUpInputSchema>;

export const ChangePasswordInputSchema = z.object({
  currentPassword: z.string().min(1, 'Enter your current password'),
  newPassword: PasswordSchema,
  endOtherSessions: z.boolean().default(true),
}).strict();
export type ChangePasswordInput = z.infer<typeof ChangePasswordInputSchema>;

export const SessionUserSchema = z.object({
  id: z.string().uuid(),
  email: z.string(),
  displayName: z.string(),
  role: RoleSchema,
});
export const SessionBusinessSchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  timeZone: z.string(),
  ruleProfileId: z.string(),
  isDemo: z.boolean(),
});

export const DemoAccountSchema = z.object({ email: z.string(), password: z.string(), role: RoleSchema, displayName: z.string() });
export type DemoAccount = z.infer<typeof DemoAccountSchema>;

/** GET /api/auth/session: who is signed in (or nobody), the CSRF token to send back, and demo hints. */
export const SessionInfoSchema = z.object({
  kind: z.enum(['anonymous', 'member', 'device', 'inspector']),
  user: SessionUserSchema.nullable(),
  business: SessionBusinessSchema.nullable(),
  csrfToken: z.string(),
  idleExpiresAt: z.string().nullable(),
  absoluteExpiresAt: z.string().nullable(),
  signupEnabled: z.boolean(),
  demoAccounts: z.array(DemoAccountSchema),
});
export type SessionInfo = z.infer<typeof SessionInfoSchema>;
