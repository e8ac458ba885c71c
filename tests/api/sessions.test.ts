import { describe, expect, test } from 'vitest';
import request from 'supertest';
import { sql } from 'drizzle-orm';
import { makeTestApp, type TestApp } from '../support/app';
import { ApiAgent, createTestBusiness, signedInAgent, TEST_PASSWORD } from '../support/agents';

const t = makeTestApp();
const MIN = 60 * 1000;

/** The name=value pair of the session cookie in a response, and its full Set-Cookie line. */
function sessionCookie(res: request.Response, name: string) {
  const lines = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const line = lines.find((l) => l.startsWith(`${name}=`));
  return line ? { pair: line.split(';')[0]!, line } : undefined;
}

async function rowExists(app: TestApp, cookiePair: string) {
  // The cookie value is "s:<sid>.<signature>".
  const sid = decodeURIComponent(cookiePair.split('=')[1]!).slice(2).split('.')[0]!;
  const result = await app.db.execute(sql`select 1 from user_sessions where sid = ${sid}`);
  return result.rows.length === 1;
}

/** Anonymous session + CSRF token, then sign-in, all with hand-carried cookies. */
async function signInByHand(app: TestApp, email: string, headers: Record<string, string> = {}) {
  const pre = await request(app.app).get('/api/auth/session').set(headers);
  const before = sessionCookie(pre, app.config.cookieName)!;
  const res = await request(app.app).post('/api/auth/sign-in').set(headers).set('Cookie', before.pair).set('X-CSRF-Token', pre.body.csrfToken).send({ email, password: TEST_PASSWORD });
  return { pre, before, res, after: sessionCookie(res, app.config.cookieName)! };
}

describe('session cookie flags', () => {
  test('on plain-http loopback: HttpOnly, SameSite=Lax, Path=/, no Domain, not Secure, no __Host- prefix', async () => {
    const b = await createTestBusiness(t);
    const { after, res } = await signInByHand(t, b.members.owner.email);
    expect(res.status).toBe(200);
    expect(t.config.cookieName).toBe('crumbtrail');
    expect(after.line).toMatch(/; HttpOnly/);
    expect(after.line).toMatch(/; SameSite=Lax/);
    expect(after.line).toMatch(/; Path=\//);
    expect(after.line).not.toMatch(/Domain=/i);
    expect(after.line).not.toMatch(/; Secure/);
  });

  test('behind a trusted https proxy: __Host- name, Secure, HttpOnly, SameSite=Lax, Path=/, no Domain (ASVS 5.0 3.3.1, 3.3.3)', async () => {
    const secure = makeTestApp({ config: { publicBaseUrl: 'https://crumbs.example', trustProxy: true } });
    const b = await createTestBusiness(secure);
    const { after, res } = await signInByHand(secure, b.members.owner.email, { 'X-Forwarded-Proto': 'https' });
    expect(res.status).toBe(200);
    expect(after.line).toMatch(/^__Host-crumbtrail=/);
    expect(after.line).toMatch(/; Secure/);
    expect(after.line).toMatch(/; HttpOnly/);
    expect(after.line).toMatch(/; SameSite=Lax/);
    expect(after.line).toMatch(/; Path=\//);
    expect(after.line).not.toMatch(/Domain=/i);
    // The session id is only in Set-Cookie, never in the body.
    const sid = decodeURIComponent(after.pair.split('=')[1]!).slice(2).split('.')[0]!;
    expect(JSON.stringify(res.body)).not.toContain(sid);
    const me = await request(secure.app).get('/api/team/members').set('X-Forwarded-Proto', 'https').set('Cookie', after.pair);
    expect(me.status).toBe(200);
  });
});

describe('session fixation and sign-out (ASVS 5.0 7.2.4, 7.4.1)', () => {
  test('the cookie changes at sign-in; the old one and, after sign-out, the new one get 401; the store row is deleted', async () => {
    const b = await createTestBusiness(t);
    const { before, after, res } = await signInByHand(t, b.members.owner.email);
    expect(res.status).toBe(200);
    expect(after.pair).not.toBe(before.pair);
    expect(await rowExists(t, before.pair)).toBe(false);

    expect((await request(t.app).get('/api/team/members').set('Cookie', before.pair)).status).toBe(401);
    expect((await request(t.app).get('/api/team/members').set('Cookie', after.pair)).status).toBe(200);
    expect(await rowExists(t, after.pair)).toBe(true);

    const out = await request(t.app).post('/api/auth/sign-out').set('Cookie', after.pair).set('X-CSRF-Token', res.body.csrfToken);
    expect(out.status).toBe(204);
    expect(out.headers['clear-site-data']).toContain('storage');
    expect(await rowExists(t, after.pair)).toBe(false);
    expect((await request(t.app).get('/api/team/members').set('Cookie', after.pair)).status).toBe(401);
  });
});

describe('session timeouts (NIST SP 800-63B AAL2: 30 min idle, 12 h absolute)', () => {
  test('idle for 29 minutes still works; idle for 31 minutes gets 401', async () => {
    const app = makeTestApp();
    const b = await createTestBusiness(app);
    const agent = await signedInAgent(app, b, 'baker');
    app.clock.advance(29 * MIN);
    expect((await agent.get('/api/team/members')).status).toBe(200);
    app.clock.advance(31 * MIN);
    expect((await agent.get('/api/team/members')).status).toBe(401);
  });

  test('idle time is recorded to the minute: requests within a minute do not rewrite the session', async () => {
    const app = makeTestApp();
    const b = await createTestBusiness(app);
    const agent = await signedInAgent(app, b, 'baker');
    const seen = async () => Date.parse((await agent.get('/api/auth/session')).body.idleExpiresAt);
    const first = await seen();
    app.clock.advance(30 * 1000);
    expect(await seen()).toBe(first);
    app.clock.advance(31 * 1000); // 61 s since sign-in
    expect(await seen()).toBeGreaterThanOrEqual(first + 61 * 1000);
  });

  test('background polling (X-Background-Refresh: 1) for 31 minutes signs a member out; real requests do not', async () => {
    const app = makeTestApp();
    const b = await createTestBusiness(app);
    const poller = await signedInAgent(app, b, 'baker');
    const worker = await signedInAgent(app, b, 'helper');
    for (let elapsed = 0; elapsed < 31 * MIN; elapsed += 15 * 1000) {
      app.clock.advance(15 * 1000); // the Kitchen board refetches every 15 s
      const polled = await poller.get('/api/kitchen-board').set('X-Background-Refresh', '1');
      if (elapsed + 15 * 1000 <= 29 * MIN && polled.status !== 200) throw new Error(`poller signed out early at ${elapsed} ms: ${polled.status}`);
      if (elapsed % MIN === 0) expect((await worker.get('/api/kitchen-board')).status).toBe(200);
    }
    expect((await poller.get('/api/kitchen-board').set('X-Background-Refresh', '1')).status).toBe(401);
    expect((await poller.get('/api/team/members')).status).toBe(401);
    expect((await worker.get('/api/team/members')).status).toBe(200);
  });

  test('activity every 5 minutes does not keep a session past 12 hours', async () => {
    const app = makeTestApp();
    const b = await createTestBusiness(app);
    const agent = await signedInAgent(app, b, 'helper');
    for (let elapsed = 5; elapsed < 12 * 60; elapsed += 5) {
      app.clock.advance(5 * MIN);
      const res = await agent.get('/api/team/members');
      if (res.status !== 200) throw new Error(`session ended early at ${elapsed} min: ${res.status}`);
    }
    app.clock.advance(6 * MIN); // 12 h + 1 min since sign-in
    expect((await agent.get('/api/team/members')).status).toBe(401);
  });

  test('the session answer tells the client when each limit falls', async () => {
    const b = await createTestBusiness(t);
    const agent = await signedInAgent(t, b, 'owner');
    const res = await agent.get('/api/auth/session');
    const idle = Date.parse(res.body.idleExpiresAt) - t.clock.now.getTime();
    const absolute = Date.parse(res.body.absoluteExpiresAt) - t.clock.now.getTime();
    expect(idle).toBeGreaterThan(29 * MIN);
    expect(idle).toBeLessThanOrEqual(30 * MIN);
    expect(absolute).toBeGreaterThan(11.9 * 60 * MIN);
  });
});

describe('POST /api/account/password (ASVS 5.0 6.2.3, 7.4.3)', () => {
  test('when the current password is wrong, then 400 on currentPassword and nothing changes', async () => {
    const b = await createTestBusiness(t);
    const agent = await signedInAgent(t, b, 'baker');
    const res = await agent.post('/api/account/password').send({ currentPassword: 'not it at all', newPassword: 'a new kitchen phrase', endOtherSessions: true });
    expect(res.status).toBe(400);
    expect(res.body.error.fieldErrors.currentPassword).toBeDefined();
    expect((await new ApiAgent(t.app).signIn(b.members.baker.email)).status).toBe(200);
  });

  test('a common new password is refused', async () => {
    const b = await createTestBusiness(t);
    const agent = await signedInAgent(t, b, 'baker');
    const res = await agent.post('/api/account/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'iloveyou1', endOtherSessions: false });
    expect(res.status).toBe(400);
    expect(res.body.error.fieldErrors.newPassword).toBeDefined();
  });

  test('with endOtherSessions, other sessions end, the current id regenerates, and only the new password works', async () => {
    const b = await createTestBusiness(t);
    const phone = await signedInAgent(t, b, 'helper');
    const laptop = await signedInAgent(t, b, 'helper');
    const before = await laptop.get('/api/account/sessions');
    expect(before.body.sessions).toHaveLength(2);
    const oldCurrentId = before.body.sessions.find((s: { isCurrent: boolean }) => s.isCurrent).id;

    const res = await laptop.post('/api/account/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'lemon drizzle at dawn', endOtherSessions: true });

    expect(res.status).toBe(200);
    expect(res.body.endedSessions).toBe(1);
    laptop.csrfToken = res.body.csrfToken;
    expect((await phone.get('/api/team/members')).status).toBe(401);
    const after = await laptop.get('/api/account/sessions');
    expect(after.status).toBe(200);
    expect(after.body.sessions).toHaveLength(1);
    expect(after.body.sessions[0].id).not.toBe(oldCurrentId);
    expect((await new ApiAgent(t.app).signIn(b.members.helper.email)).status).toBe(401);
    expect((await new ApiAgent(t.app).signIn(b.members.helper.email, 'lemon drizzle at dawn')).status).toBe(200);
  });

  test('without endOtherSessions, other sessions stay', async () => {
    const b = await createTestBusiness(t);
    const other = await signedInAgent(t, b, 'baker');
    const agent = await signedInAgent(t, b, 'baker');
    const res = await agent.post('/api/account/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'scones with clotted cream', endOtherSessions: false });
    expect(res.status).toBe(200);
    expect(res.body.endedSessions).toBe(0);
    expect((await other.get('/api/team/members')).status).toBe(200);
  });
});

describe('my sessions (ASVS 5.0 7.5.2)', () => {
  test('a member sees their sessions without session ids and ends one', async () => {
    const b = await createTestBusiness(t);
    const tablet = await signedInAgent(t, b, 'owner');
    const desk = await signedInAgent(t, b, 'owner');
    const list = await desk.get('/api/account/sessions');
    expect(list.body.sessions).toHaveLength(2);
    const other = list.body.sessions.find((s: { isCurrent: boolean }) => !s.isCurrent);
    const res = await desk.delete(`/api/account/sessions/${other.id}`);
    expect(res.status).toBe(204);
    expect((await tablet.get('/api/team/members')).status).toBe(401);
    expect((await desk.get('/api/team/members')).status).toBe(200);
  });

  test('ending my current session signs me out for real', async () => {
    const b = await createTestBusiness(t);
    const agent = await signedInAgent(t, b, 'baker');
    const list = await agent.get('/api/account/sessions');
    const current = list.body.sessions.find((s: { isCurrent: boolean }) => s.isCurrent);
    expect((await agent.delete(`/api/account/sessions/${current.id}`)).status).toBe(204);
    expect((await agent.get('/api/team/members')).status).toBe(401);
  });

  test("another member's session handle answers 404", async () => {
    const b = await createTestBusiness(t);
    const baker = await signedInAgent(t, b, 'baker');
    const helper = await signedInAgent(t, b, 'helper');
    const bakerSession = (await baker.get('/api/account/sessions')).body.sessions[0].id;
    expect((await helper.delete(`/api/account/sessions/${bakerSession}`)).status).toBe(404);
    expect((await baker.get('/api/team/members')).status).toBe(200);
  });
});
