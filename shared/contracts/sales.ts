import { z } from 'zod';
import { SALES_CHANNELS } from './rule-profiles';
import { isCalendarDate } from '../domain/calendar-date';

const UuidSchema = z.string().uuid('That id is not valid');
const CalendarDateSchema = z.string().refine(isCalendarDate, 'Enter a date as YYYY-MM-DD');

export const SaleChannelSchema = z.enum(SALES_CHANNELS);
export const SaleUnitSchema = z.enum(['pieces', 'packages']);

/** Name, e-mail or phone, and the recall-notice consent; at least one way to reach them. */
export const CustomerContactInputSchema = z
  .object({
    name: z.string().trim().min(1, 'Enter a name').max(200, 'Keep the name under 200 characters'),
    email: z.string().trim().max(254).email('Enter an e-mail address like name@example.com').or(z.literal('')).optional(),
    phone: z.string().trim().max(40, 'Keep the phone number under 40 characters').regex(/^[0-9+()\-.\s]*$/, 'Use digits, spaces and + ( ) - only').optional(),
    recallConsent: z.boolean().default(false),
  })
  .strict()
  .refine((c) => Boolean(c.email) || Boolean(c.phone), { message: 'Enter an e-mail address or a phone number', path: ['email'] });
export type CustomerContactInput = z.infer<typeof CustomerContactInputSchema>;

export const UpdateCustomerInputSchema = z.object({ recallConsent: z.boolean() }).strict();
export type UpdateCustomerInput = z.infer<typeof UpdateCustomerInputSchema>;

/** POST /api/sales. Amount in integer cents (money is never a float). */
export const CreateSaleInputSchema = z
  .object({
    batchId: UuidSchema,
    soldOn: CalendarDateSchema.optional(),
    quantity: z.number().int('Enter a whole number').min(1, 'Enter at least 1').max(100_000, 'That number is too large'),
    unit: SaleUnitSchema,
    amountCents: z.number().int('Enter the amount in whole cents').min(0, 'Cannot be negative').max(100_000_000, 'That amount is too large'),
    channel: SaleChannelSchema,
    customerId: UuidSchema.optional(),
    newCustomer: CustomerContactInputSchema.optional(),
  })
  .strict()
  .refine((s) => !(s.customerId && s.newCustomer), { message: 'Choose a saved customer or enter a new one, not both', path: ['customerId'] });
export type CreateSaleInput = z.infer<typeof CreateSaleInputSchema>;

export const VoidSaleInputSchema = z.object({ reason: z.string().trim().min(3, 'Enter a reason (at least 3 characters)').max(1000) }).strict();
export type VoidSaleInput = z.infer<typeof VoidSaleInputSchema>;

export const ListSalesQuerySchema = z.object({
  from: CalendarDateSchema.optional(),
  to: CalendarDateSchema.optional(),
  channel: SaleChannelSchema.optional(),
  batchId: UuidSchema.optional(),
  limit: z.coerce.number().int().min(1).max(500).default(200),
});
export type ListSalesQuery = z.infer<typeof ListSalesQuerySchema>;

/** Contact fields: present only in the owner's responses. */
export const CustomerContactSchema = z.object({
  name: z.string(),
  email: z.string().nullable(),
  phone: z.string().nullable(),
  recallConsent: z.boolean(),
  consentOn: z.string().nullable(),
});
export type CustomerContact = z.infer<typeof CustomerContactSchema>;

export const CustomerSchema = z.object({
  id: z.string(),
  erased: z.boolean(),
  /** Null once erased. */
  contact: CustomerContactSchema.nullable(),
  saleCount: z.number().int(),
  createdAt: z.string(),
});
export type Customer = z.infer<typeof CustomerSchema>;

export const SaleSchema = z.object({
  id: z.string(),
  batchId: z.string(),
  lotCode: z.string(),
  productName: z.string(),
  soldOn: z.string(),
  quantity: z.number().int(),
  unit: SaleUnitSchema,
  amountCents: z.number().int(),
  channel: SaleChannelSchema,
  /** True when a customer is attached (all roles see this). */
  hasCustomer: z.boolean(),
  /** Owner only: the customer and their contact (null contact once erased). */
  customer: z.object({ id: z.string(), erased: z.boolean(), name: z.string().nullable() }).optional(),
  voided: z.object({ reason: z.string(), byName: z.string(), at: z.string() }).nullable(),
  recordedByName: z.string(),
  recordedAt: z.string(),
});
export type Sale = z.infer<typeof SaleSchema>;

/** The year's total against the rule profile's cap, with its source. `cap` is null when the profile has none. */
export const SalesCapViewSchema = z.object({
  profileName: z.string(),
  cap: z
    .object({
      periodYear: z.number().int(),
      periodStartDate: z.string(),
      periodEndDate: z.string(),
      totalCents: z.number().int(),
      capCents: z.number().int(),
      remainingCents: z.number().int(),
      permille: z.number().int(),
      level: z.enum(['ok', 'warn_75', 'warn_90', 'over']),
      /** The year the cap figure is stated for (e.g. a base year before inflation adjustment), if any. */
      figureYear: z.number().int().nullable(),
      source: z.object({ citation: z.string(), url: z.string().optional(), note: z.string().optional(), verified: z.boolean() }),
      message: z.string(),
    })
    .nullable(),
  noCapReason: z.string().nullable(),
  allowedChannels: z.array(SaleChannelSchema),
  channelSource: z.string(),
});
export type SalesCapView = z.infer<typeof SalesCapViewSchema>;

export const SalesPageSchema = z.object({ items: z.array(SaleSchema), totalCents: z.number().int() });
export type SalesPage = z.infer<typeof SalesPageSchema>;

/** Every channel, for filters (recording a sale offers only the profile's). */
export const SALE_CHANNELS_FOR_FILTER = SaleChannelSchema.options;
