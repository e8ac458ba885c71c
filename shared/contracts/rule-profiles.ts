import { z } from 'zod';
import { HOLDING_POLICIES } from '../domain/holding-policies';

const IsoDateSchema = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date like 2025-09-01');

/** Where a value comes from. `verified: false` means it could not be checked in a published text. */
export const RuleSourceSchema = z.object({
  citation: z.string().trim().min(1, 'Name the source'),
  url: z.string().url('Enter a full web address').optional(),
  checkedOn: IsoDateSchema.optional(),
  verified: z.boolean(),
  note: z.string().optional(),
});

/** A value together with its source. */
const sourced = <T extends z.ZodType>(value: T) => z.object({ value, source: RuleSourceSchema });

export const LABEL_ELEMENT_KEYS = [
  'productName', 'ingredients', 'allergens', 'netQuantity', 'businessNameAddress', 'businessNameRegistration',
  'registrationNumber', 'homeKitchenStatement', 'madeOnDate', 'bestByDate', 'lotCode', 'safeHandlingStatement',
] as const;
export const LabelElementKeySchema = z.enum(LABEL_ELEMENT_KEYS);

export const SALES_CHANNELS = ['direct', 'event', 'online', 'wholesale'] as const;
export const SalesChannelSchema = z.enum(SALES_CHANNELS);

export const HoldingPolicyKindSchema = z.enum(HOLDING_POLICIES);

const StatementSchema = z.object({
  text: z.string().trim().min(1, 'Enter the statement text'),
  /** Minimum type size in points, or null when the rule sets none. */
  minPoints: z.number().positive('Use a size above zero').nullable(),
});

/** A label element, with the source that requires it. */
const RequiredElementSchema = z.object({ key: LabelElementKeySchema, source: RuleSourceSchema });

/** Food Code 4-501.114 / 4-703.11 style sanitiser rules; temperatures in °C with the °F the code prints. */
export const SanitiserRuleSchema = z.discriminatedUnion('chemical', [
  z.object({
    chemical: z.literal('chlorine'),
    minMgL: z.number().nonnegative(),
    /** Null: no upper limit in the code; follow the EPA-registered label. */
    maxMgL: z.number().positive().nullable(),
    minTempCAtPhUpTo10: z.number(),
    minTempCAtPhUpTo8: z.number(),
    minContactSeconds: z.number().positive(),
  }),
  z.object({
    chemical: z.literal('iodine'),
    minMgL: z.number().nonnegative(),
    maxMgL: z.number().positive(),
    minTempC: z.number(),
    maxPh: z.number(),
    minContactSeconds: z.number().positive(),
  }),
  z.object({
    chemical: z.literal('quaternary_ammonium'),
    minTempC: z.number(),
    maxWaterHardnessMgL: z.number().positive(),
    minContactSeconds: z.number().positive(),
  }),
  z.object({ chemical: z.literal('hot_water'), minTempC: z.number(), minContactSeconds: z.number().positive() }),
  z.object({ chemical: z.literal('label_product'), note: z.string() }),
]);

const SalesCapSchema = z.object({
  amount: z.number().positive('Use an amount above zero'),
  currency: z.enum(['USD', 'GBP', 'EUR']),
  /** The year the figure is for (caps indexed to inflation change each year); null when fixed. */
  year: z.number().int().nullable(),
  period: z.enum(['calendar-year', 'rolling-12-months']),
});

export const RuleProfileSchema = z
  .object({
    id: z.string().trim().min(1).max(64).regex(/^[a-z0-9-]+$/, 'Use lower-case letters, digits and dashes'),
    name: z.string().trim().min(1, 'Enter a name').max(120),
    jurisdiction: z.object({
      /** Key shared by the dated versions of one place, e.g. 'us-tx'. */
      key: z.string().trim().min(1).regex(/^[a-z0-9-]+$/),
      country: z.enum(['US', 'EU', 'GB']),
      region: z.string().nullable(),
    }),
    effectiveFrom: IsoDateSchema,
    /** First day the profile no longer applies (exclusive); null while in force. */
    effectiveTo: IsoDateSchema.nullable(),
    effectiveSource: RuleSourceSchema,
    isCustom: z.boolean(),
    basedOnId: z.string().nullable(),
    allergenRegime: sourced(z.object({ regime: z.enum(['US', 'EU', 'UK']), ruleSetDate: IsoDateSchema })),
    homeKitchenStatement: sourced(StatementSchema.nullable()),
    /** Extra statement for products that need time/temperature control (e.g. Texas safe-handling text). */
    tcsStatement: sourced(StatementSchema.nullable()),
    requiredLabelElements: z.array(RequiredElementSchema),
    /** Elements required only when the product needs time/temperature control. */
    tcsRequiredLabelElements: z.array(RequiredElementSchema),
    netQuantity: sourced(z.object({ units: z.enum(['us-dual', 'metric']), rounding: z.enum(['round-down', 'nearest']) })),
    salesCap: sourced(SalesCapSchema.nullable()),
    salesChannels: sourced(z.array(SalesChannelSchema).min(1, 'Allow at least one sales channel')),
    allowsTcsFoods: sourced(z.boolean()),
    holdingPolicy: sourced(z.object({ kind: HoldingPolicyKindSchema, customLimitMinutes: z.number().int().positive().nullable() })),
    sanitisers: sourced(z.array(SanitiserRuleSchema)),
    /** Shown on every label and rule screen. */
    caution: z.string().min(1),
  })
  .superRefine((p, ctx) => {
    if (p.effectiveTo !== null && p.effectiveTo <= p.effectiveFrom) {
      ctx.addIssue({ code: 'custom', path: ['effectiveTo'], message: 'The end date must be after the start date' });
    }
    const { kind, customLimitMinutes } = p.holdingPolicy.value;
    if (kind === 'custom' && customLimitMinutes === null) {
      ctx.addIssue({ code: 'custom', path: ['holdingPolicy', 'value', 'customLimitMinutes'], message: 'Enter the time limit in minutes' });
    }
  });

export type RuleSource = z.infer<typeof RuleSourceSchema>;
export type LabelElementKey = z.infer<typeof LabelElementKeySchema>;
export type SalesChannel = z.infer<typeof SalesChannelSchema>;
export type HoldingPolicyKind = z.infer<typeof HoldingPolicyKindSchema>;
export type SanitiserRule = z.infer<typeof SanitiserRuleSchema>;
export type RuleProfile = z.infer<typeof RuleProfileSchema>;
