import { z } from 'zod';

export const MAIL_KINDS = ['invite', 'inspector_link', 'holding_alert', 'document_expiry', 'recall_notice'] as const;

/** One message as the local SMTP stand-in received it (GET /api/sent-mail). */
export const SentMailSchema = z.object({
  id: z.string().uuid(),
  kind: z.enum(MAIL_KINDS).nullable(),
  from: z.string(),
  to: z.string(),
  subject: z.string(),
  date: z.string(),
  receivedAt: z.string(),
  text: z.string().nullable(),
  /** Shown only inside a sandboxed iframe (srcdoc), never inserted into the page. */
  html: z.string().nullable(),
  attachments: z.array(z.object({ filename: z.string(), contentType: z.string(), size: z.number() })),
});
export type SentMail = z.infer<typeof SentMailSchema>;

export const PendingMailSchema = z.object({
  id: z.string().uuid(),
  kind: z.string(),
  to: z.string(),
  subject: z.string(),
  status: z.enum(['queued', 'sending', 'sent', 'failed']),
  attempts: z.number(),
  lastError: z.string().nullable(),
  nextAttemptAt: z.string(),
  createdAt: z.string(),
});
export type PendingMail = z.infer<typeof PendingMailSchema>;

/** GET /api/sent-mail (owner). */
export const SentMailListSchema = z.object({
  /** False when a real SMTP server is configured: nothing is captured then. */
  capturing: z.boolean(),
  messages: z.array(SentMailSchema),
  pending: z.array(PendingMailSchema),
});
export type SentMailList = z.infer<typeof SentMailListSchema>;
