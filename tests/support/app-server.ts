import { createApp, defaultConfig } from '../../server/app';
import { createDb, createPool } from '../../server/db/client';
import { createLogger } from '../../server/lib/logger';

// A small app process for fault tests and the benchmark: the real createApp against DATABASE_URL,
// listening on loopback. Prints one JSON line {"port":N} once it listens. No background jobs.
const databaseUrl = process.env.DATABASE_URL;
if (!databaseUrl) throw new Error('DATABASE_URL is required');
const logger = createLogger(process.env.LOG_LEVEL ?? 'silent');
const pool = createPool(databaseUrl, logger);
const app = createApp({
  db: createDb(pool),
  pool,
  logger,
  now: () => new Date(),
  config: defaultConfig({
    publicBaseUrl: process.env.PUBLIC_BASE_URL ?? 'http://127.0.0.1',
    sessionSecret: 'reliability-and-bench-session-secret-0123456789',
    dataDir: process.env.DATA_DIR ?? '/tmp/crumbtrail-app-server',
    signInLimitPerAccount: 100_000,
    signInLimitPerAddress: 100_000,
    lotPageLimitPerMinute: Number(process.env.LOT_PAGE_LIMIT ?? 300),
  }),
});
const server = app.listen(Number(process.env.PORT ?? 0), '127.0.0.1', () => {
  const address = server.address();
  process.stdout.write(`${JSON.stringify({ port: typeof address === 'object' && address ? address.port : 0 })}\n`);
});
process.on('SIGTERM', () => {
  server.close();
  server.closeAllConnections();
  void pool.end().finally(() => process.exit(0));
});
