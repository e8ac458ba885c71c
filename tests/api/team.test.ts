import { describe, expect, test } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { ApiAgent, businessWithAgents, createTestBusiness, signedInAgent, TEST_PASSWORD } from '../support/agents';
import { uniqueSuffix } from '../support/db';
import { memberships, users } from '../../server/db/schema/auth';
import { invites } from '../../server/db/schema/team';
import { recordEvents } from '../../server/db/schema/record-events';
import { sha256Hex, normaliseCode } from '../../server/lib/tokens';

const t = makeTestApp();
const HOUR = 60 * 60 * 1000;

async function events(businessId: string, action: string) {
  return t.db.select().from(recordEvents).where(and(eq(recordEvents.businessId, businessId), eq(recordEvents.action, action)));
}
async function membership(businessId: string, userId: string) {
  const [m] = await t.db.select().from(memberships).where(and(eq(memberships.businessId, businessId), eq(memberships.userId, userId)));
  return m;
}
async function sessionRows(userId: string) {
  const r = await t.db.execute(sql`select sid from user_sessions where sess->>'userId' = ${userId}`);
  return r.rows.length;
}

describe('GET /api/team/members', () => {
  test('the owner sees every member with e-mail and status', async () => {
    const { business, owner } = await businessWithAgents(t);
    const res = await owner.get('/api/team/members');
    expect(res.status).toBe(200);
    expect(res.body.members).toHaveLength(3);
    expect(res.body.members.find((m: { role: string }) => m.role === 'helper')).toMatchObject({ email: business.members.helper.email, isActive: true, joinedAt: expect.any(String) });
  });

  test('bakers and helpers see names and roles only', async () => {
    const { helper, baker } = await businessWithAgents(t);
    for (const agent of [helper, baker]) {
      const res = await agent.get('/api/team/members');
      expect(res.status).toBe(200);
      for (const m of res.body.members) expect(Object.keys(m).sort()).toEqual(['displayName', 'role', 'userId']);
    }
  });
});

describe('invites', () => {
  test('the owner invites; the code has at least 128 bits, is shown once and stored only as SHA-256; accepting creates the account and signs in', async () => {
    const { business, owner } = await businessWithAgents(t);
    const email = `new-${uniqueSuffix()}@test.invalid`;
    const res = await owner.post('/api/team/invites').send({ email, role: 'baker', displayName: 'Rosa' });
    expect(res.status).toBe(201);
    const code: string = res.body.code;
    // 160 bits as base32 = 32 characters (ASVS 5.0 11.5.1: at least 128 bits from a CSPRNG).
    expect(normaliseCode(code)).toHaveLength(32);
    expect(Date.parse(res.body.invite.expiresAt) - t.clock.now.getTime()).toBeGreaterThan(71.9 * HOUR);
    const [row] = await t.db.select().from(invites).where(eq(invites.id, res.body.invite.id));
    expect(row!.codeHash).toBe(sha256Hex(normaliseCode(code)));
    expect(JSON.stringify(row)).not.toContain(normaliseCode(code));
    const list = await owner.get('/api/team/invites');
    expect(list.body.invites.map((i: { id: string }) => i.id)).toContain(res.body.invite.id);
    expect(JSON.stringify(list.body)).not.toContain(code);

    const newcomer = new ApiAgent(t.app);
    await newcomer.refreshCsrf();
    const preview = await newcomer.post('/api/team/invites/preview').send({ code });
    expect(preview.body).toMatchObject({ businessName: business.name, email, role: 'baker', hasAccount: false });
    const accepted = await newcomer.post('/api/team/invites/accept').send({ code, displayName: 'Rosa Baker', password: 'a long kneading phrase' });
    expect(accepted.status).toBe(201);
    expect(accepted.body).toMatchObject({ kind: 'member', user: { email, role: 'baker', displayName: 'Rosa Baker' }, business: { id: business.businessId } });
    newcomer.csrfToken = accepted.body.csrfToken;
    expect((await newcomer.get('/api/team/members')).status).toBe(200);
    expect(await events(business.businessId, 'join')).toHaveLength(1);
    expect(await events(business.businessId, 'create').then((e) => e.filter((x) => x.entityType === 'invite'))).toHaveLength(1);

    // Single use.
    const second = new ApiAgent(t.app);
    await second.refreshCsrf();
    const reuse = await second.post('/api/team/invites/accept').send({ code, displayName: 'Mallory', password: 'another long phrase' });
    expect(reuse.status).toBe(410);
    expect((await owner.get('/api/team/invites')).body.invites).toHaveLength(0);
  });

  test('an invite expires after 72 hours', async () => {
    const app = makeTestApp();
    const b = await createTestBusiness(app);
    const owner = await signedInAgent(app, b, 'owner');
    const { body } = await owner.post('/api/team/invites').send({ email: `late-${uniqueSuffix()}@test.invalid`, role: 'helper' });
    app.clock.advance(72 * HOUR + 1000);
    const agent = new ApiAgent(app.app);
    await agent.refreshCsrf();
    const res = await agent.post('/api/team/invites/accept').send({ code: body.code, displayName: 'Late', password: 'too late for the bake' });
    expect(res.status).toBe(410);
  });

  test('a revoked invite cannot be accepted', async () => {
    const { owner } = await businessWithAgents(t);
    const { body } = await owner.post('/api/team/invites').send({ email: `rev-${uniqueSuffix()}@test.invalid`, role: 'helper' });
    expect((await owner.delete(`/api/team/invites/${body.invite.id}`)).status).toBe(204);
    const agent = new ApiAgent(t.app);
    await agent.refreshCsrf();
    const res = await agent.post('/api/team/invites/accept').send({ code: body.code, displayName: 'X', password: 'revoked and refused' });
    expect(res.status).toBe(410);
  });

  test('a person with an account joins a second business with their existing password', async () => {
    const other = await createTestBusiness(t);
    const { business, owner } = await businessWithAgents(t);
    const email = other.members.baker.email;
    const { body } = await owner.post('/api/team/invites').send({ email, role: 'helper' });
    const agent = new ApiAgent(t.app);
    await agent.refreshCsrf();
    const wrong = await agent.post('/api/team/invites/accept').send({ code: body.code, displayName: 'Baker', password: 'not their password' });
    expect(wrong.status).toBe(400);
    const ok = await agent.post('/api/team/invites/accept').send({ code: body.code, displayName: 'Baker', password: TEST_PASSWORD });
    expect(ok.status).toBe(201);
    expect(await membership(business.businessId, other.members.baker.userId)).toMatchObject({ role: 'helper' });
    expect(await membership(other.businessId, other.members.baker.userId)).toMatchObject({ role: 'baker' });
  });

  test('inviting an existing member answers 409; bakers and helpers may not invite', async () => {
    const { business, owner, baker, helper } = await businessWithAgents(t);
    expect((await owner.post('/api/team/invites').send({ email: business.members.helper.email, role: 'baker' })).status).toBe(409);
    for (const a of [baker, helper]) expect((await a.post('/api/team/invites').send({ email: `x-${uniqueSuffix()}@test.invalid`, role: 'owner' })).status).toBe(403);
  });

  test('accepting an invite checks the new password against the common list', async () => {
    const { owner } = await businessWithAgents(t);
    const { body } = await owner.post('/api/team/invites').send({ email: `weak-${uniqueSuffix()}@test.invalid`, role: 'helper' });
    const agent = new ApiAgent(t.app);
    await agent.refreshCsrf();
    const res = await agent.post('/api/team/invites/accept').send({ code: body.code, displayName: 'W', password: 'password1' });
    expect(res.status).toBe(400);
    expect(res.body.error.fieldErrors.password).toBeDefined();
  });
});

describe('roles, disabling and removal', () => {
  test('the owner changes a role; the change applies on the next request and is a record event', async () => {
    const { business, owner, helper } = await businessWithAgents(t);
    expect((await helper.get('/api/team/invites')).status).toBe(403);
    const res = await owner.patch(`/api/team/members/${business.members.helper.userId}`).send({ role: 'owner' });
    expect(res.status).toBe(200);
    expect(res.body.role).toBe('owner');
    expect((await helper.get('/api/team/invites')).status).toBe(200);
    const [e] = await events(business.businessId, 'change_role');
    expect(e!.payload).toEqual({ from: 'helper', to: 'owner' });
  });

  test('disabling a member ends all of their sessions at once; enabling lets them sign in again', async () => {
    const { business, owner, helper } = await businessWithAgents(t);
    const second = await signedInAgent(t, business, 'helper');
    const id = business.members.helper.userId;
    expect(await sessionRows(id)).toBe(2);
    const res = await owner.post(`/api/team/members/${id}/disable`).send({});
    expect(res.status).toBe(200);
    expect(res.body.isActive).toBe(false);
    expect(await sessionRows(id)).toBe(0);
    expect((await helper.get('/api/team/members')).status).toBe(401);
    expect((await second.get('/api/team/members')).status).toBe(401);
    expect((await new ApiAgent(t.app).signIn(business.members.helper.email)).status).toBe(401);
    expect((await owner.post(`/api/team/members/${id}/enable`).send({})).status).toBe(200);
    expect((await new ApiAgent(t.app).signIn(business.members.helper.email)).status).toBe(200);
    expect(await events(business.businessId, 'disable')).toHaveLength(1);
    expect(await events(business.businessId, 'enable')).toHaveLength(1);
  });

  test('the owner can end all of a member’s sessions', async () => {
    const { business, owner, baker } = await businessWithAgents(t);
    const list = await owner.get(`/api/team/members/${business.members.baker.userId}/sessions`);
    expect(list.body.sessions).toHaveLength(1);
    expect((await owner.delete(`/api/team/members/${business.members.baker.userId}/sessions`)).status).toBe(204);
    expect((await baker.get('/api/team/members')).status).toBe(401);
    expect((await owner.get('/api/team/members')).status).toBe(200);
  });

  test('removing a member deletes the membership, ends their sessions, keeps the account', async () => {
    const { business, owner, baker } = await businessWithAgents(t);
    const id = business.members.baker.userId;
    expect((await owner.delete(`/api/team/members/${id}`)).status).toBe(204);
    expect(await membership(business.businessId, id)).toBeUndefined();
    expect((await baker.get('/api/team/members')).status).toBe(401);
    const [u] = await t.db.select().from(users).where(eq(users.id, id));
    expect(u).toBeDefined();
    expect(await events(business.businessId, 'remove')).toHaveLength(1);
  });

  test('the last active owner cannot be demoted, disabled or removed (409 with a clear message)', async () => {
    const { business, owner } = await businessWithAgents(t);
    const id = business.members.owner.userId;
    for (const res of [
      await owner.patch(`/api/team/members/${id}`).send({ role: 'baker' }),
      await owner.post(`/api/team/members/${id}/disable`).send({}),
      await owner.delete(`/api/team/members/${id}`),
    ]) {
      expect(res.status).toBe(409);
      expect(res.body.error.message).toMatch(/last active owner/);
    }
    expect(await membership(business.businessId, id)).toMatchObject({ role: 'owner', isActive: true });
    // With a second owner, the first may step down.
    await owner.patch(`/api/team/members/${business.members.baker.userId}`).send({ role: 'owner' });
    expect((await owner.patch(`/api/team/members/${id}`).send({ role: 'baker' })).status).toBe(200);
  });

  test('two owners demoting each other at the same moment leave one owner', async () => {
    const { business, owner } = await businessWithAgents(t);
    await owner.patch(`/api/team/members/${business.members.baker.userId}`).send({ role: 'owner' });
    const second = await signedInAgent(t, business, 'baker');
    const [a, b] = await Promise.all([
      owner.patch(`/api/team/members/${business.members.baker.userId}`).send({ role: 'baker' }),
      second.patch(`/api/team/members/${business.members.owner.userId}`).send({ role: 'baker' }),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409].sort());
    const owners = await t.db.select().from(memberships).where(and(eq(memberships.businessId, business.businessId), eq(memberships.role, 'owner')));
    expect(owners).toHaveLength(1);
  });
});

describe('mass assignment and other businesses (ASVS 5.0 8.2.2, 8.2.3, 15.3.3)', () => {
  test('a helper cannot set role or businessId through any member route: 400 and nothing changes', async () => {
    const other = await createTestBusiness(t);
    const { business, helper } = await businessWithAgents(t);
    const id = business.members.helper.userId;
    const attempts = [
      await helper.patch('/api/account/profile').send({ displayName: 'Ivy', role: 'owner' }),
      await helper.patch('/api/account/profile').send({ displayName: 'Ivy', businessId: other.businessId }),
      await helper.post('/api/account/password').send({ currentPassword: TEST_PASSWORD, newPassword: 'a fresh sourdough phrase', endOtherSessions: false, role: 'owner' }),
    ];
    for (const res of attempts) {
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
    }
    expect(await membership(business.businessId, id)).toMatchObject({ role: 'helper', businessId: business.businessId });
    const [u] = await t.db.select().from(users).where(eq(users.id, id));
    expect(u!.displayName).toBe(business.members.helper.displayName);
    expect((await new ApiAgent(t.app).signIn(business.members.helper.email)).status).toBe(200);
  });

  test('the owner role route refuses extra fields', async () => {
    const { business, owner } = await businessWithAgents(t);
    const res = await owner.patch(`/api/team/members/${business.members.baker.userId}`).send({ role: 'helper', businessId: '00000000-0000-4000-8000-000000000000' });
    expect(res.status).toBe(400);
    expect(await membership(business.businessId, business.members.baker.userId)).toMatchObject({ role: 'baker' });
  });

  test("another business's member and invite ids answer 404 and change nothing", async () => {
    const a = await businessWithAgents(t);
    const b = await businessWithAgents(t);
    const victim = b.business.members.baker.userId;
    const { body: inv } = await b.owner.post('/api/team/invites').send({ email: `b-${uniqueSuffix()}@test.invalid`, role: 'helper' });
    const calls = [
      await a.owner.patch(`/api/team/members/${victim}`).send({ role: 'helper' }),
      await a.owner.post(`/api/team/members/${victim}/disable`).send({}),
      await a.owner.post(`/api/team/members/${victim}/enable`).send({}),
      await a.owner.delete(`/api/team/members/${victim}`),
      await a.owner.get(`/api/team/members/${victim}/sessions`),
      await a.owner.delete(`/api/team/members/${victim}/sessions`),
      await a.owner.delete(`/api/team/invites/${inv.invite.id}`),
    ];
    for (const res of calls) expect(res.status).toBe(404);
    expect(await membership(b.business.businessId, victim)).toMatchObject({ role: 'baker', isActive: true });
    expect((await b.baker.get('/api/team/members')).status).toBe(200);
    expect((await b.owner.get('/api/team/invites')).body.invites).toHaveLength(1);
    const list = await a.owner.get('/api/team/members');
    expect(JSON.stringify(list.body)).not.toContain(victim);
  });
});
