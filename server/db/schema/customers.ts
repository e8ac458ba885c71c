import { pgTable, text, uuid, boolean, date, timestamp, index } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';

/**
 * A buyer as the records know them: an id and nothing personal. Sales and recall progress point here,
 * so erasing the contact (below) leaves every record whole but anonymous.
 */
export const customers = pgTable(
  'customers',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    /** Set when the contact was erased on request; the row stays so sales still add up. */
    erasedAt: timestamp({ withTimezone: true }),
    ...timestamps,
  },
  (t) => [index('customers_business_id_idx').on(t.businessId)],
);

/**
 * The personal data, apart from the records: deleted outright on an erasure request. Only the owner
 * reads it. Not append-only on purpose (see docs/decisions on customer contacts).
 */
export const customerContacts = pgTable(
  'customer_contacts',
  {
    customerId: uuid().primaryKey().references(() => customers.id, { onDelete: 'cascade' }),
    businessId: uuid().notNull().references(() => businesses.id),
    name: text().notNull(),
    email: text(),
    phone: text(),
    /** The customer agreed to be told if something they bought is recalled. */
    recallConsent: boolean().notNull().default(false),
    consentOn: date({ mode: 'string' }),
    ...timestamps,
  },
  (t) => [index('customer_contacts_business_id_idx').on(t.businessId)],
);
