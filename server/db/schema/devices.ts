import { pgTable, text, uuid, timestamp, index, uniqueIndex } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';

// Kitchen display tablets enrolled by an owner. The enrolment code is kept only as its SHA-256.
export const devices = pgTable(
  'devices',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    name: text().notNull(),
    enrolmentCodeHash: text().notNull(),
    enrolmentExpiresAt: timestamp({ withTimezone: true }).notNull(),
    enrolledAt: timestamp({ withTimezone: true }),
    sessionExpiresAt: timestamp({ withTimezone: true }),
    lastSeenAt: timestamp({ withTimezone: true }),
    revokedAt: timestamp({ withTimezone: true }),
    createdByUserId: uuid().notNull().references(() => users.id),
    ...timestamps,
  },
  (t) => [uniqueIndex('devices_enrolment_code_hash_key').on(t.enrolmentCodeHash), index('devices_business_id_idx').on(t.businessId)],
);
export type DeviceRow = typeof devices.$inferSelect;
