import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject, type ParsedMail } from 'mailparser';
import nodemailer, { type Transporter } from 'nodemailer';
import { eq } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { capturedMail, mailOutbox } from '../../db/schema/mail';
import type { Logger } from '../../lib/logger';

const UUID = /^<?([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})@/i;
const addressText = (a: AddressObject | AddressObject[] | undefined) => (Array.isArray(a) ? a.map((x) => x.text).join(', ') : a?.text ?? '');

export interface MailCapture {
  port: number;
  close(): Promise<void>;
}

/**
 * The local SMTP stand-in used when no SMTP_URL is set: listens on loopback only, parses every
 * message and stores it in captured_mail for the owner's Sent mail page.
 */
export async function startMailCapture(opts: { db: Db; port?: number; logger?: Logger; now?: () => Date }): Promise<MailCapture> {
  const now = opts.now ?? (() => new Date());
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: 25 * 1024 * 1024,
    logger: false,
    onData(stream, _session, callback) {
      let rawSize = 0;
      stream.on('data', (chunk: Buffer) => { rawSize += chunk.length; });
      simpleParser(stream)
        .then((mail) => storeCapturedMail(opts.db, mail, rawSize, now()))
        .then(() => callback())
        .catch((err: Error) => {
          opts.logger?.warn({ event: 'mail_capture_failed', err: err.message }, 'the local mail stand-in could not store a message');
          callback(err);
        });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port ?? 0, '127.0.0.1', () => resolve());
  });
  server.on('error', (err) => opts.logger?.warn({ event: 'mail_capture_error', err: err.message }, 'local mail stand-in error'));
  const address = server.server.address();
  const port = typeof address === 'object' && address ? address.port : 0;
  return { port, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}

/** Stores one parsed message as the Sent mail page shows it, matched to its business by the outbox id in its Message-ID. */
export async function storeCapturedMail(db: DbOrTx, mail: ParsedMail, rawSize: number, receivedAt: Date): Promise<void> {
  const outboxId = UUID.exec(mail.messageId ?? '')?.[1] ?? null;
  const [outbox] = outboxId ? await db.select({ businessId: mailOutbox.businessId }).from(mailOutbox).where(eq(mailOutbox.id, outboxId)) : [];
  await db.insert(capturedMail).values({
    outboxId: outbox ? outboxId : null,
    businessId: outbox?.businessId ?? null,
    messageId: mail.messageId ?? null,
    fromAddress: addressText(mail.from),
    toAddress: addressText(mail.to),
    subject: mail.subject ?? '',
    sentDate: mail.date ?? null,
    textBody: mail.text ?? null,
    htmlBody: typeof mail.html === 'string' ? mail.html : null,
    attachments: mail.attachments.map((a) => ({ filename: a.filename ?? 'attachment', contentType: a.contentType, size: a.size })),
    rawSize,
    receivedAt,
  });
}

/**
 * A transport that captures in-process instead of over SMTP: nodemailer builds the exact message,
 * mailparser reads it back, and it is stored like the stand-in stores it. For the demo seed, which
 * runs inside one transaction (pass that transaction as db).
 */
export function inProcessCaptureTransport(db: DbOrTx, receivedAt: () => Date): Pick<Transporter, 'sendMail'> {
  const builder = nodemailer.createTransport({ streamTransport: true, buffer: true, newline: 'unix' });
  return {
    sendMail: (async (message: Parameters<Transporter['sendMail']>[0]) => {
      const info = await builder.sendMail(message);
      const raw = info.message as Buffer;
      await storeCapturedMail(db, await simpleParser(raw), raw.length, receivedAt());
      return info;
    }) as Transporter['sendMail'],
  };
}
