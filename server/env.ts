import { z } from 'zod';

// The only reader of process.env: every setting is parsed once at start.
const EnvSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(5180),
  DATABASE_URL: z.string().url('DATABASE_URL must be a postgres:// URL'),
  MIGRATION_DATABASE_URL: z.string().url('MIGRATION_DATABASE_URL must be a postgres:// URL').optional(),
  PUBLIC_BASE_URL: z.string().url('PUBLIC_BASE_URL must be a full URL such as https://crumbs.example.com'),
  SESSION_SECRET: z.string().min(32, 'SESSION_SECRET must be at least 32 characters'),
  DEMO_MODE: z.enum(['true', 'false']).default('false').transform((v) => v === 'true'),
  SIGNUP_ENABLED: z.enum(['true', 'false']).default('true').transform((v) => v === 'true'),
  TRUST_PROXY: z.enum(['true', 'false']).default('false').transform((v) => v === 'true'),
  DATA_DIR: z.string().default('.data'),
  UPLOAD_DIR: z.string().optional(),
  SMTP_URL: z.string().optional(),
  MAIL_FROM: z.string().default('Crumbtrail <no-reply@crumbtrail.invalid>'),
  /** Port of the local SMTP stand-in used when SMTP_URL is not set (0 = any free port). */
  MAIL_CAPTURE_PORT: z.coerce.number().int().min(0).max(65535).default(0),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
});

export type Env = z.infer<typeof EnvSchema>;

export function readEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const parsed = EnvSchema.safeParse(source);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.') || '(env)'}: ${i.message}`);
    console.error(`Crumbtrail cannot start; fix these settings:\n${lines.join('\n')}`);
    process.exit(1);
  }
  const env = parsed.data;
  if (!env.DEMO_MODE && env.NODE_ENV === 'production' && !env.PUBLIC_BASE_URL.startsWith('https://')) {
    console.error('Crumbtrail cannot start: PUBLIC_BASE_URL must use https:// outside demo mode.');
    process.exit(1);
  }
  return env;
}
