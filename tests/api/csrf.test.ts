import { afterAll, describe, expect, test } from 'vitest';
import { freshDatabase } from '../support/db';
import { sql } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { businessWithAgents, enrolledDeviceAgent } from '../support/agents';
import { listRoutes } from '../support/routes';

// OWASP CSRF Prevention Cheat Sheet: synchronizer token in a custom header, Fetch Metadata with an
// Origin fallback, and no "simple" content types on JSON routes.
const t = makeTestApp();

describe('CSRF defences on a state-changing route', () => {
  const body = { displayName: 'Changed by a forged request' };

  async function setup() {
    const s = await businessWithAgents(t);
    const send = () => s.baker.agent.patch('/api/account/profile');
    return { ...s, send, name: async () => (await s.baker.get('/api/auth/session')).body.user.displayName as string };
  }

  test('the real client (token in X-CSRF-Token) gets through', async () => {
    const { baker } = await setup();
    expect((await baker.patch('/api/account/profile').send({ displayName: 'Tobias R.' })).status).toBe(200);
  });

  test.each([
    ['no token', (r: ReturnType<() => import('supertest').Test>) => r],
    ['a wrong token', (r: ReturnType<() => import('supertest').Test>) => r.set('X-CSRF-Token', 'x'.repeat(43))],
  ])('with %s: 403 and nothing changes', async (_label, mutate) => {
    const { send, name, business } = await setup();
    const res = await mutate(send()).send(body);
    expect(res.status).toBe(403);
    expect(await name()).toBe(business.members.baker.displayName);
  });

  test('Sec-Fetch-Site: cross-site is refused even with the right token', async () => {
    const { send, baker, name, business } = await setup();
    const res = await send().set('X-CSRF-Token', baker.csrfToken).set('Sec-Fetch-Site', 'cross-site').send(body);
    expect(res.status).toBe(403);
    expect(await name()).toBe(business.members.baker.displayName);
  });

  test('a foreign Origin (no Fetch Metadata) is refused even with the right token', async () => {
    const { send, baker, name, business } = await setup();
    const res = await send().set('X-CSRF-Token', baker.csrfToken).set('Origin', 'https://evil.example').send(body);
    expect(res.status).toBe(403);
    expect(await name()).toBe(business.members.baker.displayName);
  });

  test.each([
    ['text/plain', JSON.stringify(body)],
    ['application/x-www-form-urlencoded', 'displayName=Forged'],
  ])('a %s body is refused with 415 even with the right token', async (type, payload) => {
    const { send, baker, name, business } = await setup();
    const res = await send().set('X-CSRF-Token', baker.csrfToken).set('Content-Type', type).send(payload);
    expect(res.status).toBe(415);
    expect(await name()).toBe(business.members.baker.displayName);
  });

  test('responses vary on Sec-Fetch-Site and Origin', async () => {
    const { baker } = await setup();
    const res = await baker.get('/api/team/members');
    expect(res.headers.vary).toMatch(/Sec-Fetch-Site/);
    expect(res.headers.vary).toMatch(/Origin/);
  });
});

// A database of its own: other files write to the shared one while this test compares every table.
const fresh = await freshDatabase('get_is_safe');
afterAll(() => fresh.drop());
const own = makeTestApp({ databaseUrl: fresh.runtimeUrl });

describe('GET never changes state', () => {
  /** A fingerprint of every table but the session store (reading may refresh a session's expiry). */
  async function fingerprint() {
    const tables = await own.db.execute(sql`select tablename from pg_tables where schemaname = 'public' and tablename <> 'user_sessions' order by tablename`);
    const out: Record<string, string> = {};
    for (const { tablename } of tables.rows as { tablename: string }[]) {
      const r = await own.db.execute(sql.raw(`select count(*)::text || ':' || coalesce(md5(string_agg(x::text, ',' order by x::text)), '') as f from "${tablename}" x`));
      out[tablename] = String((r.rows[0] as { f: string }).f);
    }
    return out;
  }

  test('calling every GET route as every caller leaves every table unchanged', async () => {
    const s = await businessWithAgents(own);
    const device = (await enrolledDeviceAgent(own, s.owner)).agent;
    const ids = [s.business.members.baker.userId, s.business.businessId, '00000000-0000-4000-8000-000000000000'];
    const gets = listRoutes(own.app).filter((r) => r.method === 'GET');
    expect(gets.length).toBeGreaterThan(3);
    const before = await fingerprint();
    for (const route of gets) {
      for (const id of ids) {
        const url = route.path.replace(/:[A-Za-z]+/g, id);
        for (const agent of [s.owner, s.baker, s.helper, s.anonymous, device]) await agent.get(url);
      }
    }
    expect(await fingerprint()).toEqual(before);
  });
});
