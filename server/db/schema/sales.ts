import { pgTable, text, uuid, integer, date, timestamp, index, uniqueIndex, type AnyPgColumn } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';
import { batches } from './batches';
import { customers } from './customers';

/**
 * Append-only: one sale of a batch, or a void of an earlier sale (kind 'void', negative amount,
 * pointing at the sale it cancels, with a reason). Money is integer cents.
 */
export const sales = pgTable(
  'sales',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    batchId: uuid().notNull().references(() => batches.id),
    kind: text().notNull().default('sale'),
    voidsSaleId: uuid().references((): AnyPgColumn => sales.id),
    /** Calendar date in the business's time zone. */
    soldOn: date({ mode: 'string' }).notNull(),
    quantity: integer().notNull(),
    unit: text().notNull(),
    amountCents: integer().notNull(),
    channel: text().notNull(),
    customerId: uuid().references(() => customers.id),
    reason: text(),
    recordedByUserId: uuid().references(() => users.id),
    recordedByName: text().notNull(),
    recordedAt: timestamp({ withTimezone: true }).notNull(),
    ...timestamps,
  },
  (t) => [
    index('sales_business_id_sold_on_idx').on(t.businessId, t.soldOn),
    index('sales_batch_id_idx').on(t.batchId),
    index('sales_customer_id_idx').on(t.customerId),
    uniqueIndex('sales_voids_sale_id_key').on(t.voidsSaleId),
  ],
);
export type SaleRow = typeof sales.$inferSelect;
