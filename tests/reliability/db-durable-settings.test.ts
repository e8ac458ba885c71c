import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import pg from 'pg';
import { ownCluster } from '../support/own-cluster';

// A cluster made by the same pg.sh (same initdb flags and configuration) as npm start's. Committed
// records must survive a crash: fsync, synchronous_commit and full_page_writes stay on (PostgreSQL
// docs, "Reliability" and "Asynchronous Commit"); data_checksums is an initdb option (--data-checksums).
const cluster = ownCluster('durable', 54344);

beforeAll(() => {
  cluster.start();
}, 120_000);

afterAll(() => cluster.destroy());

describe('db.durable-settings', () => {
  test.each(['fsync', 'synchronous_commit', 'full_page_writes', 'data_checksums'])('SHOW %s is on', async (name) => {
    const client = new pg.Client({ connectionString: cluster.runtimeUrl });
    await client.connect();
    const { rows } = await client.query(`SHOW ${name}`);
    await client.end();
    expect(rows[0][name]).toBe('on');
  });
});
