import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import request from 'supertest';
import { ownCluster } from '../support/own-cluster';
import { createApp, defaultConfig } from '../../server/app';
import { createDb, createPool } from '../../server/db/client';
import { createLogger } from '../../server/lib/logger';
import { signUp } from '../../server/features/auth/auth.service';
import { ApiAgent, TEST_PASSWORD } from '../support/agents';

// Its own cluster: stopping PostgreSQL here can't disturb the other tests.
const cluster = ownCluster('restart', 54341);
let pool: ReturnType<typeof createPool>;
let app: ReturnType<typeof createApp>;

beforeAll(async () => {
  cluster.start();
  await cluster.migrate();
  pool = createPool(cluster.runtimeUrl);
  const db = createDb(pool);
  app = createApp({
    db, pool, logger: createLogger('silent'), now: () => new Date(),
    config: defaultConfig({ publicBaseUrl: 'http://127.0.0.1', sessionSecret: 'x'.repeat(40) }),
  });
  await signUp(db, { businessName: 'Restart Bakes', displayName: 'Restart Owner', email: OWNER_EMAIL, password: TEST_PASSWORD });
}, 120_000);

const OWNER_EMAIL = 'owner-restart@test.invalid';

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

  test('under light load, every request ends in 200 or 503 within limits, and the same process recovers', async () => {
    const agent = new ApiAgent(app as never);
    expect((await agent.signIn(OWNER_EMAIL)).status).toBe(200);
    type Sample = { started: number; ms: number; status: number; phase: 'before' | 'down' | 'back' };
    const samples: Sample[] = [];
    const pending: Promise<void>[] = [];
    let phase: Sample['phase'] = 'before';
    let running = true;
    // About 10 requests a second, a signed-in list and the health check in turn, never waiting for answers.
    const load = (async () => {
      for (let i = 0; running; i++) {
        const started = Date.now();
        const at = phase;
        const req = i % 2 ? agent.get('/api/batches') : agent.get('/api/health');
        pending.push(req.timeout(30_000).then(
          (res) => void samples.push({ started, ms: Date.now() - started, status: res.status, phase: at }),
          () => void samples.push({ started, ms: Date.now() - started, status: 0, phase: at }),
        ));
        await new Promise((r) => setTimeout(r, 100));
      }
    })();
    await new Promise((r) => setTimeout(r, 1_000));
    cluster.stop();
    phase = 'down';
    await new Promise((r) => setTimeout(r, 3_000));
    cluster.start();
    const back = Date.now();
    phase = 'back';
    await new Promise((r) => setTimeout(r, 6_000));
    running = false;
    await load;
    await Promise.all(pending);

    expect(samples.filter((s) => s.status !== 200 && s.status !== 503).map((s) => `${s.phase} ${s.status}`)).toEqual([]);
    expect(Math.max(...samples.map((s) => s.ms))).toBeLessThan(30_000);
    const down = samples.filter((s) => s.phase === 'down');
    expect(down.length).toBeGreaterThan(10);
    expect(down.every((s) => s.status === 503 && s.ms < 6_000)).toBe(true);
    expect(samples.filter((s) => s.phase === 'before').every((s) => s.status === 200)).toBe(true);
    // Recovered within 10 s of the database's return, and stays recovered.
    const firstOk = samples.filter((s) => s.phase === 'back' && s.status === 200).sort((a, b) => a.started - b.started)[0];
    expect(firstOk).toBeDefined();
    expect(firstOk!.started - back).toBeLessThan(10_000);
    expect(samples.filter((s) => s.started > firstOk!.started).every((s) => s.status === 200)).toBe(true);
  }, 60_000);
});
