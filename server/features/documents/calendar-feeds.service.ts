import { randomBytes } from 'node:crypto';
import { and, desc, eq } from 'drizzle-orm';
import ical from 'ical-generator';
import type { Db } from '../../db/client';
import { businesses } from '../../db/schema/business';
import { calendarFeeds } from '../../db/schema/documents';
import type { Actor } from '../../lib/actor';
import { HttpError, conflict, notFound } from '../../lib/http-error';
import { sha256Hex } from '../../lib/tokens';
import { appendRecordEvent } from '../records/record-events.service';
import { currentVersionsExpiring } from './documents.service';
import { DOCUMENT_KIND_LABELS, type CalendarFeed, type CreateCalendarFeedInput, type CreatedCalendarFeed } from '../../../shared/contracts/documents';

type FeedRow = typeof calendarFeeds.$inferSelect;
const toFeed = (r: FeedRow): CalendarFeed => ({ id: r.id, name: r.name, createdAt: r.createdAt.toISOString(), lastFetchedAt: r.lastFetchedAt?.toISOString() ?? null, revokedAt: r.revokedAt?.toISOString() ?? null });

export const calendarFeedUrl = (publicBaseUrl: string, token: string) => `${publicBaseUrl.replace(/\/$/, '')}/calendar/${token}.ics`;

/** A new subscription link: 256 random bits, only the SHA-256 stored; the URL is in this answer only. */
export async function createCalendarFeed(db: Db, actor: Actor, input: CreateCalendarFeedInput, publicBaseUrl: string, now: Date): Promise<CreatedCalendarFeed> {
  const token = randomBytes(32).toString('base64url');
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(calendarFeeds).values({ businessId: actor.businessId, name: input.name, tokenHash: sha256Hex(token), createdByUserId: actor.userId, createdAt: now, updatedAt: now }).returning();
    await appendRecordEvent(tx, actor, { entityType: 'calendar_feed', entityId: row!.id, action: 'create', payload: { name: input.name } }, now);
    return { feed: toFeed(row!), url: calendarFeedUrl(publicBaseUrl, token) };
  });
}

export async function listCalendarFeeds(db: Db, actor: Actor): Promise<CalendarFeed[]> {
  const rows = await db.select().from(calendarFeeds).where(eq(calendarFeeds.businessId, actor.businessId)).orderBy(desc(calendarFeeds.createdAt));
  return rows.map(toFeed);
}

export async function revokeCalendarFeed(db: Db, actor: Actor, feedId: string, now: Date): Promise<void> {
  await db.transaction(async (tx) => {
    const [row] = await tx.select().from(calendarFeeds).where(and(eq(calendarFeeds.id, feedId), eq(calendarFeeds.businessId, actor.businessId))).for('update');
    if (!row) throw notFound('That calendar feed');
    if (row.revokedAt) throw conflict('That calendar feed is already turned off.');
    await tx.update(calendarFeeds).set({ revokedAt: now, updatedAt: now }).where(eq(calendarFeeds.id, row.id));
    await appendRecordEvent(tx, actor, { entityType: 'calendar_feed', entityId: row.id, action: 'revoke', payload: { name: row.name } }, now);
  });
}

/** The iCalendar (RFC 5545) text for a feed token: one all-day event per current expiry date. */
export async function renderCalendarFeed(db: Db, token: string, now: Date): Promise<string> {
  const [feed] = await db.select().from(calendarFeeds).where(eq(calendarFeeds.tokenHash, sha256Hex(token)));
  if (!feed) throw notFound('That calendar feed');
  if (feed.revokedAt) throw new HttpError(410, 'gone', 'This calendar feed was turned off by the business.');
  const [business] = await db.select({ name: businesses.name }).from(businesses).where(eq(businesses.id, feed.businessId));
  const rows = await currentVersionsExpiring(db, { businessId: feed.businessId });
  const cal = ical({ name: `${business!.name}: document expiry dates`, prodId: { company: 'Crumbtrail', product: 'Document expiry', language: 'EN' } });
  for (const { v, kind } of rows) {
    const label = DOCUMENT_KIND_LABELS[kind as keyof typeof DOCUMENT_KIND_LABELS] ?? 'Document';
    cal.createEvent({
      id: `doc-expiry-${v.id}@crumbtrail`,
      // Noon UTC keeps the all-day date the same whatever zone the server runs in.
      start: new Date(`${v.expiresOn}T12:00:00Z`),
      allDay: true,
      stamp: now,
      summary: `Expires: ${v.title}`,
      description: `${label} for ${business!.name} expires on ${v.expiresOn}. Upload the renewed copy in Crumbtrail (Records).`,
    });
  }
  await db.update(calendarFeeds).set({ lastFetchedAt: now }).where(eq(calendarFeeds.id, feed.id));
  return cal.toString();
}
