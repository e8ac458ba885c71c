import { pgTable, text, uuid, boolean, timestamp, index, uniqueIndex, json, varchar, pgEnum } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';

export const roleEnum = pgEnum('member_role', ['owner', 'baker', 'helper']);

export const users = pgTable(
  'users',
  {
    id: uuid().primaryKey().defaultRandom(),
    email: text().notNull(),
    displayName: text().notNull(),
    passwordHash: text().notNull(),
    passwordChangedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    ...timestamps,
  },
  (t) => [uniqueIndex('users_email_key').on(t.email)],
);
export type UserRow = typeof users.$inferSelect;

export const memberships = pgTable(
  'memberships',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    userId: uuid().notNull().references(() => users.id),
    role: roleEnum().notNull(),
    isActive: boolean().notNull().default(true),
    ...timestamps,
  },
  (t) => [
    uniqueIndex('memberships_business_id_user_id_key').on(t.businessId, t.userId),
    index('memberships_user_id_idx').on(t.userId),
  ],
);
export type MembershipRow = typeof memberships.$inferSelect;

// express-session store (connect-pg-simple); the shape its queries expect.
export const userSessions = pgTable(
  'user_sessions',
  {
    sid: varchar().primaryKey(),
    sess: json().notNull(),
    expire: timestamp({ precision: 6 }).notNull(),
  },
  (t) => [index('user_sessions_expire_idx').on(t.expire)],
);
