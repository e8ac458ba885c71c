import pg from 'pg';
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { afterAll } from 'vitest';
import { createApp, defaultConfig, type AppConfig, type CreateAppInput } from '../../server/app';
import { createLogger } from '../../server/lib/logger';
import { testDb, testPool } from './db';
import type { Db } from '../../server/db/client';

export interface TestAppOptions {
  config?: Partial<AppConfig>;
  now?: () => Date;
  deps?: Partial<CreateAppInput>;
  /** Another database than the per-run one (see freshDatabase). */
  databaseUrl?: string;
}

export interface TestApp {
  app: ReturnType<typeof createApp>;
  db: Db;
  pool: pg.Pool;
  config: AppConfig;
  /** Move the injected clock (for session expiry, timers, reminders). */
  clock: { readonly now: Date; advance(ms: number): void; set(d: Date): void };
}

// Test passwords hash with the OWASP minimum parameters; tests that check rehashing pass their own.
export function makeTestApp(options: TestAppOptions = {}): TestApp {
  const pool = options.databaseUrl ? new pg.Pool({ connectionString: options.databaseUrl, max: 5 }) : testPool('runtime');
  const db = testDb(pool);
  // Real time plus an offset the test can move.
  let offset = 0;
  const clock = {
    get now() { return new Date(Date.now() + offset); },
    advance(ms: number) { offset += ms; },
    set(d: Date) { offset = d.getTime() - Date.now(); },
  };
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'crumbtrail-test-'));
  const config = defaultConfig({
    publicBaseUrl: 'http://127.0.0.1',
    sessionSecret: 'test-session-secret-at-least-32-characters-long',
    dataDir,
    signInLimitPerAccount: 1000,
    signInLimitPerAddress: 100000,
    ...options.config,
  });
  const app = createApp({
    db,
    pool,
    logger: createLogger(process.env.TEST_LOG_LEVEL ?? 'silent'),
    now: options.now ?? (() => clock.now),
    config,
    ...options.deps,
  });
  afterAll(async () => {
    await pool.end();
    fs.rmSync(dataDir, { recursive: true, force: true });
  });
  return { app, db, pool, config, clock };
}
