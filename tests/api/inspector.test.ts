import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { ApiAgent, businessWithAgents } from '../support/agents';
import { startTestSmtp } from '../support/smtp';
import { createMailTransport, runMailOnce } from '../../server/features/mail/mail.service';
import { inspectorLinks, inspectorViews } from '../../server/db/schema/inspector';
import { sha256Hex } from '../../server/lib/tokens';
import { addCalendarDays } from '../../shared/domain/calendar-date';

const t = makeTestApp();
let smtp: Awaited<ReturnType<typeof startTestSmtp>>;
beforeAll(async () => { smtp = await startTestSmtp(); });
afterAll(async () => { await smtp.close(); });
const today = () => t.clock.now.toISOString().slice(0, 10);
const tokenOf = (url: string) => new URL(url).pathname.replace('/inspect/', '');

async function issue(owner: ApiAgent, extra: Record<string, unknown> = {}) {
  const res = await owner.post('/api/inspector-links').send({ inspectorName: 'Millbrook County Health', rangeFrom: addCalendarDays(today(), -30), rangeTo: today(), ...extra });
  expect(res.status).toBe(201);
  return res.body as { link: { id: string; expiresAt: string }; url: string; emailed: boolean };
}

async function openLink(url: string) {
  const inspector = new ApiAgent(t.app);
  const res = await inspector.agent.get(new URL(url).pathname);
  return { inspector, res };
}

describe('inspector links', () => {
  test('tokens have at least 128 random bits, are distinct, and only their hash is stored', async () => {
    const { owner } = await businessWithAgents(t);
    const tokens = new Set<string>();
    for (let i = 0; i < 5; i += 1) {
      const { url, link } = await issue(owner);
      const token = tokenOf(url);
      expect(Buffer.from(token, 'base64url').length * 8).toBeGreaterThanOrEqual(128);
      tokens.add(token);
      const [row] = await t.db.select().from(inspectorLinks).where(eq(inspectorLinks.id, link.id));
      expect(row!.tokenHash).toBe(sha256Hex(token));
      expect(JSON.stringify(row)).not.toContain(token);
    }
    expect(tokens.size).toBe(5);
  });

  test('the link is e-mailed, and the token is exchanged for a cookie with a 303 to a token-free URL', async () => {
    const { owner, business } = await businessWithAgents(t);
    const created = await issue(owner, { inspectorEmail: 'inspector@millbrook-health.test' });
    expect(created.emailed).toBe(true);
    await runMailOnce({ db: t.db, now: () => t.clock.now, transport: createMailTransport(smtp.url), from: 'Crumbtrail <no-reply@crumbtrail.invalid>' });
    const mail = smtp.messages.find((m) => m.text?.includes(created.url));
    expect(mail, 'mail with the link').toBeDefined();
    expect(mail!.subject).toContain(business.name);
    expect(!Array.isArray(mail!.to) && mail!.to?.text).toBe('inspector@millbrook-health.test');

    const { inspector, res } = await openLink(created.url);
    expect(res.status).toBe(303);
    expect(res.headers.location).toBe('/inspector');
    expect(res.headers['referrer-policy']).toBe('no-referrer');
    expect(String(res.headers['set-cookie'])).toMatch(/HttpOnly/i);
    expect(res.headers.location).not.toContain(tokenOf(created.url));
    const session = await inspector.get('/api/inspector/session');
    expect(session.status).toBe(200);
    expect(session.body).toMatchObject({ businessName: business.name, inspectorName: 'Millbrook County Health' });
    expect(session.headers['referrer-policy']).toBe('no-referrer');
  });

  test('read-only: every write is refused, member routes are refused, views are logged and shown to the owner', async () => {
    const { owner } = await businessWithAgents(t);
    const created = await issue(owner);
    const { inspector } = await openLink(created.url);
    await inspector.refreshCsrf();
    expect((await inspector.get('/api/inspector/records')).status).toBe(200);
    for (const [method, url] of [['post', '/api/inspector-links'], ['post', '/api/documents'], ['post', '/api/batches'], ['delete', `/api/inspector-links/${created.link.id}`], ['post', '/api/team/invites'], ['post', '/api/calendar-feeds']] as const) {
      const r = await inspector[method](url).send({});
      expect(r.status, `${method} ${url}`).toBe(403);
    }
    expect((await inspector.get('/api/team/members')).status).toBe(403);
    expect((await inspector.get('/api/sent-mail')).status).toBe(403);
    const views = await t.db.select().from(inspectorViews).where(eq(inspectorViews.linkId, created.link.id));
    expect(views.map((v) => v.path)).toEqual(expect.arrayContaining(['/inspect', '/api/inspector/records']));
    expect(views.every((v) => /^[0-9a-f]{16}$/.test(v.ipHash))).toBe(true);
    const list = await owner.get('/api/inspector-links');
    const mine = list.body.links.find((l: { id: string }) => l.id === created.link.id);
    expect(mine.views.length).toBeGreaterThanOrEqual(2);
  });

  test('records of the range carry no customer data; another business sees nothing of it', async () => {
    const { owner, business } = await businessWithAgents(t);
    const other = await businessWithAgents(t);
    const created = await issue(owner);
    const { inspector } = await openLink(created.url);
    const records = await inspector.get('/api/inspector/records');
    expect(records.status).toBe(200);
    expect(Object.keys(records.body).sort()).toEqual(['batches', 'cleaningRuns', 'documents', 'holdingPeriods', 'recordEvents']);
    const text = JSON.stringify(records.body);
    for (const word of ['customer', 'phone', '@', 'sale']) expect(text.toLowerCase()).not.toContain(word);
    expect(text).not.toContain(business.members.owner.email);
    // Another owner cannot list or revoke this link.
    expect((await other.owner.get('/api/inspector-links')).body.links.some((l: { id: string }) => l.id === created.link.id)).toBe(false);
    expect((await other.owner.delete(`/api/inspector-links/${created.link.id}`)).status).toBe(404);
    // The inspector is held to the business of the link.
    const session = await inspector.get('/api/inspector/session');
    expect(session.body.businessName).toBe(business.name);
  });

  test('the inspector downloads the packet for exactly the link range', async () => {
    const { owner } = await businessWithAgents(t);
    const created = await issue(owner, { rangeFrom: addCalendarDays(today(), -7), rangeTo: today() });
    const { inspector } = await openLink(created.url);
    await inspector.refreshCsrf();
    expect((await inspector.get('/api/inspector/session')).body.packetAvailable).toBe(true);
    const res = await inspector.post('/api/inspector/audit-packet').send({ from: '2000-01-01', to: today() }).buffer(true).parse((r, cb) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toContain('application/zip');
    // The file name carries the link's range, not the one the request asked for.
    expect(res.headers['content-disposition']).toContain(addCalendarDays(today(), -7));
    expect((res.body as Buffer).subarray(0, 2).toString('latin1')).toBe('PK');
  });

  test('expiry: the session ends on the next request and the link shows a plain 410 page', async () => {
    const { owner } = await businessWithAgents(t);
    const created = await issue(owner, { validDays: 1 });
    const { inspector } = await openLink(created.url);
    expect((await inspector.get('/api/inspector/session')).status).toBe(200);
    t.clock.advance(86_400_000 + 1000);
    try {
      expect((await inspector.get('/api/inspector/session')).status).toBe(401);
      const again = await openLink(created.url);
      expect(again.res.status).toBe(410);
      expect(again.res.text).toContain('expired');
      expect(again.res.headers['content-type']).toMatch(/text\/html/);
    } finally {
      t.clock.set(new Date());
    }
  });

  test('revocation ends open sessions and the link', async () => {
    const { owner } = await businessWithAgents(t);
    const created = await issue(owner);
    const { inspector } = await openLink(created.url);
    expect((await inspector.get('/api/inspector/records')).status).toBe(200);
    expect((await owner.delete(`/api/inspector-links/${created.link.id}`)).status).toBe(204);
    expect((await inspector.get('/api/inspector/records')).status).toBe(401);
    const again = await openLink(created.url);
    expect(again.res.status).toBe(410);
    expect(again.res.text).toContain('withdrawn');
    const list = await owner.get('/api/inspector-links');
    expect(list.body.links.find((l: { id: string }) => l.id === created.link.id).status).toBe('revoked');
    expect((await openLink('http://127.0.0.1/inspect/not-a-real-token')).res.status).toBe(404);
  });

  test('roles and validation: only owners issue links; ranges and lifetimes are checked', async () => {
    const { owner, baker, helper } = await businessWithAgents(t);
    for (const agent of [baker, helper]) expect((await agent.post('/api/inspector-links').send({ inspectorName: 'x', rangeFrom: today(), rangeTo: today() })).status).toBe(403);
    const backwards = await owner.post('/api/inspector-links').send({ inspectorName: 'x', rangeFrom: today(), rangeTo: addCalendarDays(today(), -1) });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.fieldErrors.rangeTo).toBeDefined();
    expect((await owner.post('/api/inspector-links').send({ inspectorName: 'x', rangeFrom: today(), rangeTo: today(), validDays: 31 })).status).toBe(400);
    const def = await issue(owner);
    expect(Date.parse(def.link.expiresAt) - t.clock.now.getTime()).toBeGreaterThan(7 * 86_400_000 - 60_000);
  });
});
