import { createHash } from 'node:crypto';
import { and, asc, desc, eq, gte, inArray, isNotNull, lte, sql } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import { users, memberships } from '../../db/schema/auth';
import { businesses } from '../../db/schema/business';
import { documents, documentVersions, type DocumentVersionRow } from '../../db/schema/documents';
import type { Actor } from '../../lib/actor';
import { badRequest, notFound } from '../../lib/http-error';
import type { FileStorage } from '../../lib/storage';
import type { CheckedFile } from '../../lib/uploads';
import { appendRecordEvent } from '../records/record-events.service';
import { queueMail } from '../mail/mail.service';
import { addCalendarDays } from '../../../shared/domain/calendar-date';
import { businessLocalDate } from '../../../shared/domain/zoned-time';
import { daysUntil, EXPIRING_SOON_DAYS, expiryStatus, reminderStageDue } from '../../../shared/domain/document-expiry';
import { DOCUMENT_KIND_LABELS, type CreateDocumentInput, type Document, type DocumentDetail, type DocumentVersion, type NewDocumentVersionInput } from '../../../shared/contracts/documents';

/** Upload rules for documents: PDF, JPEG or PNG by content, at most 10 MB. */
export const DOCUMENT_FILE_KINDS = ['pdf', 'jpg', 'png'] as const;

async function todayFor(db: DbOrTx, businessId: string, now: Date): Promise<{ today: string; timeZone: string; name: string }> {
  const [b] = await db.select({ timeZone: businesses.timeZone, name: businesses.name }).from(businesses).where(eq(businesses.id, businessId));
  if (!b) throw notFound('That business');
  return { today: businessLocalDate(now, b.timeZone), timeZone: b.timeZone, name: b.name };
}

function toVersion(r: DocumentVersionRow, uploadedBy: string | null): DocumentVersion {
  return {
    id: r.id, version: r.version, title: r.title, issuedOn: r.issuedOn, expiresOn: r.expiresOn, displayName: r.displayName,
    contentType: r.contentType, byteSize: r.byteSize, reason: r.reason, uploadedBy, createdAt: r.createdAt.toISOString(),
  };
}

/** Every document of the business with its current version, soonest expiry first. */
export async function listDocuments(db: Db, actor: Pick<Actor, 'businessId'>, now: Date): Promise<{ documents: Document[]; today: string }> {
  const { today } = await todayFor(db, actor.businessId, now);
  const rows = await db
    .select({ doc: documents, v: documentVersions, holderName: users.displayName })
    .from(documents)
    .innerJoin(documentVersions, and(eq(documentVersions.documentId, documents.id), eq(documentVersions.version, documents.currentVersion)))
    .leftJoin(users, eq(users.id, documents.holderUserId))
    .where(eq(documents.businessId, actor.businessId))
    .orderBy(sql`${documentVersions.expiresOn} asc nulls last`, asc(documentVersions.title));
  const uploaders = await uploaderNames(db, rows.map((r) => r.v.uploadedByUserId));
  return {
    today,
    documents: rows.map(({ doc, v, holderName }) => ({
      id: doc.id,
      kind: doc.kind as Document['kind'],
      holder: doc.holderUserId ? { userId: doc.holderUserId, displayName: holderName ?? '' } : null,
      current: toVersion(v, uploaders.get(v.uploadedByUserId ?? '') ?? null),
      versionCount: doc.currentVersion,
      expiryStatus: expiryStatus(v.expiresOn, today),
      daysLeft: v.expiresOn ? daysUntil(v.expiresOn, today) : null,
    })),
  };
}

async function uploaderNames(db: DbOrTx, ids: (string | null)[]) {
  const wanted = [...new Set(ids.filter((x): x is string => Boolean(x)))];
  if (!wanted.length) return new Map<string, string>();
  const rows = await db.select({ id: users.id, name: users.displayName }).from(users).where(inArray(users.id, wanted));
  return new Map(rows.map((r) => [r.id, r.name]));
}

export async function getDocument(db: Db, actor: Pick<Actor, 'businessId'>, documentId: string, now: Date): Promise<DocumentDetail> {
  const { documents: all } = await listDocuments(db, actor, now);
  const doc = all.find((d) => d.id === documentId);
  if (!doc) throw notFound('That document');
  const rows = await db.select().from(documentVersions).where(and(eq(documentVersions.documentId, documentId), eq(documentVersions.businessId, actor.businessId))).orderBy(desc(documentVersions.version));
  const names = await uploaderNames(db, rows.map((r) => r.uploadedByUserId));
  return { ...doc, versions: rows.map((r) => toVersion(r, names.get(r.uploadedByUserId ?? '') ?? null)) };
}

/** Documents whose current version expires within 30 days (or already has), for the board and Records. */
export async function documentsExpiringSoon(db: Db, businessId: string, now: Date): Promise<Document[]> {
  const { documents: all } = await listDocuments(db, { businessId }, now);
  return all.filter((d) => d.expiryStatus === 'expiring_soon' || d.expiryStatus === 'expired');
}

async function assertHolderIsMember(tx: DbOrTx, businessId: string, userId: string | undefined) {
  if (!userId) return;
  const [m] = await tx.select({ id: memberships.id }).from(memberships).where(and(eq(memberships.businessId, businessId), eq(memberships.userId, userId)));
  if (!m) throw badRequest('Choose a member of this team.', { holderUserId: ['Choose a member of this team.'] });
}

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');

/** Stores the file first (a random key), then the rows; a failed transaction removes the file again. */
async function withStoredFile<T>(storage: FileStorage, file: CheckedFile, work: (key: string) => Promise<T>): Promise<T> {
  const key = await storage.put(file.bytes);
  try {
    return await work(key);
  } catch (err) {
    await storage.remove(key).catch(() => undefined);
    throw err;
  }
}

export async function createDocument(db: Db, storage: FileStorage, actor: Actor, input: CreateDocumentInput, file: CheckedFile, now: Date): Promise<DocumentDetail> {
  const documentId = await withStoredFile(storage, file, (key) =>
    db.transaction(async (tx) => {
      await assertHolderIsMember(tx, actor.businessId, input.holderUserId);
      const [doc] = await tx.insert(documents).values({ businessId: actor.businessId, kind: input.kind, holderUserId: input.holderUserId ?? null, createdByUserId: actor.userId, createdAt: now, updatedAt: now }).returning();
      const [v] = await tx.insert(documentVersions).values({
        businessId: actor.businessId, documentId: doc!.id, version: 1, title: input.title, issuedOn: input.issuedOn, expiresOn: input.expiresOn ?? null,
        storageKey: key, contentType: file.contentType, displayName: file.displayName, byteSize: file.bytes.length, sha256: sha256(file.bytes), uploadedByUserId: actor.userId, createdAt: now,
      }).returning();
      await appendRecordEvent(tx, actor, { entityType: 'document', entityId: doc!.id, action: 'create', payload: { kind: input.kind, title: input.title, issuedOn: input.issuedOn, expiresOn: input.expiresOn ?? null, versionId: v!.id, sha256: v!.sha256 } }, now);
      return doc!.id;
    }),
  );
  return getDocument(db, actor, documentId, now);
}

export async function addDocumentVersion(db: Db, storage: FileStorage, actor: Actor, documentId: string, input: NewDocumentVersionInput, file: CheckedFile, now: Date): Promise<DocumentDetail> {
  await withStoredFile(storage, file, (key) =>
    db.transaction(async (tx) => {
      const [doc] = await tx.select().from(documents).where(and(eq(documents.id, documentId), eq(documents.businessId, actor.businessId))).for('update');
      if (!doc) throw notFound('That document');
      const [prev] = await tx.select().from(documentVersions).where(and(eq(documentVersions.documentId, doc.id), eq(documentVersions.version, doc.currentVersion)));
      const version = doc.currentVersion + 1;
      const [v] = await tx.insert(documentVersions).values({
        businessId: actor.businessId, documentId: doc.id, version, title: input.title ?? prev!.title, issuedOn: input.issuedOn, expiresOn: input.expiresOn ?? null,
        storageKey: key, contentType: file.contentType, displayName: file.displayName, byteSize: file.bytes.length, sha256: sha256(file.bytes), reason: input.reason, uploadedByUserId: actor.userId, createdAt: now,
      }).returning();
      await tx.update(documents).set({ currentVersion: version, updatedAt: now }).where(eq(documents.id, doc.id));
      await appendRecordEvent(tx, actor, { entityType: 'document', entityId: doc.id, action: 'new_version', reason: input.reason, payload: { version, replacesVersionId: prev!.id, versionId: v!.id, issuedOn: input.issuedOn, expiresOn: input.expiresOn ?? null, sha256: v!.sha256 } }, now);
    }),
  );
  return getDocument(db, actor, documentId, now);
}

/** One stored file of this business's document (any version), for download. */
export async function documentFile(db: Db, businessId: string, documentId: string, versionId: string) {
  const [v] = await db.select().from(documentVersions).where(and(eq(documentVersions.id, versionId), eq(documentVersions.documentId, documentId), eq(documentVersions.businessId, businessId)));
  if (!v) throw notFound('That file');
  return v;
}

/** Current versions with an expiry date between two dates, every business (the reminder scan, the calendar). */
export async function currentVersionsExpiring(db: DbOrTx, filter: { businessId?: string; from?: string; to?: string }) {
  return db
    .select({ v: documentVersions, kind: documents.kind })
    .from(documents)
    .innerJoin(documentVersions, and(eq(documentVersions.documentId, documents.id), eq(documentVersions.version, documents.currentVersion)))
    .where(and(
      isNotNull(documentVersions.expiresOn),
      filter.businessId ? eq(documents.businessId, filter.businessId) : undefined,
      filter.from ? gte(documentVersions.expiresOn, filter.from) : undefined,
      filter.to ? lte(documentVersions.expiresOn, filter.to) : undefined,
    ))
    .orderBy(asc(documentVersions.expiresOn));
}

const dayWord = (n: number) => (n === 0 ? 'today' : n === 1 ? 'tomorrow' : `in ${n} days`);

/**
 * Queues the expiry reminders due now: for each current version, the most urgent of the 30/7/1-day
 * stages it has reached, once ever (the dedupe key `doc-expiry:<versionId>:<stage>` is unique in the
 * outbox), so restarts and several processes running the scan at once send each reminder once.
 */
export async function runReminderScan(deps: { db: Db; now: () => Date; publicBaseUrl: string; businessId?: string }): Promise<{ queued: number }> {
  const now = deps.now();
  // A one-day margin either side covers every time zone; the exact day count uses the business zone.
  const utcToday = now.toISOString().slice(0, 10);
  const rows = await currentVersionsExpiring(deps.db, { businessId: deps.businessId, from: addCalendarDays(utcToday, -1), to: addCalendarDays(utcToday, EXPIRING_SOON_DAYS + 1) });
  let queued = 0;
  for (const { v, kind } of rows) {
    const { today, name } = await todayFor(deps.db, v.businessId, now);
    const left = daysUntil(v.expiresOn!, today);
    const stage = reminderStageDue(left);
    if (!stage) continue;
    const owners = await deps.db
      .select({ email: users.email })
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.businessId, v.businessId), eq(memberships.role, 'owner'), eq(memberships.isActive, true)));
    if (!owners.length) continue;
    const kindLabel = DOCUMENT_KIND_LABELS[kind as keyof typeof DOCUMENT_KIND_LABELS] ?? 'Document';
    const text = [
      'Hello,',
      '',
      `A document for ${name} expires ${dayWord(left)}, on ${v.expiresOn}:`,
      '',
      `    ${v.title} (${kindLabel.toLowerCase()})`,
      '',
      `When you have the renewed copy, upload it on the Records page: ${deps.publicBaseUrl.replace(/\/$/, '')}/records`,
      'Your local health authority decides what must be current to keep selling; check with them if you are unsure.',
    ].join('\n');
    const result = await queueMail(deps.db, {
      businessId: v.businessId,
      to: owners.map((o) => o.email).join(', '),
      subject: `${name}: "${v.title}" expires ${dayWord(left)}`,
      text,
      kind: 'document_expiry',
      dedupeKey: `doc-expiry:${v.id}:${stage}`,
    }, now);
    if (result.queued) queued += 1;
  }
  return { queued };
}
