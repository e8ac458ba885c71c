import { z } from 'zod';
import { HoldingPeriodSchema } from './holding';

/** Running holding timers, anything over a limit first. */
export const HoldingTimersSectionSchema = z.object({
  kind: z.literal('holding_timers'),
  periods: z.array(HoldingPeriodSchema),
  /** Batches a timer can be started for (in progress, released or held), for the start dialog. */
  batchOptions: z.array(z.object({ id: z.string(), lotCode: z.string(), productName: z.string(), state: z.string() })),
});

/** Batches still being made (state 'in_progress'), newest first. */
export const BatchesInProgressSectionSchema = z.object({
  kind: z.literal('batches_in_progress'),
  batches: z.array(z.object({ id: z.string(), lotCode: z.string(), productName: z.string(), madeOn: z.string() })),
});

/** Filled by the cleaning feature: cleanings due or overdue. */
export const CleaningsDueSectionSchema = z.object({
  kind: z.literal('cleanings_due'),
  items: z.array(z.object({ id: z.string(), title: z.string(), dueAt: z.string(), dueAtLocal: z.string(), isOverdue: z.boolean() })),
});

/** Filled by the documents feature: permits, certificates and insurance expiring soon. */
export const DocumentsExpiringSectionSchema = z.object({
  kind: z.literal('documents_expiring'),
  items: z.array(z.object({ id: z.string(), title: z.string(), expiresOn: z.string(), daysLeft: z.number() })),
});

/** Filled by the sales feature: a warning when the year's sales near the cottage-food cap. */
export const SalesCapSectionSchema = z.object({
  kind: z.literal('sales_cap'),
  warning: z.object({ message: z.string(), level: z.enum(['info', 'warning', 'over']) }).nullable(),
});

export const KitchenBoardSectionSchema = z.discriminatedUnion('kind', [
  HoldingTimersSectionSchema,
  BatchesInProgressSectionSchema,
  CleaningsDueSectionSchema,
  DocumentsExpiringSectionSchema,
  SalesCapSectionSchema,
]);
export type KitchenBoardSection = z.infer<typeof KitchenBoardSectionSchema>;
export type KitchenBoardSectionKind = KitchenBoardSection['kind'];

/** GET /api/kitchen-board: one call for the kitchen screen; `serverNow` drives the client's countdowns. */
export const KitchenBoardSchema = z.object({
  serverNow: z.string(),
  timeZone: z.string(),
  businessName: z.string(),
  sections: z.array(KitchenBoardSectionSchema),
});
export type KitchenBoard = z.infer<typeof KitchenBoardSchema>;
