import { z } from 'zod';
import { HOLDING_POLICIES } from '../domain/holding-policies';

const UuidSchema = z.string().uuid('That id is not valid');

/** What the food is doing while out of temperature control. */
export const HOLDING_KINDS = ['resting', 'cooling', 'setting', 'display', 'custom'] as const;
export const HoldingKindSchema = z.enum(HOLDING_KINDS, { message: 'Choose what the food is doing' });
export type HoldingKind = z.infer<typeof HoldingKindSchema>;

export const HoldingPolicySchema = z.enum(HOLDING_POLICIES, { message: 'Choose a time limit' });

/** A temperature as typed: a decimal number and its unit. */
export const TemperatureInputSchema = z.object({
  value: z
    .union([z.number(), z.string().trim()])
    .transform((v) => String(v).replace(',', '.'))
    .refine((v) => /^-?\d{1,3}(\.\d{1,2})?$/.test(v), 'Enter the temperature as a number, e.g. 38 or 3.5')
    .refine((v) => Number(v) >= -60 && Number(v) <= 500, 'That temperature is out of range; check the reading'),
  unit: z.enum(['F', 'C'], { message: 'Choose °F or °C' }),
});
export type TemperatureInput = z.input<typeof TemperatureInputSchema>;

/** Idempotency-Key header: a client-made id for one write, so a retried tap is not recorded twice. */
export const IdempotencyKeySchema = z.string().trim().min(8, 'Idempotency-Key is too short').max(200, 'Idempotency-Key is too long').optional();

/** POST /api/holding-periods. `policy` omitted → the recipe version's, else the rule profile's. */
export const StartHoldingInputSchema = z
  .object({
    batchId: UuidSchema,
    kind: HoldingKindSchema,
    label: z.string().trim().max(80, 'Keep the name under 80 characters').optional(),
    policy: HoldingPolicySchema.optional(),
    customLimitMinutes: z.number({ message: 'Enter the limit in minutes' }).int('Whole minutes only').min(1, 'At least 1 minute').max(1440, 'At most 24 hours (1440 minutes)').optional(),
    firstReading: TemperatureInputSchema.optional(),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (v.kind === 'custom' && !v.label) ctx.addIssue({ code: 'custom', path: ['label'], message: 'Name what the food is doing' });
  });
export type StartHoldingInput = z.input<typeof StartHoldingInputSchema>;

/** POST /api/holding-periods/:id/readings */
export const AddReadingInputSchema = TemperatureInputSchema.strict();
export type AddReadingInput = z.input<typeof AddReadingInputSchema>;

/** POST /api/holding-periods/:id/stop */
export const StopHoldingInputSchema = z.object({ note: z.string().trim().max(500, 'Keep the note under 500 characters').optional() }).strict();
export type StopHoldingInput = z.input<typeof StopHoldingInputSchema>;

/** 'reason' closes a custom (quality) limit only; food-safety limits need 'discarded' or 'reheated'. */
export const HOLDING_ACTIONS = ['discarded', 'reheated', 'reason'] as const;
export const HoldingActionKindSchema = z.enum(HOLDING_ACTIONS, { message: 'Choose what was done' });
export type HoldingActionKind = z.infer<typeof HoldingActionKindSchema>;

/** POST /api/holding-periods/:id/actions */
export const RecordHoldingActionInputSchema = z
  .object({ action: HoldingActionKindSchema, reason: z.string().trim().max(1000, 'Keep it under 1000 characters').optional() })
  .strict()
  .superRefine((v, ctx) => {
    if (v.action === 'reason' && (v.reason ?? '').length < 5) ctx.addIssue({ code: 'custom', path: ['reason'], message: 'Write why the food was still fine to use' });
  });
export type RecordHoldingActionInput = z.input<typeof RecordHoldingActionInputSchema>;

export const HoldingListQuerySchema = z.object({
  state: z.enum(['running', 'all']).default('running'),
  batchId: UuidSchema.optional(),
});
export type HoldingListQuery = z.input<typeof HoldingListQuerySchema>;

export const HoldingPeriodParamsSchema = z.object({ id: UuidSchema });

const WhoWhenSchema = z.object({ at: z.string(), atLocal: z.string(), by: z.string() });

export const HoldingReadingViewSchema = WhoWhenSchema.extend({ id: z.string(), value: z.string(), unit: z.enum(['F', 'C']), display: z.string() });
export type HoldingReadingView = z.infer<typeof HoldingReadingViewSchema>;

export const HoldingActionViewSchema = WhoWhenSchema.extend({ id: z.string(), action: HoldingActionKindSchema, reason: z.string() });
export type HoldingActionView = z.infer<typeof HoldingActionViewSchema>;

/** The verdict from shared/domain/holding-policies.ts at the server's clock, plus local times. */
export const HoldingEvaluationViewSchema = z.object({
  status: z.enum(['running', 'within_limit', 'due_soon', 'over_limit', 'completed', 'not_permitted']),
  elapsedMs: z.number(),
  deadlineAt: z.string().nullable(),
  deadlineAtLocal: z.string().nullable(),
  remainingMs: z.number().nullable(),
  requiredAction: z.enum(['discard', 'reheat_or_discard', 'record_reason']).nullable(),
  isFoodSafetyLimit: z.boolean(),
  messages: z.array(z.string()),
});

export const HoldingPeriodSchema = z.object({
  id: z.string(),
  batchId: z.string(),
  lotCode: z.string(),
  productName: z.string(),
  kind: HoldingKindSchema,
  label: z.string(),
  policy: HoldingPolicySchema,
  policyName: z.string(),
  policySource: z.enum(['recipe', 'rule_profile', 'chosen']),
  customLimitMinutes: z.number().nullable(),
  limitMinutes: z.number().nullable(),
  timeZone: z.string(),
  started: WhoWhenSchema,
  stopped: WhoWhenSchema.extend({ note: z.string() }).nullable(),
  readings: z.array(HoldingReadingViewSchema),
  actions: z.array(HoldingActionViewSchema),
  evaluation: HoldingEvaluationViewSchema,
  /** Over a limit with the required action not yet recorded: blocks release and labels. */
  needsAction: z.boolean(),
});
export type HoldingPeriod = z.infer<typeof HoldingPeriodSchema>;

export const HoldingPeriodResponseSchema = z.object({ period: HoldingPeriodSchema, serverNow: z.string() });
export type HoldingPeriodResponse = z.infer<typeof HoldingPeriodResponseSchema>;
export const HoldingPeriodListSchema = z.object({ periods: z.array(HoldingPeriodSchema), serverNow: z.string() });
export type HoldingPeriodList = z.infer<typeof HoldingPeriodListSchema>;

/** POST /api/written-procedures (owner): a new version of the TPHC procedure. */
export const WrittenProcedureInputSchema = z
  .object({
    title: z.string().trim().min(3, 'Give the procedure a title').max(120, 'Keep the title under 120 characters'),
    body: z.string().trim().min(40, 'Describe the procedure (at least 40 characters): which foods, how they are marked, when they are discarded').max(20_000, 'Keep it under 20,000 characters'),
  })
  .strict();
export type WrittenProcedureInput = z.input<typeof WrittenProcedureInputSchema>;

export const WrittenProcedureSchema = z.object({
  id: z.string(),
  topic: z.literal('tphc'),
  version: z.number(),
  title: z.string(),
  body: z.string(),
  createdBy: z.string(),
  createdAt: z.string(),
  createdAtLocal: z.string(),
});
export type WrittenProcedure = z.infer<typeof WrittenProcedureSchema>;
export const WrittenProcedureListSchema = z.object({ current: WrittenProcedureSchema.nullable(), versions: z.array(WrittenProcedureSchema) });
export type WrittenProcedureList = z.infer<typeof WrittenProcedureListSchema>;
