import { pgTable, text, uuid, timestamp, integer, jsonb, index, uniqueIndex } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';

export interface OutboxAttachment {
  filename: string;
  contentType: string;
  /** File bytes as base64 (attachments stay small: notices, not archives). */
  contentBase64: string;
}

// Mail waiting to go out. Filled in the same transaction as the change it reports; a background
// sender claims due rows (FOR UPDATE SKIP LOCKED), so a request never waits on SMTP.
export const mailOutbox = pgTable(
  'mail_outbox',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    toAddress: text().notNull(),
    subject: text().notNull(),
    textBody: text().notNull(),
    htmlBody: text(),
    attachments: jsonb().$type<OutboxAttachment[]>().notNull().default([]),
    kind: text().notNull(),
    // Same key → one message, even across restarts and several server processes.
    dedupeKey: text(),
    status: text().$type<'queued' | 'sending' | 'sent' | 'failed'>().notNull().default('queued'),
    attempts: integer().notNull().default(0),
    // When the row may next be claimed; while 'sending' it is the end of the sender's lease.
    nextAttemptAt: timestamp({ withTimezone: true }).notNull(),
    lastError: text(),
    sentAt: timestamp({ withTimezone: true }),
    ...timestamps,
  },
  (t) => [
    uniqueIndex('mail_outbox_dedupe_key_key').on(t.dedupeKey),
    index('mail_outbox_due_idx').on(t.status, t.nextAttemptAt),
    index('mail_outbox_business_id_idx').on(t.businessId),
  ],
);
export type MailOutboxRow = typeof mailOutbox.$inferSelect;

export interface CapturedAttachment {
  filename: string;
  contentType: string;
  size: number;
}

// What the local SMTP stand-in received, parsed: shown on the owner's Sent mail page.
export const capturedMail = pgTable(
  'captured_mail',
  {
    id: uuid().primaryKey().defaultRandom(),
    // Matched through the Message-ID the sender sets from the outbox row; null for foreign mail.
    outboxId: uuid(),
    businessId: uuid().references(() => businesses.id),
    messageId: text(),
    fromAddress: text().notNull(),
    toAddress: text().notNull(),
    subject: text().notNull(),
    sentDate: timestamp({ withTimezone: true }),
    textBody: text(),
    htmlBody: text(),
    attachments: jsonb().$type<CapturedAttachment[]>().notNull().default([]),
    rawSize: integer().notNull(),
    receivedAt: timestamp({ withTimezone: true }).notNull(),
  },
  (t) => [index('captured_mail_business_id_idx').on(t.businessId, t.receivedAt)],
);
export type CapturedMailRow = typeof capturedMail.$inferSelect;
