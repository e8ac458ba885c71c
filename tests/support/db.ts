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

/**
 * A database of the test's own in the shared test cluster, migrated like the per-run one: for tests
 * that need a database-wide fact to hold (e.g. "one demo business") whatever other files do.
 */
export async function freshDatabase(label: string): Promise<{ runtimeUrl: string; drop: () => Promise<void> }> {
  const owner = new URL(inject('ownerDatabaseUrl'));
  const runtime = new URL(inject('runtimeDatabaseUrl'));
  const name = `${owner.pathname.slice(1)}_${label}`.slice(0, 60);
  const admin = new pg.Client({ connectionString: owner.toString() });
  await admin.connect();
  await admin.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
  await admin.query(`CREATE DATABASE "${name}"`);
  await admin.end();
  owner.pathname = `/${name}`;
  runtime.pathname = `/${name}`;
  const pool = new pg.Pool({ connectionString: owner.toString(), max: 1 });
  const { migrate } = await import('drizzle-orm/node-postgres/migrator');
  const { drizzle } = await import('drizzle-orm/node-postgres');
  await migrate(drizzle({ client: pool, casing: 'snake_case' }), { migrationsFolder: 'drizzle' });
  await pool.end();
  return {
    runtimeUrl: runtime.toString(),
    drop: async () => {
      const c = new pg.Client({ connectionString: inject('ownerDatabaseUrl') });
      await c.connect();
      await c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`);
      await c.end();
    },
  };
}
