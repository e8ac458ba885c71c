import { pgTable, text, uuid, timestamp, integer, date, index, uniqueIndex } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';

// A permit, certificate, report or policy the business keeps. Its files are versions (append-only):
// renewing a certificate adds a version, the old one stays as evidence.
export const documents = pgTable(
  'documents',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    kind: text().notNull(),
    /** Whose certificate it is (food handler / food manager), when it belongs to a team member. */
    holderUserId: uuid().references(() => users.id),
    /** Mirrors the highest document_versions.version (written in the same transaction). */
    currentVersion: integer().notNull().default(1),
    createdByUserId: uuid().references(() => users.id),
    ...timestamps,
  },
  (t) => [index('documents_business_id_idx').on(t.businessId)],
);

export const documentVersions = pgTable(
  'document_versions',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    documentId: uuid().notNull().references(() => documents.id),
    version: integer().notNull(),
    title: text().notNull(),
    issuedOn: date({ mode: 'string' }).notNull(),
    expiresOn: date({ mode: 'string' }),
    storageKey: text().notNull(),
    contentType: text().notNull(),
    displayName: text().notNull(),
    byteSize: integer().notNull(),
    sha256: text().notNull(),
    reason: text(),
    uploadedByUserId: uuid().references(() => users.id),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('document_versions_document_id_version_key').on(t.documentId, t.version),
    index('document_versions_business_id_expires_on_idx').on(t.businessId, t.expiresOn),
  ],
);
export type DocumentVersionRow = typeof documentVersions.$inferSelect;

// A revocable subscription link to the expiry calendar; only the token's SHA-256 is kept.
export const calendarFeeds = pgTable(
  'calendar_feeds',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    name: text().notNull(),
    tokenHash: text().notNull(),
    createdByUserId: uuid().references(() => users.id),
    lastFetchedAt: timestamp({ withTimezone: true }),
    revokedAt: timestamp({ withTimezone: true }),
    ...timestamps,
  },
  (t) => [uniqueIndex('calendar_feeds_token_hash_key').on(t.tokenHash), index('calendar_feeds_business_id_idx').on(t.businessId)],
);
