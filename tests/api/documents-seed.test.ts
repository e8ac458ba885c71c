import { describe, expect, test } from 'vitest';
import os from 'node:os';
import path from 'node:path';
import { and, eq } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { createTestBusiness } from '../support/agents';
import { documentsSeedStep } from '../../server/db/seed/documents';
import { mailOutbox } from '../../server/db/schema/mail';
import { documentFile, documentsExpiringSoon, listDocuments } from '../../server/features/documents/documents.service';
import { listInspectorLinks } from '../../server/features/inspector/inspector-links.service';
import { listSentMail } from '../../server/features/mail/mail.service';
import { verifyBusinessChain } from '../../server/features/records/record-events.service';
import { localDiskStorage } from '../../server/lib/storage';
import type { Actor } from '../../server/lib/actor';

const t = makeTestApp();

describe('documents demo step', () => {
  test('seeds documents, reminders and inspector links, with every message in Sent mail and none left queued', async () => {
    const now = new Date();
    // Its own business (seed.test.ts loads the one demo business).
    const business = await createTestBusiness(t);
    const other = await createTestBusiness(t);
    const actors = {} as Record<'owner' | 'baker' | 'helper', Actor>;
    for (const role of ['owner', 'baker', 'helper'] as const) {
      const m = business.members[role];
      actors[role] = { kind: 'member', businessId: business.businessId, userId: m.userId, name: m.displayName, role };
    }
    // Another business's queued mail must stay queued for the real sender.
    const [foreign] = await t.db.insert(mailOutbox).values({ businessId: other.businessId, toAddress: 'x@example.test', subject: 's', textBody: 't', kind: 'invite', nextAttemptAt: new Date(now.getTime() - 60_000), createdAt: now, updatedAt: now }).returning();
    const uploadDir = path.join(os.tmpdir(), `crumbtrail-docseed-${process.pid}`);
    await t.db.transaction((tx) => documentsSeedStep.run({ db: tx as unknown as typeof t.db, now, businessId: business.businessId, actors, publicBaseUrl: 'http://127.0.0.1:5180', uploadDir, shared: new Map() }));

    const { documents } = await listDocuments(t.db, actors.owner, now);
    expect(documents.map((d) => d.kind).sort()).toEqual(['food_handler', 'food_manager', 'inspection_report', 'registration']);
    const registration = documents.find((d) => d.kind === 'registration')!;
    expect(registration.daysLeft).toBeGreaterThan(140);
    expect(registration.daysLeft).toBeLessThan(160);
    const soon = await documentsExpiringSoon(t.db, business.businessId, now);
    expect(soon.map((d) => [d.kind, d.daysLeft, d.holder?.userId])).toEqual([['food_handler', 6, actors.helper.userId]]);
    // The stored files are real PDFs.
    const storage = localDiskStorage(uploadDir);
    const report = documents.find((d) => d.kind === 'inspection_report')!;
    const v = await documentFile(t.db, business.businessId, report.id, report.current.id);
    const chunks: Buffer[] = [];
    for await (const c of await storage.open(v.storageKey)) chunks.push(c as Buffer);
    expect(Buffer.concat(chunks).subarray(0, 5).toString()).toBe('%PDF-');

    const links = await listInspectorLinks(t.db, actors.owner, now);
    expect(links.map((l) => l.status).sort()).toEqual(['active', 'revoked']);
    expect(links.find((l) => l.status === 'active')!.views).toHaveLength(2);

    const mail = await listSentMail(t.db, actors.owner);
    const kinds = mail.map((m) => m.kind).sort();
    expect(kinds).toEqual(['document_expiry', 'document_expiry', 'inspector_link', 'invite']);
    const reminders = mail.filter((m) => m.kind === 'document_expiry').map((m) => m.subject).sort();
    expect(reminders[0]).toMatch(/expires in 30 days/);
    expect(reminders[1]).toMatch(/expires in 6 days/);
    expect(mail.find((m) => m.kind === 'inspector_link')!.text).toMatch(/\/inspect\/[A-Za-z0-9_-]{43}/);
    expect(mail.every((m) => m.from.includes('via Crumbtrail'))).toBe(true);
    const pending = await t.db.select().from(mailOutbox).where(and(eq(mailOutbox.businessId, business.businessId), eq(mailOutbox.status, 'queued')));
    expect(pending).toEqual([]);
    const [stillQueued] = await t.db.select().from(mailOutbox).where(eq(mailOutbox.id, foreign!.id));
    expect(stillQueued!.status).toBe('queued');
    expect(await verifyBusinessChain(t.db, business.businessId)).toMatchObject({ ok: true });
  }, 60_000);
});
