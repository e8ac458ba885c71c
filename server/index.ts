import { readEnv } from './env';
import { createLogger } from './lib/logger';
import { createDb, createPool } from './db/client';
import { createApp, defaultConfig } from './app';
import { sql } from 'drizzle-orm';
import { DEMO_ACCOUNTS } from './db/seed/demo-accounts';
import { sweepPartialUploads } from './lib/storage';
import { startMailCapture, type MailCapture } from './features/mail/mail-capture';
import { createMailTransport, runMailOnce } from './features/mail/mail.service';
import { startBackgroundJobs } from './features/mail/background-jobs';
import { runReminderScan } from './features/documents/documents.service';
import { runHoldingAlertScan } from './features/holding/holding-alerts';

const env = readEnv();
const logger = createLogger(env.LOG_LEVEL);
const pool = createPool(env.DATABASE_URL, logger);
const db = createDb(pool);

// Without a real SMTP server, mail goes to a local stand-in and shows on the owner's Sent mail page.
const mailCapture: MailCapture | undefined = env.SMTP_URL ? undefined : await startMailCapture({ db, port: env.MAIL_CAPTURE_PORT, logger });
const mailTransport = createMailTransport(env.SMTP_URL ?? `smtp://127.0.0.1:${mailCapture!.port}`);
if (mailCapture) logger.info({ event: 'mail_capture_start', port: mailCapture.port }, 'no SMTP_URL: mail is captured locally (Sent mail page)');

async function warnIfNotDurable() {
  // Records are legal evidence: these must stay on outside throw-away test clusters.
  try {
    for (const name of ['fsync', 'synchronous_commit', 'full_page_writes', 'data_checksums']) {
      const result = await db.execute(sql.raw(`show ${name}`));
      const value = String(Object.values(result.rows[0] ?? {})[0]);
      if (value !== 'on') logger.warn({ event: 'db_not_durable', setting: name, value }, `PostgreSQL ${name} is ${value}; records could be lost in a crash`);
    }
  } catch (err) {
    logger.warn({ err: (err as Error).message }, 'could not read PostgreSQL durability settings');
  }
}

const app = createApp({
  db,
  pool,
  logger,
  now: () => new Date(),
  config: defaultConfig({
    publicBaseUrl: env.PUBLIC_BASE_URL,
    sessionSecret: env.SESSION_SECRET,
    demoMode: env.DEMO_MODE,
    signupEnabled: env.SIGNUP_ENABLED,
    trustProxy: env.TRUST_PROXY,
    secureCookies: env.PUBLIC_BASE_URL.startsWith('https://') || env.TRUST_PROXY,
    dataDir: env.DATA_DIR,
    ...(env.UPLOAD_DIR ? { uploadDir: env.UPLOAD_DIR } : {}),
    staticDir: 'dist',
    demoAccounts: env.DEMO_MODE ? DEMO_ACCOUNTS : [],
    mailCapturing: !env.SMTP_URL,
  }),
});

await warnIfNotDurable();
const swept = await sweepPartialUploads(env.UPLOAD_DIR ?? `${env.DATA_DIR}/uploads`);
if (swept) logger.info({ event: 'uploads_swept', count: swept }, 'removed partial uploads left by a crash');
const now = () => new Date();
const backgroundJobs = startBackgroundJobs(
  [
    // Reminders first, so the ones queued this round go out in the same round.
    { name: 'document-reminders', run: () => runReminderScan({ db, now, publicBaseUrl: env.PUBLIC_BASE_URL }) },
    { name: 'holding-alerts', run: () => runHoldingAlertScan({ db, now }) },
    { name: 'mail', run: () => runMailOnce({ db, now, transport: mailTransport, from: env.MAIL_FROM, logger }) },
  ],
  { intervalMs: 15_000, logger },
);
const server = app.listen(env.PORT, env.HOST, () => {
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : env.PORT;
  logger.info({ event: 'app_start', port }, 'Crumbtrail is serving');
  console.log(`\n  Crumbtrail is running at http://${env.HOST}:${port}/${env.DEMO_MODE ? '  (demo mode: sign-in details are on the sign-in page)' : ''}\n  Press Ctrl-C to stop.\n`);
});

let stopping = false;
async function shutdown(signal: string, code = 0) {
  if (stopping) return;
  stopping = true;
  logger.info({ event: 'app_stop', signal }, 'shutting down');
  server.close();
  server.closeAllConnections?.();
  await backgroundJobs.stop();
  await mailCapture?.close();
  await pool.end().catch(() => undefined);
  process.exit(code);
}
process.on('SIGINT', () => void shutdown('SIGINT'));
process.on('SIGTERM', () => void shutdown('SIGTERM'));
process.on('unhandledRejection', (reason) => {
  logger.error({ event: 'unhandled_rejection', err: String((reason as Error)?.stack ?? reason) }, 'unhandled rejection');
  void shutdown('unhandledRejection', 1);
});
