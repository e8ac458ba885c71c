import { pgTable, text, uuid, boolean, jsonb } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';

export const businesses = pgTable('businesses', {
  id: uuid().primaryKey().defaultRandom(),
  name: text().notNull(),
  // Public contact shown on labels and the lot page.
  addressLine: text().notNull().default(''),
  city: text().notNull().default(''),
  region: text().notNull().default(''),
  postalCode: text().notNull().default(''),
  country: text().notNull().default('US'),
  phone: text().notNull().default(''),
  email: text().notNull().default(''),
  registrationNumber: text().notNull().default(''),
  registrationAuthority: text().notNull().default(''),
  timeZone: text().notNull().default('America/Chicago'),
  // Rule profile id (a shipped profile such as "us-tx-2025-09" or a custom one's uuid).
  ruleProfileId: text().notNull().default('us-federal-2025-01'),
  lotCodeScheme: text().notNull().default('{PREFIX}-{YY}{DDD}-{SEQ}'),
  lotCodePrefix: text().notNull().default('CT'),
  isDemo: boolean().notNull().default(false),
  settings: jsonb().$type<Record<string, unknown>>().notNull().default({}),
  ...timestamps,
});
export type BusinessRow = typeof businesses.$inferSelect;
