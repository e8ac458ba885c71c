import { z } from 'zod';
import { BATCH_STATES } from '../domain/batch-states';
import { CustomerContactSchema } from './sales';

const UuidSchema = z.string().uuid('That id is not valid');

/** GET /api/trace: exactly one starting point. */
export const TraceQuerySchema = z
  .object({ supplierLotId: UuidSchema.optional(), ingredientId: UuidSchema.optional(), batchId: UuidSchema.optional() })
  .refine((q) => [q.supplierLotId, q.ingredientId, q.batchId].filter(Boolean).length === 1, { message: 'Choose one supplier lot, ingredient or batch to trace from', path: ['supplierLotId'] });
export type TraceQuery = z.infer<typeof TraceQuerySchema>;

export const TraceBatchSchema = z.object({
  id: z.string(),
  lotCode: z.string(),
  publicCode: z.string(),
  productName: z.string(),
  madeOn: z.string(),
  state: z.enum(BATCH_STATES),
  /** Batches in this trace this one was made from (an in-between batch such as a frosting); empty = straight from the start. */
  madeFromBatchIds: z.array(z.string()),
  /** True when the ingredient went in with no supplier lot noted (forward from an ingredient). */
  lotNotRecorded: z.boolean(),
  sales: z.object({ count: z.number().int(), amountCents: z.number().int(), customerCount: z.number().int() }),
});
export type TraceBatch = z.infer<typeof TraceBatchSchema>;

export const TraceCustomerSchema = z.object({
  customerId: z.string(),
  erased: z.boolean(),
  /** Owner only; absent for everyone else. */
  contact: CustomerContactSchema.nullable().optional(),
  batchIds: z.array(z.string()),
});

export const TraceSupplierLotSchema = z.object({ id: z.string(), lotCode: z.string(), ingredientId: z.string(), ingredientName: z.string(), receivedOn: z.string() });

export const TraceResultSchema = z.object({
  direction: z.enum(['forward', 'backward']),
  start: z.object({ kind: z.enum(['supplier_lot', 'ingredient', 'batch']), id: z.string(), label: z.string() }),
  batches: z.array(TraceBatchSchema),
  /** Backward: every supplier lot that went in, directly or through in-between batches. */
  supplierLots: z.array(TraceSupplierLotSchema),
  /** Backward: ingredients used with no lot noted somewhere upstream. */
  unrecordedIngredients: z.array(z.object({ ingredientId: z.string(), ingredientName: z.string(), batchId: z.string() })),
  /** Forward: customers who bought an affected batch; contacts for the owner only. */
  customers: z.array(TraceCustomerSchema),
  consentingCustomerCount: z.number().int(),
  generatedAt: z.string(),
});
export type TraceResult = z.infer<typeof TraceResultSchema>;

/** Pickers for the trace screen. */
export const TraceOptionsSchema = z.object({
  supplierLots: z.array(TraceSupplierLotSchema),
  ingredients: z.array(z.object({ id: z.string(), name: z.string() })),
  batches: z.array(z.object({ id: z.string(), lotCode: z.string(), productName: z.string(), madeOn: z.string(), state: z.enum(BATCH_STATES) })),
});
export type TraceOptions = z.infer<typeof TraceOptionsSchema>;

const RecallTextSchema = (what: string, max: number) => z.string().trim().min(10, `Enter the ${what} (at least 10 characters)`).max(max, `Keep the ${what} under ${max} characters`);

/** POST /api/recalls: the owner confirms after reviewing what the trace found. */
export const OpenRecallInputSchema = z
  .object({
    reason: RecallTextSchema('reason', 1000),
    publicNotice: RecallTextSchema('public notice', 2000),
    scope: z.discriminatedUnion('kind', [
      z.object({ kind: z.literal('supplier_lot'), supplierLotId: UuidSchema }),
      z.object({ kind: z.literal('batches'), batchIds: z.array(UuidSchema).min(1, 'Choose at least one batch').max(500) }),
    ]),
    /** The confirmation step (the owner has reviewed the affected batches and customers). */
    confirmed: z.literal(true, { message: 'Confirm that you have reviewed the affected batches' }),
  })
  .strict();
export type OpenRecallInput = z.infer<typeof OpenRecallInputSchema>;

export const CloseRecallInputSchema = z.object({ note: z.string().trim().min(3, 'Say how the recall ended (at least 3 characters)').max(1000) }).strict();
export type CloseRecallInput = z.infer<typeof CloseRecallInputSchema>;

export const PhoneNoticeInputSchema = z.object({ note: z.string().trim().max(500).default('') }).strict();
export type PhoneNoticeInput = z.infer<typeof PhoneNoticeInputSchema>;

export const RecallCustomerParamsSchema = z.object({ id: UuidSchema, customerId: UuidSchema });

export const RECALL_CUSTOMER_STATUSES = ['email_queued', 'email_sent', 'email_failed', 'told_by_phone', 'to_call', 'no_consent', 'erased'] as const;

export const RecallCustomerProgressSchema = z.object({
  customerId: z.string(),
  status: z.enum(RECALL_CUSTOMER_STATUSES),
  /** When they were last told (e-mail sent or phone call), if they were. */
  toldAt: z.string().nullable(),
  toldByName: z.string().nullable(),
  note: z.string(),
  batchIds: z.array(z.string()),
  /** Owner only. */
  contact: CustomerContactSchema.nullable().optional(),
});
export type RecallCustomerProgress = z.infer<typeof RecallCustomerProgressSchema>;

export const RecallSummarySchema = z.object({
  id: z.string(),
  status: z.enum(['open', 'closed']),
  reason: z.string(),
  publicNotice: z.string(),
  scopeKind: z.enum(['supplier_lot', 'batches']),
  supplierLot: z.object({ id: z.string(), lotCode: z.string(), ingredientName: z.string() }).nullable(),
  openedByName: z.string(),
  openedAt: z.string(),
  closedAt: z.string().nullable(),
  closedByName: z.string().nullable(),
  closeNote: z.string().nullable(),
  batches: z.array(z.object({ id: z.string(), lotCode: z.string(), productName: z.string(), fromState: z.string(), toState: z.string(), publicCode: z.string() })),
  /** Counts only: no contact details (safe for the audit packet). */
  progress: z.object({ customers: z.number().int(), told: z.number().int(), emailQueued: z.number().int(), toCall: z.number().int(), noConsent: z.number().int() }),
});
export type RecallSummary = z.infer<typeof RecallSummarySchema>;

export const RecallDetailSchema = RecallSummarySchema.extend({ customers: z.array(RecallCustomerProgressSchema) });
export type RecallDetail = z.infer<typeof RecallDetailSchema>;

/** What the public lot page shows for a recalled batch. */
export const RecallNoticeSchema = z.object({ recallId: z.string(), publicNotice: z.string(), openedAt: z.string(), status: z.enum(['open', 'closed']) });
export type RecallNotice = z.infer<typeof RecallNoticeSchema>;
