import { pgTable, text, uuid, timestamp, index, uniqueIndex } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';
import { batches } from './batches';
import { supplierLots } from './ingredients';
import { customers } from './customers';
import { mailOutbox } from './mail';

/** A recall the owner opened. `status` mirrors the open/close record events (like batches.state). */
export const recalls = pgTable(
  'recalls',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    reason: text().notNull(),
    /** Shown on the lot pages of the affected batches and in the e-mail notice. */
    publicNotice: text().notNull(),
    scopeKind: text().notNull(),
    supplierLotId: uuid().references(() => supplierLots.id),
    status: text().notNull().default('open'),
    openedByUserId: uuid().references(() => users.id),
    openedByName: text().notNull(),
    openedAt: timestamp({ withTimezone: true }).notNull(),
    closedByName: text(),
    closedAt: timestamp({ withTimezone: true }),
    closeNote: text(),
    ...timestamps,
  },
  (t) => [index('recalls_business_id_opened_at_idx').on(t.businessId, t.openedAt)],
);

/** Append-only: a batch the recall covers, with the state it was in and what the recall did to it. */
export const recallBatches = pgTable(
  'recall_batches',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    recallId: uuid().notNull().references(() => recalls.id),
    batchId: uuid().notNull().references(() => batches.id),
    fromState: text().notNull(),
    toState: text().notNull(),
    ...timestamps,
  },
  (t) => [uniqueIndex('recall_batches_recall_id_batch_id_key').on(t.recallId, t.batchId), index('recall_batches_batch_id_idx').on(t.batchId)],
);

/**
 * Append-only: one step of telling one customer (an e-mail queued, "told by phone"). The latest row per
 * customer is their status. No contact details here, only the customer id.
 */
export const recallNotifications = pgTable(
  'recall_notifications',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    recallId: uuid().notNull().references(() => recalls.id),
    customerId: uuid().notNull().references(() => customers.id),
    method: text().notNull(),
    outboxId: uuid().references(() => mailOutbox.id),
    note: text().notNull().default(''),
    byName: text().notNull(),
    at: timestamp({ withTimezone: true }).notNull(),
    ...timestamps,
  },
  (t) => [index('recall_notifications_recall_id_idx').on(t.recallId)],
);
