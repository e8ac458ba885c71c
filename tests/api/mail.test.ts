import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { businessWithAgents } from '../support/agents';
import { closedPort, startTestSmtp } from '../support/smtp';
import { createMailTransport, queueMail, retryDelayMs, runMailOnce } from '../../server/features/mail/mail.service';
import { startMailCapture } from '../../server/features/mail/mail-capture';
import { mailOutbox } from '../../server/db/schema/mail';

const t = makeTestApp();
const FROM = 'Crumbtrail <no-reply@crumbtrail.invalid>';
let smtp: Awaited<ReturnType<typeof startTestSmtp>>;

beforeAll(async () => { smtp = await startTestSmtp(); });
afterAll(async () => { await smtp.close(); });

const sender = (url: string) => ({ db: t.db, now: () => t.clock.now, transport: createMailTransport(url), from: FROM });

describe('mail outbox', () => {
  test('an invite is queued with the invite and reaches a real SMTP server, naming the business', async () => {
    const { business, owner } = await businessWithAgents(t);
    const res = await owner.post('/api/team/invites').send({ email: 'new.helper@test.invalid', role: 'helper', displayName: 'Pat' });
    expect(res.status).toBe(201);
    const before = smtp.messages.length;
    // Requests never send: the row waits in the outbox until the sender runs.
    const [row] = await t.db.select().from(mailOutbox).where(eq(mailOutbox.dedupeKey, `invite:${res.body.invite.id}`));
    expect(row?.status).toBe('queued');
    const result = await runMailOnce(sender(smtp.url));
    expect(result.sent).toBeGreaterThanOrEqual(1);
    const mail = smtp.messages.slice(before).find((m) => m.subject?.includes(business.name));
    expect(mail, 'invite mail received').toBeDefined();
    expect(mail!.to && !Array.isArray(mail!.to) ? mail!.to.text : '').toBe('new.helper@test.invalid');
    expect(mail!.text).toContain(res.body.code);
    expect(mail!.text).toContain('http://127.0.0.1/join');
    expect(mail!.text).toContain(`Sent by Crumbtrail for ${business.name}`);
    expect(mail!.from?.text).toContain(business.name);
    const [after] = await t.db.select().from(mailOutbox).where(eq(mailOutbox.id, row!.id));
    expect(after?.status).toBe('sent');
    expect(after?.attempts).toBe(1);
  });

  test('a failing SMTP server leaves the message queued for a later retry, and it is sent then', async () => {
    const { business } = await businessWithAgents(t);
    const { id } = await queueMail(t.db, { businessId: business.businessId, to: 'inspector@test.invalid', subject: 'Retry me', text: 'Hello', kind: 'inspector_link' }, t.clock.now);
    const dead = `smtp://127.0.0.1:${await closedPort()}`;
    const first = await runMailOnce(sender(dead));
    expect(first.failed).toBeGreaterThanOrEqual(1);
    const [failed] = await t.db.select().from(mailOutbox).where(eq(mailOutbox.id, id!));
    expect(failed).toMatchObject({ status: 'queued', attempts: 1 });
    expect(failed!.lastError).toMatch(/ECONNREFUSED|connect/i);
    expect(failed!.nextAttemptAt.getTime()).toBeGreaterThan(t.clock.now.getTime());
    // Not due yet: a working server does not get it before the back-off ends.
    await runMailOnce(sender(smtp.url));
    expect(smtp.messages.some((m) => m.subject === 'Retry me')).toBe(false);
    t.clock.advance(retryDelayMs(1) + 1000);
    await runMailOnce(sender(smtp.url));
    expect(smtp.messages.filter((m) => m.subject === 'Retry me')).toHaveLength(1);
    const [sent] = await t.db.select().from(mailOutbox).where(eq(mailOutbox.id, id!));
    expect(sent).toMatchObject({ status: 'sent', attempts: 2 });
  });

  test('one dedupe key sends once, even when queued twice and sent by two senders at once', async () => {
    const { business } = await businessWithAgents(t);
    const key = `test-dedupe:${business.businessId}`;
    const a = await queueMail(t.db, { businessId: business.businessId, to: 'owner@test.invalid', subject: `Once ${key}`, text: 'Once', kind: 'document_expiry', dedupeKey: key }, t.clock.now);
    const b = await queueMail(t.db, { businessId: business.businessId, to: 'owner@test.invalid', subject: `Once ${key}`, text: 'Once', kind: 'document_expiry', dedupeKey: key }, t.clock.now);
    expect(a.queued).toBe(true);
    expect(b.queued).toBe(false);
    await Promise.all([runMailOnce(sender(smtp.url)), runMailOnce(sender(smtp.url)), runMailOnce(sender(smtp.url))]);
    expect(smtp.messages.filter((m) => m.subject === `Once ${key}`)).toHaveLength(1);
  });

  test('the local stand-in stores what it receives; the owner sees it on Sent mail, others do not', async () => {
    const capture = await startMailCapture({ db: t.db });
    try {
      const { business, owner, baker } = await businessWithAgents(t);
      const other = await businessWithAgents(t);
      await queueMail(t.db, {
        businessId: business.businessId, to: 'someone@test.invalid', subject: 'Captured hello', text: 'Plain words', html: '<p>Plain <b>words</b></p><script>alert(1)</script>', kind: 'inspector_link',
        attachments: [{ filename: 'note.txt', contentType: 'text/plain', contentBase64: Buffer.from('hi').toString('base64') }],
      }, t.clock.now);
      await runMailOnce(sender(`smtp://127.0.0.1:${capture.port}`));
      const res = await owner.get('/api/sent-mail');
      expect(res.status).toBe(200);
      const msg = res.body.messages.find((m: { subject: string }) => m.subject === 'Captured hello');
      expect(msg).toMatchObject({ to: 'someone@test.invalid', kind: 'inspector_link', attachments: [{ filename: 'note.txt', contentType: 'text/plain', size: 2 }] });
      expect(msg.text).toContain('Plain words');
      expect(msg.from).toContain(business.name);
      expect((await baker.get('/api/sent-mail')).status).toBe(403);
      const theirs = await other.owner.get('/api/sent-mail');
      expect(theirs.body.messages.some((m: { subject: string }) => m.subject === 'Captured hello')).toBe(false);
    } finally {
      await capture.close();
    }
  });
});
