import { pgTable, text, uuid, timestamp, index, uniqueIndex } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { roleEnum, users } from './auth';

// Invites to join a business. Only the SHA-256 of the code is kept; the code itself is shown once.
export const invites = pgTable(
  'invites',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    email: text().notNull(),
    displayName: text(),
    role: roleEnum().notNull(),
    codeHash: text().notNull(),
    invitedByUserId: uuid().notNull().references(() => users.id),
    expiresAt: timestamp({ withTimezone: true }).notNull(),
    acceptedAt: timestamp({ withTimezone: true }),
    acceptedByUserId: uuid().references(() => users.id),
    revokedAt: timestamp({ withTimezone: true }),
    ...timestamps,
  },
  (t) => [uniqueIndex('invites_code_hash_key').on(t.codeHash), index('invites_business_id_idx').on(t.businessId)],
);
export type InviteRow = typeof invites.$inferSelect;
