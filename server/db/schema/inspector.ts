import { pgTable, text, uuid, timestamp, date, index, uniqueIndex } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';

// A read-only link for an inspector, limited to a date range and an expiry. Only the SHA-256 of the
// token is stored; the token itself exists in the owner's answer and the e-mail.
export const inspectorLinks = pgTable(
  'inspector_links',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    tokenHash: text().notNull(),
    inspectorName: text().notNull(),
    inspectorEmail: text(),
    rangeFrom: date({ mode: 'string' }).notNull(),
    rangeTo: date({ mode: 'string' }).notNull(),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    revokedAt: timestamp({ withTimezone: true }),
    createdByUserId: uuid().references(() => users.id),
    ...timestamps,
  },
  (t) => [uniqueIndex('inspector_links_token_hash_key').on(t.tokenHash), index('inspector_links_business_id_idx').on(t.businessId)],
);
export type InspectorLinkRow = typeof inspectorLinks.$inferSelect;

// Append-only: every page or file an inspector opened through a link.
export const inspectorViews = pgTable(
  'inspector_views',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    linkId: uuid().notNull().references(() => inspectorLinks.id),
    path: text().notNull(),
    /** Keyed hash of the address: repeat visits can be told apart without keeping the address. */
    ipHash: text().notNull(),
    at: timestamp({ withTimezone: true }).notNull(),
  },
  (t) => [index('inspector_views_link_id_at_idx').on(t.linkId, t.at)],
);
