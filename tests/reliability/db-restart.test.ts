import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import request from 'supertest';
import { ownCluster } from '../support/own-cluster';
import { createApp, defaultConfig } from '../../server/app';
import { createDb, createPool } from '../../server/db/client';
import { createLogger } from '../../server/lib/logger';

// Its own cluster: stopping PostgreSQL here can't disturb the other tests.
const cluster = ownCluster('restart', 54341);
let pool: ReturnType<typeof createPool>;
let app: ReturnType<typeof createApp>;

beforeAll(async () => {
  cluster.start();
  await cluster.migrate();
  pool = createPool(cluster.runtimeUrl);
  app = createApp({
    db: createDb(pool), pool, logger: createLogger('silent'), now: () => new Date(),
    config: defaultConfig({ publicBaseUrl: 'http://127.0.0.1', sessionSecret: 'x'.repeat(40) }),
  });
}, 120_000);

afterAll(async () => {
  await pool?.end().catch(() => undefined);
  cluster.destroy();
});

describe('when PostgreSQL goes away and comes back', () => {
  test('the app answers 503 with Retry-After during the outage and recovers without a restart', async () => {
    expect((await request(app).get('/api/health')).status).toBe(200);
    cluster.stop();
    const started = Date.now();
    const during = await request(app).get('/api/health');
    expect(during.status).toBe(503);
    expect(during.headers['retry-after']).toBeDefined();
    expect(during.body).toMatchObject({ app: 'up', database: 'down' });
    expect(Date.now() - started).toBeLessThan(6_000);
    cluster.start();
    const back = Date.now();
    let status = 0;
    while (Date.now() - back < 10_000) {
      status = (await request(app).get('/api/health')).status;
      if (status === 200) break;
      await new Promise((r) => setTimeout(r, 250));
    }
    expect(status).toBe(200);
  }, 60_000);

  test('after a crash (immediate stop), a database call answers 503, not 500, and the process stays up', async () => {
    const agent = request.agent(app);
    expect((await agent.get('/api/auth/session')).status).toBe(200); // a stored session: later requests read it from the database
    cluster.crash();
    const res = await agent.get('/api/auth/session');
    expect(res.status).toBe(503);
    expect(res.body.error).toMatchObject({ code: 'unavailable' });
    expect(JSON.stringify(res.body)).not.toMatch(/ECONNREFUSED|at .*\.ts/);
    const health = await request(app).get('/api/health');
    expect(health.status).toBe(503);
    cluster.start();
    let status = 0;
    for (let i = 0; i < 40 && status !== 200; i++) {
      status = (await request(app).get('/api/health')).status;
      if (status !== 200) await new Promise((r) => setTimeout(r, 250));
    }
    expect(status).toBe(200);
  }, 60_000);
});
