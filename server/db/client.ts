import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import type { Logger } from '../lib/logger';

export type Db = NodePgDatabase;
/** A transaction handle or the database itself: services accept either. */
export type DbOrTx = Db | Parameters<Parameters<Db['transaction']>[0]>[0];

export function createPool(connectionString: string, logger?: Logger): pg.Pool {
  const pool = new pg.Pool({
    connectionString,
    max: 10,
    // Fail fast while the database is down instead of waiting for ever (pg's default is 0 = no limit).
    connectionTimeoutMillis: 5_000,
    idleTimeoutMillis: 10_000,
  });
  // Without this listener an idle client's error (database restart) would crash the process.
  pool.on('error', (err) => logger?.warn({ err: err.message }, 'idle database client lost'));
  pool.on('connect', (client) => {
    client.on('error', (err) => logger?.warn({ err: err.message }, 'database client error'));
  });
  return pool;
}

export function createDb(pool: pg.Pool): Db {
  return drizzle({ client: pool, casing: 'snake_case' });
}
