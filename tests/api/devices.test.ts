import { describe, expect, test } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { ApiAgent, businessWithAgents, enrolledDeviceAgent } from '../support/agents';
import { devices } from '../../server/db/schema/devices';
import { recordEvents } from '../../server/db/schema/record-events';
import { normaliseCode, sha256Hex } from '../../server/lib/tokens';

const t = makeTestApp();
const DAY = 24 * 60 * 60 * 1000;

async function anonymousWithCsrf(app = t) {
  const a = new ApiAgent(app.app);
  await a.refreshCsrf();
  return a;
}

describe('kitchen display devices', () => {
  test('the owner enrols a tablet: a one-time code (stored as SHA-256) gives a device session of about 90 days', async () => {
    const { owner, business } = await businessWithAgents(t);
    const created = await owner.post('/api/devices').send({ name: 'Counter tablet' });
    expect(created.status).toBe(201);
    expect(created.body.device).toMatchObject({ name: 'Counter tablet', status: 'awaiting_enrolment' });
    const code: string = created.body.enrolmentCode;
    expect(normaliseCode(code)).toHaveLength(32);
    const [row] = await t.db.select().from(devices).where(eq(devices.id, created.body.device.id));
    expect(row!.enrolmentCodeHash).toBe(sha256Hex(normaliseCode(code)));

    const tablet = await anonymousWithCsrf();
    // Typed by hand: lower case and without dashes works too.
    const res = await tablet.post('/api/devices/enrol').send({ code: normaliseCode(code).toLowerCase() });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ kind: 'device', user: null, business: { id: business.businessId } });
    tablet.csrfToken = res.body.csrfToken;
    const cookie = ([] as string[]).concat(res.headers['set-cookie'] ?? []).find((l) => l.startsWith(`${t.config.cookieName}=`))!;
    const expires = Date.parse(/Expires=([^;]+)/.exec(cookie)![1]!);
    expect(expires - Date.now()).toBeGreaterThan(89 * DAY);

    const me = await tablet.get('/api/devices/current');
    expect(me.status).toBe(200);
    expect(me.body).toMatchObject({ id: created.body.device.id, name: 'Counter tablet', businessName: business.name });
    const list = await owner.get('/api/devices');
    expect(list.body.devices[0]).toMatchObject({ id: created.body.device.id, status: 'active', enrolledAt: expect.any(String) });
    const evs = await t.db.select().from(recordEvents).where(and(eq(recordEvents.businessId, business.businessId), eq(recordEvents.entityType, 'device')));
    expect(evs.map((e) => e.action).sort()).toEqual(['create', 'enrol']);
  });

  test('an enrolment code works once', async () => {
    const { owner } = await businessWithAgents(t);
    const { body } = await owner.post('/api/devices').send({ name: 'Once' });
    expect((await (await anonymousWithCsrf()).post('/api/devices/enrol').send({ code: body.enrolmentCode })).status).toBe(201);
    const again = await (await anonymousWithCsrf()).post('/api/devices/enrol').send({ code: body.enrolmentCode });
    expect(again.status).toBe(410);
  });

  test('an enrolment code expires after an hour', async () => {
    const app = makeTestApp();
    const { owner } = await businessWithAgents(app);
    const { body } = await owner.post('/api/devices').send({ name: 'Slow' });
    app.clock.advance(61 * 60 * 1000);
    expect((await (await anonymousWithCsrf(app)).post('/api/devices/enrol').send({ code: body.enrolmentCode })).status).toBe(410);
  });

  test('a device may call only routes that allow devices', async () => {
    const { owner } = await businessWithAgents(t);
    const { agent } = await enrolledDeviceAgent(t, owner);
    expect((await agent.get('/api/team/members')).status).toBe(403);
    expect((await agent.get('/api/devices')).status).toBe(403);
    expect((await agent.post('/api/team/invites').send({ email: 'x@test.invalid', role: 'owner' })).status).toBe(403);
    expect((await agent.get('/api/account/sessions')).status).toBe(403);
    expect((await agent.get('/api/devices/current')).status).toBe(200);
  });

  test('members and anonymous callers cannot use the device route', async () => {
    const { owner, helper, anonymous } = await businessWithAgents(t);
    expect((await owner.get('/api/devices/current')).status).toBe(403);
    expect((await helper.get('/api/devices/current')).status).toBe(403);
    expect((await anonymous.get('/api/devices/current')).status).toBe(401);
  });

  test('revoking ends the device session at once', async () => {
    const { owner } = await businessWithAgents(t);
    const { agent, deviceId } = await enrolledDeviceAgent(t, owner);
    expect((await owner.delete(`/api/devices/${deviceId}`)).status).toBe(204);
    const rows = await t.db.execute(sql`select 1 from user_sessions where sess->>'deviceId' = ${deviceId}`);
    expect(rows.rows).toHaveLength(0);
    expect((await agent.get('/api/devices/current')).status).toBe(401);
    expect((await owner.get('/api/devices')).body.devices[0].status).toBe('revoked');
    expect((await owner.delete(`/api/devices/${deviceId}`)).status).toBe(409);
  });

  test('a device session ends after 90 days, and survives long idle periods before that', async () => {
    const app = makeTestApp();
    const { owner } = await businessWithAgents(app);
    const { agent } = await enrolledDeviceAgent(app, owner);
    app.clock.advance(3 * DAY); // far beyond a member's 12 hours
    expect((await agent.get('/api/devices/current')).status).toBe(200);
    app.clock.advance(88 * DAY);
    expect((await agent.get('/api/devices/current')).status).toBe(401);
  });

  test("only the owner manages devices; another business's device answers 404", async () => {
    const a = await businessWithAgents(t);
    const b = await businessWithAgents(t);
    expect((await a.baker.post('/api/devices').send({ name: 'Sneaky' })).status).toBe(403);
    const { agent, deviceId } = await enrolledDeviceAgent(t, b.owner);
    expect((await a.owner.delete(`/api/devices/${deviceId}`)).status).toBe(404);
    expect((await agent.get('/api/devices/current')).status).toBe(200);
    expect(JSON.stringify((await a.owner.get('/api/devices')).body)).not.toContain(deviceId);
  });

  test('extra fields are refused', async () => {
    const { owner } = await businessWithAgents(t);
    const res = await owner.post('/api/devices').send({ name: 'Tablet', businessId: '00000000-0000-4000-8000-000000000000' });
    expect(res.status).toBe(400);
  });
});
