import { eq } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { businesses } from '../../db/schema/business';
import type { Actor } from '../../lib/actor';
import type { CreatedInvite } from '../../../shared/contracts/team';
import { queueMail } from './mail.service';

const ROLE_WORDS: Record<string, string> = { owner: 'an owner', baker: 'a baker', helper: 'a helper' };

function formatDateTime(iso: string): string {
  return new Date(iso).toLocaleString('en-US', { dateStyle: 'long', timeStyle: 'short', timeZone: 'UTC' }) + ' UTC';
}

/** The invite e-mail: the code is in the text only, never in a link (it is a one-time secret). */
export async function queueInviteMail(tx: DbOrTx, actor: Actor, created: CreatedInvite, publicBaseUrl: string, now: Date) {
  const { invite, code } = created;
  const [business] = await tx.select({ name: businesses.name }).from(businesses).where(eq(businesses.id, actor.businessId));
  const businessName = business?.name ?? 'your bakery';
  const greeting = invite.displayName ? `Hello ${invite.displayName},` : 'Hello,';
  const text = [
    greeting,
    '',
    `${actor.name} has invited you to join ${businessName} on Crumbtrail as ${ROLE_WORDS[invite.role] ?? invite.role}.`,
    '',
    `To accept, open ${publicBaseUrl.replace(/\/$/, '')}/join and enter this code:`,
    '',
    `    ${code}`,
    '',
    `The code works once and expires on ${formatDateTime(invite.expiresAt)}. If you were not expecting this, you can ignore this e-mail.`,
  ].join('\n');
  return queueMail(tx, { businessId: actor.businessId, to: invite.email, subject: `You're invited to join ${businessName} on Crumbtrail`, text, kind: 'invite', dedupeKey: `invite:${invite.id}` }, now);
}
