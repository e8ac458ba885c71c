import { pgTable, text, uuid, bigint, jsonb, timestamp, uniqueIndex, index } from 'drizzle-orm/pg-core';
import { businesses } from './business';
import { users } from './auth';

// The append-only, hash-chained journal every record change writes in the same transaction.
// The runtime role may only INSERT and SELECT here; triggers refuse UPDATE, DELETE and TRUNCATE.
export const recordEvents = pgTable(
  'record_events',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    seq: bigint({ mode: 'number' }).notNull(),
    actorUserId: uuid().references(() => users.id),
    actorName: text().notNull(),
    actorRole: text().notNull(),
    entityType: text().notNull(),
    entityId: text().notNull(),
    action: text().notNull(),
    payload: jsonb().$type<unknown>().notNull(),
    reason: text(),
    occurredAt: timestamp({ withTimezone: true }).notNull(),
    recordedAt: timestamp({ withTimezone: true }).notNull(),
    requestId: text(),
    idempotencyKey: text(),
    prevHash: text().notNull(),
    hash: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('record_events_business_id_seq_key').on(t.businessId, t.seq),
    uniqueIndex('record_events_business_id_idempotency_key_key').on(t.businessId, t.idempotencyKey),
    index('record_events_business_id_entity_idx').on(t.businessId, t.entityType, t.entityId),
  ],
);
export type RecordEventRow = typeof recordEvents.$inferSelect;
