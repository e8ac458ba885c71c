import { createHmac, randomBytes } from 'node:crypto';
import { and, asc, desc, eq, gte, inArray, lte, notInArray, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { businesses } from '../../db/schema/business';
import { batches } from '../../db/schema/batches';
import { recipeVersions } from '../../db/schema/recipes';
import { holdingActions, holdingPeriods, holdingStops } from '../../db/schema/holding';
import { recordEvents } from '../../db/schema/record-events';
import { inspectorLinks, inspectorViews, type InspectorLinkRow } from '../../db/schema/inspector';
import type { Actor } from '../../lib/actor';
import { conflict, notFound } from '../../lib/http-error';
import { sha256Hex } from '../../lib/tokens';
import type { ActorResolver } from '../../middleware/actor';
import { appendRecordEvent } from '../records/record-events.service';
import { queueMail } from '../mail/mail.service';
import { listDocuments } from '../documents/documents.service';
import { listCleaningRunsForRange } from '../cleaning/cleaning.service';
import {
  CreateInspectorLinkInputSchema,
  type CreateInspectorLinkInput,
  type CreatedInspectorLink,
  type InspectorLink,
  type InspectorRecords,
  type InspectorSession,
} from '../../../shared/contracts/inspector';

const DAY_MS = 86_400_000;

/** 32 bytes from the CSPRNG (256 bits; A5-7.2.3 asks for at least 128), URL-safe base64. */
export function newInspectorToken(): string {
  return randomBytes(32).toString('base64url');
}
export const INSPECTOR_TOKEN_PATTERN = /^[A-Za-z0-9_-]{43}$/;

export function linkStatus(row: Pick<InspectorLinkRow, 'revokedAt' | 'expiresAt'>, now: Date): InspectorLink['status'] {
  if (row.revokedAt) return 'revoked';
  return row.expiresAt <= now ? 'expired' : 'active';
}

export const inspectorUrl = (publicBaseUrl: string, token: string) => `${publicBaseUrl.replace(/\/$/, '')}/inspect/${token}`;

/** A keyed hash of the visitor's address (the session secret is the key), so the address itself is never kept. */
export const visitorHash = (secret: string, ip: string) => createHmac('sha256', secret).update(ip).digest('hex').slice(0, 16);

async function viewsByLink(db: DbOrTx, linkIds: string[]) {
  const map = new Map<string, InspectorLink['views']>();
  if (!linkIds.length) return map;
  const rows = await db.select().from(inspectorViews).where(inArray(inspectorViews.linkId, linkIds)).orderBy(desc(inspectorViews.at));
  for (const r of rows) map.set(r.linkId, [...(map.get(r.linkId) ?? []), { path: r.path, at: r.at.toISOString(), visitor: r.ipHash.slice(0, 8) }]);
  return map;
}

function toLink(r: InspectorLinkRow, views: InspectorLink['views'], now: Date): InspectorLink {
  return {
    id: r.id, inspectorName: r.inspectorName, inspectorEmail: r.inspectorEmail, rangeFrom: r.rangeFrom, rangeTo: r.rangeTo,
    expiresAt: r.expiresAt.toISOString(), revokedAt: r.revokedAt?.toISOString() ?? null, createdAt: r.createdAt.toISOString(),
    status: linkStatus(r, now), views,
  };
}

/**
 * Issues a read-only link for a date range. The token is returned (and e-mailed when an address is
 * given) but only its SHA-256 is stored.
 */
export async function createInspectorLink(db: Db, actor: Actor, raw: CreateInspectorLinkInput, publicBaseUrl: string, now: Date): Promise<CreatedInspectorLink> {
  const input = CreateInspectorLinkInputSchema.parse(raw);
  const token = newInspectorToken();
  const url = inspectorUrl(publicBaseUrl, token);
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(inspectorLinks).values({
      businessId: actor.businessId, tokenHash: sha256Hex(token), inspectorName: input.inspectorName, inspectorEmail: input.inspectorEmail ?? null,
      rangeFrom: input.rangeFrom, rangeTo: input.rangeTo, expiresAt: new Date(now.getTime() + input.validDays * DAY_MS), createdByUserId: actor.userId, createdAt: now, updatedAt: now,
    }).returning();
    await appendRecordEvent(tx, actor, { entityType: 'inspector_link', entityId: row!.id, action: 'create', payload: { inspectorName: input.inspectorName, emailed: Boolean(input.inspectorEmail), rangeFrom: input.rangeFrom, rangeTo: input.rangeTo, expiresAt: row!.expiresAt.toISOString() } }, now);
    if (input.inspectorEmail) {
      const [business] = await tx.select({ name: businesses.name }).from(businesses).where(eq(businesses.id, actor.businessId));
      const expires = row!.expiresAt.toLocaleString('en-US', { dateStyle: 'long', timeStyle: 'short', timeZone: 'UTC' });
      const text = [
        `Hello ${input.inspectorName},`,
        '',
        `${actor.name} of ${business!.name} has shared their food-safety records with you for ${input.rangeFrom} to ${input.rangeTo}.`,
        '',
        'Open them here (read-only, no account needed):',
        url,
        '',
        `The link works until ${expires} UTC. Please keep it to yourself: anyone with the link can read these records until then.`,
      ].join('\n');
      await queueMail(tx, { businessId: actor.businessId, to: input.inspectorEmail, subject: `${business!.name}: food-safety records for your review`, text, kind: 'inspector_link', dedupeKey: `inspector-link:${row!.id}` }, now);
    }
    return { link: toLink(row!, [], now), url, emailed: Boolean(input.inspectorEmail) };
  });
}

export async function listInspectorLinks(db: Db, actor: Actor, now: Date): Promise<InspectorLink[]> {
  const rows = await db.select().from(inspectorLinks).where(eq(inspectorLinks.businessId, actor.businessId)).orderBy(desc(inspectorLinks.createdAt));
  const views = await viewsByLink(db, rows.map((r) => r.id));
  return rows.map((r) => toLink(r, views.get(r.id) ?? [], now));
}

export async function revokeInspectorLink(db: Db, actor: Actor, linkId: string, now: Date): Promise<void> {
  await db.transaction(async (tx) => {
    const [row] = await tx.select().from(inspectorLinks).where(and(eq(inspectorLinks.id, linkId), eq(inspectorLinks.businessId, actor.businessId))).for('update');
    if (!row) throw notFound('That inspector link');
    if (row.revokedAt) throw conflict('That link is already revoked.');
    await tx.update(inspectorLinks).set({ revokedAt: now, updatedAt: now }).where(eq(inspectorLinks.id, row.id));
    await appendRecordEvent(tx, actor, { entityType: 'inspector_link', entityId: row.id, action: 'revoke', payload: { inspectorName: row.inspectorName } }, now);
  });
}

/** The link a token opens, or why it cannot: unknown, expired or revoked. */
export async function linkForToken(db: Db, token: string, now: Date): Promise<{ link: InspectorLinkRow | null; status: InspectorLink['status'] | 'unknown' }> {
  if (!INSPECTOR_TOKEN_PATTERN.test(token)) return { link: null, status: 'unknown' };
  const [link] = await db.select().from(inspectorLinks).where(eq(inspectorLinks.tokenHash, sha256Hex(token)));
  if (!link) return { link: null, status: 'unknown' };
  return { link, status: linkStatus(link, now) };
}

export async function logInspectorView(db: DbOrTx, link: { id: string; businessId: string }, path: string, ipHash: string, now: Date): Promise<void> {
  await db.insert(inspectorViews).values({ businessId: link.businessId, linkId: link.id, path: path.slice(0, 300), ipHash, at: now });
}

/** Inspector sessions hold only the link id: each request re-checks expiry and revocation. */
export const inspectorActorResolver: ActorResolver = async (db, session, now) => {
  if (!session.inspectorLinkId || !session.businessId) return undefined;
  const [link] = await db.select().from(inspectorLinks).where(and(eq(inspectorLinks.id, session.inspectorLinkId), eq(inspectorLinks.businessId, session.businessId)));
  if (!link || linkStatus(link, now) !== 'active') return undefined;
  return { kind: 'inspector', businessId: link.businessId, userId: null, name: `Inspector: ${link.inspectorName}`, role: 'inspector' };
};

async function sessionLink(db: Db, actor: Actor, linkId: string) {
  const [link] = await db.select().from(inspectorLinks).where(and(eq(inspectorLinks.id, linkId), eq(inspectorLinks.businessId, actor.businessId)));
  if (!link) throw notFound('That inspector link');
  return link;
}

export async function inspectorSession(db: Db, actor: Actor, linkId: string, packetAvailable: boolean): Promise<InspectorSession> {
  const link = await sessionLink(db, actor, linkId);
  const [b] = await db.select().from(businesses).where(eq(businesses.id, actor.businessId));
  return {
    businessName: b!.name,
    businessAddress: [b!.addressLine, b!.city, b!.region, b!.postalCode].filter(Boolean).join(', '),
    registrationNumber: b!.registrationNumber,
    inspectorName: link.inspectorName,
    rangeFrom: link.rangeFrom,
    rangeTo: link.rangeTo,
    expiresAt: link.expiresAt.toISOString(),
    timeZone: b!.timeZone,
    packetAvailable,
  };
}

// Record types that are not food-safety evidence or could carry customer or staff contact details.
const HIDDEN_EVENT_TYPES = ['sale', 'sales_entry', 'customer', 'order', 'recall', 'recall_notice', 'recall_contact', 'invite', 'member', 'device', 'account', 'session', 'inspector_link', 'calendar_feed'];

/** Read-only queries over the link's date range (business-local dates); nothing about customers. */
export async function inspectorRecords(db: Db, actor: Actor, linkId: string, now: Date): Promise<InspectorRecords> {
  const link = await sessionLink(db, actor, linkId);
  const [b] = await db.select({ timeZone: businesses.timeZone }).from(businesses).where(eq(businesses.id, actor.businessId));
  const tz = b!.timeZone;
  const localDay = (col: typeof holdingPeriods.startedAt | typeof recordEvents.occurredAt) => sql`(${col} at time zone ${tz})::date`;
  const [batchRows, holdingRows, eventRows, docs, runs] = await Promise.all([
    db.select({ id: batches.id, lotCode: batches.lotCode, productName: recipeVersions.name, madeOn: batches.madeOn, state: batches.state })
      .from(batches).innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
      .where(and(eq(batches.businessId, actor.businessId), gte(batches.madeOn, link.rangeFrom), lte(batches.madeOn, link.rangeTo)))
      .orderBy(asc(batches.madeOn), asc(batches.lotCode)),
    db.select({ id: holdingPeriods.id, lotCode: batches.lotCode, kind: holdingPeriods.kind, policy: holdingPeriods.policy, startedAt: holdingPeriods.startedAt, startedByName: holdingPeriods.startedByName, limitMinutes: holdingPeriods.limitMinutes, stoppedAt: holdingStops.stoppedAt })
      .from(holdingPeriods).innerJoin(batches, eq(batches.id, holdingPeriods.batchId))
      .leftJoin(holdingStops, eq(holdingStops.periodId, holdingPeriods.id))
      .where(and(eq(holdingPeriods.businessId, actor.businessId), sql`${localDay(holdingPeriods.startedAt)} between ${link.rangeFrom}::date and ${link.rangeTo}::date`))
      .orderBy(asc(holdingPeriods.startedAt)),
    db.select({ seq: recordEvents.seq, occurredAt: recordEvents.occurredAt, entityType: recordEvents.entityType, action: recordEvents.action, actorName: recordEvents.actorName })
      .from(recordEvents)
      .where(and(eq(recordEvents.businessId, actor.businessId), notInArray(recordEvents.entityType, HIDDEN_EVENT_TYPES), sql`${localDay(recordEvents.occurredAt)} between ${link.rangeFrom}::date and ${link.rangeTo}::date`))
      .orderBy(asc(recordEvents.seq))
      .limit(2000),
    listDocuments(db, actor, now),
    listCleaningRunsForRange(db, actor.businessId, { from: link.rangeFrom, to: link.rangeTo }),
  ]);
  const actionRows = holdingRows.length
    ? await db.select().from(holdingActions).where(and(eq(holdingActions.businessId, actor.businessId), inArray(holdingActions.periodId, holdingRows.map((h) => h.id)))).orderBy(asc(holdingActions.recordedAt))
    : [];
  return {
    batches: batchRows,
    holdingPeriods: holdingRows.map((h) => ({
      ...h, startedAt: h.startedAt.toISOString(), stoppedAt: h.stoppedAt?.toISOString() ?? null,
      actions: actionRows.filter((a) => a.periodId === h.id).map((a) => ({ action: a.action, reason: a.reason, recordedAt: a.recordedAt.toISOString(), recordedByName: a.recordedByName })),
    })),
    cleaningRuns: runs.map((r) => {
      const sig = r.versions[0]?.signature ?? null;
      return {
        id: r.id, templateName: r.templateName, runDate: r.runDate, batchLotCode: r.batchLotCode, status: r.status,
        signature: sig ? { printedName: sig.printedName, meaning: sig.meaning, signedAtLocal: sig.signedAtLocal, validityText: sig.validityText } : null,
      };
    }),
    documents: docs.documents.map((d) => ({ documentId: d.id, versionId: d.current.id, kind: d.kind, title: d.current.title, issuedOn: d.current.issuedOn, expiresOn: d.current.expiresOn })),
    recordEvents: eventRows.map((e) => ({ ...e, occurredAt: e.occurredAt.toISOString() })),
  };
}
