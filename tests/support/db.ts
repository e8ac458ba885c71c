import { inject } from 'vitest';
import pg from 'pg';
import { createDb, type Db } from '../../server/db/client';

/** The per-run test database, as the runtime role (what the app uses) or as the owner (to tamper in tests). */
export function testPool(as: 'runtime' | 'owner' = 'runtime'): pg.Pool {
  const url = as === 'runtime' ? inject('runtimeDatabaseUrl') : inject('ownerDatabaseUrl');
  const pool = new pg.Pool({ connectionString: url, max: 5 });
  pool.on('error', () => undefined);
  return pool;
}

export function testDb(pool: pg.Pool): Db {
  return createDb(pool);
}

let counter = 0;
/** Unique names per test, so tests never collide in the shared per-run database. */
export function uniqueSuffix(): string {
  counter += 1;
  return `${process.pid}-${Date.now().toString(36)}-${counter}`;
}
