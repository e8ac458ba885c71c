import { describe, expect, test } from 'vitest';
import { eq, like } from 'drizzle-orm';
import { PDFDocument } from 'pdf-lib';
import { PNG } from 'pngjs';
import { makeTestApp } from '../support/app';
import { businessWithAgents, signedInAgent, type ApiAgent } from '../support/agents';
import { runReminderScan } from '../../server/features/documents/documents.service';
import { mailOutbox } from '../../server/db/schema/mail';
import { addCalendarDays } from '../../shared/domain/calendar-date';

const t = makeTestApp();
const today = () => t.clock.now.toISOString().slice(0, 10);

async function pdfBytes(text = 'Cottage food registration'): Promise<Buffer> {
  const doc = await PDFDocument.create();
  doc.addPage().drawText(text);
  return Buffer.from(await doc.save());
}
function pngBytes(): Buffer {
  const png = new PNG({ width: 2, height: 2 });
  return PNG.sync.write(png);
}

function upload(agent: ApiAgent, fields: Record<string, string>, file: { bytes: Buffer; name: string }, url = '/api/documents') {
  const req = agent.post(url);
  for (const [k, v] of Object.entries(fields)) req.field(k, v);
  return req.attach('file', file.bytes, file.name);
}

// Test business zone is America/Chicago; dates near "today" are relative so the day count is stable enough (±1 around UTC midnight).
describe('documents', () => {
  test('owner uploads a PDF and a PNG; bakers and helpers may list and download but not upload', async () => {
    const { owner, baker, helper, business } = await businessWithAgents(t);
    const res = await upload(owner, { kind: 'registration', title: 'Cottage food registration', issuedOn: addCalendarDays(today(), -200), expiresOn: addCalendarDays(today(), 150) }, { bytes: await pdfBytes(), name: 'registration.pdf' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ kind: 'registration', versionCount: 1, expiryStatus: 'valid', current: { contentType: 'application/pdf', displayName: 'registration.pdf' } });
    const png = await upload(owner, { kind: 'food_handler', title: 'Food handler card', issuedOn: addCalendarDays(today(), -700), expiresOn: addCalendarDays(today(), 20), holderUserId: business.members.helper.userId }, { bytes: pngBytes(), name: 'card.png' });
    expect(png.status).toBe(201);
    expect(png.body).toMatchObject({ expiryStatus: 'expiring_soon', holder: { userId: business.members.helper.userId } });

    for (const agent of [baker, helper]) {
      const list = await agent.get('/api/documents');
      expect(list.status).toBe(200);
      expect(list.body.documents).toHaveLength(2);
      // Soonest expiry first.
      expect(list.body.documents[0].current.title).toBe('Food handler card');
      const denied = await upload(agent, { kind: 'other', title: 'x', issuedOn: today() }, { bytes: await pdfBytes(), name: 'x.pdf' });
      expect(denied.status).toBe(403);
    }
    const dl = await helper.get(`/api/documents/${res.body.id}/versions/${res.body.current.id}/download`).buffer(true);
    expect(dl.status).toBe(200);
    expect(dl.headers['content-disposition']).toMatch(/^attachment; filename="registration.pdf"/);
    expect(dl.headers['x-content-type-options']).toBe('nosniff');
    expect(dl.headers['content-security-policy']).toMatch(/sandbox/);
    const back = await PDFDocument.load(dl.body as Buffer);
    expect(back.getPageCount()).toBe(1);
  });

  test('upload validation: type by content, size, dates, fields', async () => {
    const { owner } = await businessWithAgents(t);
    const fields = { kind: 'insurance', title: 'Liability insurance', issuedOn: today(), expiresOn: addCalendarDays(today(), 365) };
    const html = await upload(owner, fields, { bytes: Buffer.from('<html><script>alert(1)</script></html>'), name: 'policy.pdf' });
    expect(html.status).toBe(415);
    const exe = await upload(owner, fields, { bytes: Buffer.concat([Buffer.from('MZ'), Buffer.alloc(200)]), name: 'photo.jpg' });
    expect(exe.status).toBe(415);
    const svg = await upload(owner, fields, { bytes: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg"/>'), name: 'a.svg' });
    expect(svg.status).toBe(415);
    const big = await upload(owner, fields, { bytes: Buffer.concat([await pdfBytes(), Buffer.alloc(10 * 1024 * 1024)]), name: 'big.pdf' });
    expect(big.status).toBe(413);
    const backwards = await upload(owner, { ...fields, expiresOn: addCalendarDays(today(), -1) }, { bytes: await pdfBytes(), name: 'p.pdf' });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.fieldErrors.expiresOn).toBeDefined();
    const badKind = await upload(owner, { ...fields, kind: 'recipe' }, { bytes: await pdfBytes(), name: 'p.pdf' });
    expect(badKind.status).toBe(400);
    const traversal = await upload(owner, fields, { bytes: await pdfBytes(), name: '../../etc/passwd.pdf' });
    expect(traversal.status).toBe(201);
    expect(traversal.body.current.displayName).toBe('passwd.pdf');
  });

  test('a renewed certificate is a new version; the old one stays downloadable; other businesses get 404', async () => {
    const { owner } = await businessWithAgents(t);
    const other = await businessWithAgents(t);
    const created = await upload(owner, { kind: 'food_manager', title: 'Food manager certificate', issuedOn: addCalendarDays(today(), -1800), expiresOn: addCalendarDays(today(), 5) }, { bytes: await pdfBytes('v1'), name: 'cert.pdf' });
    const v1 = created.body.current.id;
    const noReason = await upload(owner, { issuedOn: today(), expiresOn: addCalendarDays(today(), 1825) }, { bytes: await pdfBytes('v2'), name: 'cert2.pdf' }, `/api/documents/${created.body.id}/versions`);
    expect(noReason.status).toBe(400);
    const renewed = await upload(owner, { issuedOn: today(), expiresOn: addCalendarDays(today(), 1825), reason: 'Renewed after the course' }, { bytes: await pdfBytes('v2'), name: 'cert2.pdf' }, `/api/documents/${created.body.id}/versions`);
    expect(renewed.status).toBe(201);
    expect(renewed.body).toMatchObject({ versionCount: 2, expiryStatus: 'valid', current: { version: 2, reason: 'Renewed after the course' } });
    expect(renewed.body.versions.map((v: { version: number }) => v.version)).toEqual([2, 1]);
    expect((await owner.get(`/api/documents/${created.body.id}/versions/${v1}/download`)).status).toBe(200);
    expect((await other.owner.get(`/api/documents/${created.body.id}`)).status).toBe(404);
    expect((await other.owner.get(`/api/documents/${created.body.id}/versions/${v1}/download`)).status).toBe(404);
    const newVersionElsewhere = await upload(other.owner, { issuedOn: today(), reason: 'x' }, { bytes: await pdfBytes(), name: 'x.pdf' }, `/api/documents/${created.body.id}/versions`);
    expect(newVersionElsewhere.status).toBe(404);
  });

  test('the Kitchen board lists documents expiring within 30 days', async () => {
    const { owner, helper } = await businessWithAgents(t);
    await upload(owner, { kind: 'food_handler', title: 'Helper food handler card', issuedOn: addCalendarDays(today(), -700), expiresOn: addCalendarDays(today(), 6) }, { bytes: await pdfBytes(), name: 'c.pdf' });
    await upload(owner, { kind: 'registration', title: 'Registration far away', issuedOn: addCalendarDays(today(), -10), expiresOn: addCalendarDays(today(), 200) }, { bytes: await pdfBytes(), name: 'r.pdf' });
    const board = await helper.get('/api/kitchen-board');
    expect(board.status).toBe(200);
    const section = board.body.sections.find((s: { kind: string }) => s.kind === 'documents_expiring');
    expect(section.items.map((i: { title: string }) => i.title)).toEqual(['Helper food handler card']);
  });

  test('expiry reminders: one per stage, run twice and concurrently, only the current version', async () => {
    const { owner, business } = await businessWithAgents(t);
    const created = await upload(owner, { kind: 'permit', title: `Permit ${business.businessId}`, issuedOn: addCalendarDays(today(), -300), expiresOn: addCalendarDays(today(), 40) }, { bytes: await pdfBytes(), name: 'p.pdf' });
    const versionId = created.body.current.id;
    const deps = { db: t.db, now: () => t.clock.now, publicBaseUrl: 'http://127.0.0.1' };
    const mails = () => t.db.select().from(mailOutbox).where(like(mailOutbox.dedupeKey, `doc-expiry:${versionId}:%`));
    await runReminderScan(deps);
    expect(await mails()).toHaveLength(0);
    t.clock.advance(11 * 86_400_000); // about 29 days left → the 30-day reminder
    await Promise.all([runReminderScan(deps), runReminderScan(deps), runReminderScan(deps)]);
    await runReminderScan(deps);
    let rows = await mails();
    expect(rows.map((r) => r.dedupeKey)).toEqual([`doc-expiry:${versionId}:30`]);
    expect(rows[0]!.toAddress).toBe(business.members.owner.email);
    expect(rows[0]!.textBody).toContain(business.name);
    t.clock.advance(23 * 86_400_000); // about 6 days left → the 7-day reminder
    await Promise.all([runReminderScan(deps), runReminderScan(deps)]);
    rows = await mails();
    expect(rows.map((r) => r.dedupeKey).sort()).toEqual([`doc-expiry:${versionId}:30`, `doc-expiry:${versionId}:7`]);
    // Renewed: the old version's 1-day reminder never goes out.
    // The clock moved weeks: the owner signs in again (sessions last 12 hours at most).
    const again = await signedInAgent(t, business, 'owner');
    const renewed = await upload(again, { issuedOn: today(), expiresOn: addCalendarDays(today(), 700), reason: 'Renewed' }, { bytes: await pdfBytes(), name: 'p2.pdf' }, `/api/documents/${created.body.id}/versions`);
    expect(renewed.status).toBe(201);
    t.clock.advance(5 * 86_400_000);
    await runReminderScan(deps);
    expect(await mails()).toHaveLength(2);
    t.clock.set(new Date());
    await t.db.delete(mailOutbox).where(eq(mailOutbox.businessId, business.businessId));
  });

  test('calendar feed: revocable link, parses as iCalendar with the expiry dates', async () => {
    const { owner, baker } = await businessWithAgents(t);
    const expiresOn = addCalendarDays(today(), 90);
    await upload(owner, { kind: 'insurance', title: 'Product liability insurance', issuedOn: addCalendarDays(today(), -275), expiresOn }, { bytes: await pdfBytes(), name: 'i.pdf' });
    expect((await baker.post('/api/calendar-feeds').send({ name: 'x' })).status).toBe(403);
    const created = await owner.post('/api/calendar-feeds').send({ name: 'My phone' });
    expect(created.status).toBe(201);
    const url = new URL(created.body.url);
    const token = url.pathname.replace(/^\/calendar\//, '').replace(/\.ics$/, '');
    expect(Buffer.from(token, 'base64url').length).toBeGreaterThanOrEqual(16);
    const feed = await owner.agent.get(url.pathname);
    expect(feed.status).toBe(200);
    expect(feed.headers['content-type']).toMatch(/^text\/calendar/);
    // A tiny RFC 5545 reader: unfold lines, then check the component structure and properties.
    const lines = feed.text.replace(/\r\n[ \t]/g, '').split(/\r\n/).filter(Boolean);
    expect(lines[0]).toBe('BEGIN:VCALENDAR');
    expect(lines.at(-1)).toBe('END:VCALENDAR');
    expect(lines).toContain('VERSION:2.0');
    const events = lines.filter((l) => l === 'BEGIN:VEVENT').length;
    expect(events).toBe(1);
    expect(lines).toContain(`DTSTART;VALUE=DATE:${expiresOn.replaceAll('-', '')}`);
    expect(lines.some((l) => l.startsWith('SUMMARY:Expires: Product liability insurance'))).toBe(true);
    expect(lines.some((l) => l.startsWith('UID:'))).toBe(true);
    const list = await owner.get('/api/calendar-feeds');
    expect(list.body.feeds[0].lastFetchedAt).not.toBeNull();
    expect((await owner.delete(`/api/calendar-feeds/${created.body.feed.id}`)).status).toBe(204);
    expect((await owner.agent.get(url.pathname)).status).toBe(410);
    expect((await owner.agent.get('/calendar/AAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAAA.ics')).status).toBe(404);
  });
});
