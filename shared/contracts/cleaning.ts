import { z } from 'zod';
import { SANITISERS } from '../domain/sanitiser-checks';
import { isCalendarDate } from '../domain/calendar-date';
import { TemperatureInputSchema } from './holding';

const UuidSchema = z.string().uuid('That id is not valid');
const NameSchema = z.string().trim().min(1, 'Enter a name').max(120, 'Keep the name under 120 characters');
const CalendarDateSchema = z.string().refine(isCalendarDate, 'Enter a date as YYYY-MM-DD');
export const CleaningReasonSchema = z.string().trim().min(5, 'Write the reason (at least 5 characters)').max(1000, 'Keep the reason under 1000 characters');

/** The meaning every cleaning signature carries (21 CFR 11.50(a)(3) model). */
export const CLEANING_SIGNATURE_MEANING = 'Cleaned and sanitised';

// ---- Equipment -------------------------------------------------------------------------------

export const EQUIPMENT_KINDS = ['utensil', 'surface', 'appliance', 'container', 'other'] as const;
export const EquipmentKindSchema = z.enum(EQUIPMENT_KINDS, { message: 'Choose what kind of equipment it is' });

/** POST /api/equipment (owner, baker). */
export const EquipmentInputSchema = z
  .object({
    name: NameSchema,
    kind: EquipmentKindSchema,
    isFoodContact: z.boolean({ message: 'Say whether food touches it' }),
    location: z.string().trim().max(120, 'Keep the location under 120 characters').default(''),
  })
  .strict();
export type EquipmentInput = z.input<typeof EquipmentInputSchema>;

/** PATCH /api/equipment/:id: any field, or archived true/false. */
export const EquipmentUpdateSchema = EquipmentInputSchema.partial().extend({ archived: z.boolean().optional() }).strict();
export type EquipmentUpdate = z.input<typeof EquipmentUpdateSchema>;

export const EquipmentSchema = z.object({
  id: z.string(),
  name: z.string(),
  kind: EquipmentKindSchema,
  isFoodContact: z.boolean(),
  location: z.string(),
  archived: z.boolean(),
});
export type Equipment = z.infer<typeof EquipmentSchema>;

export const EquipmentListQuerySchema = z.object({ includeArchived: z.enum(['true', 'false']).default('false') });

// ---- Sanitiser products -------------------------------------------------------------------------

export const SanitiserSchema = z.enum(SANITISERS, { message: 'Choose the sanitiser' });
/** Products are chemicals with a label; hot water has none. */
export const PRODUCT_SANITISERS = ['chlorine', 'iodine', 'quaternary_ammonium', 'label_product'] as const;

const PpmSchema = z.number({ message: 'Enter a number of ppm' }).min(0, 'Cannot be negative').max(100_000, 'That is too large');

/** POST /api/sanitiser-products (owner, baker): the ranges printed on the product's label. */
export const SanitiserProductInputSchema = z
  .object({
    name: NameSchema,
    sanitiser: z.enum(PRODUCT_SANITISERS, { message: 'Choose the kind of sanitiser' }),
    labelMinPpm: PpmSchema.positive('Enter the label\u2019s lowest concentration'),
    labelMaxPpm: PpmSchema,
    labelMinTempC: z.number().min(-10).max(100).nullable().optional(),
    labelContactSeconds: z.number().int('Whole seconds').min(1).max(3600).nullable().optional(),
    labelMaxHardnessPpm: z.number().int('Whole ppm').min(1).max(10_000).nullable().optional(),
  })
  .strict()
  .refine((v) => v.labelMaxPpm >= v.labelMinPpm, { path: ['labelMaxPpm'], message: 'The highest concentration must be at least the lowest' });
export type SanitiserProductInput = z.input<typeof SanitiserProductInputSchema>;

export const SanitiserProductUpdateSchema = z.object({ archived: z.boolean() }).strict();
export type SanitiserProductUpdate = z.input<typeof SanitiserProductUpdateSchema>;

export const SanitiserProductSchema = z.object({
  id: z.string(),
  name: z.string(),
  sanitiser: z.enum(PRODUCT_SANITISERS),
  labelMinPpm: z.number(),
  labelMaxPpm: z.number(),
  labelMinTempC: z.number().nullable(),
  labelContactSeconds: z.number().nullable(),
  labelMaxHardnessPpm: z.number().nullable(),
  archived: z.boolean(),
});
export type SanitiserProduct = z.infer<typeof SanitiserProductSchema>;

// ---- Templates -------------------------------------------------------------------------------

export const CLEANING_STEP_KINDS = ['wash', 'rinse', 'sanitise', 'air_dry', 'custom'] as const;
export const CleaningStepKindSchema = z.enum(CLEANING_STEP_KINDS, { message: 'Choose the kind of step' });
export const CLEANING_FREQUENCIES = ['daily', 'per_batch'] as const;
export const CleaningFrequencySchema = z.enum(CLEANING_FREQUENCIES, { message: 'Choose per day or per batch' });

export const CleaningStepSchema = z.object({ key: z.string(), kind: CleaningStepKindSchema, label: z.string() });
export type CleaningStep = z.infer<typeof CleaningStepSchema>;

/** A template step as typed; the label defaults to the kind's name (a custom step needs one). */
export const CleaningStepInputSchema = z
  .object({ kind: CleaningStepKindSchema, label: z.string().trim().max(120, 'Keep the step under 120 characters').optional() })
  .strict()
  .superRefine((v, ctx) => {
    if (v.kind === 'custom' && !v.label) ctx.addIssue({ code: 'custom', path: ['label'], message: 'Name the step' });
  });

/** POST /api/cleaning-templates (owner, baker). */
export const CleaningTemplateInputSchema = z
  .object({
    name: NameSchema,
    frequency: CleaningFrequencySchema,
    steps: z.array(CleaningStepInputSchema).min(1, 'Add at least one step').max(30, 'At most 30 steps'),
    equipmentIds: z.array(UuidSchema).max(100).default([]),
  })
  .strict();
export type CleaningTemplateInput = z.input<typeof CleaningTemplateInputSchema>;

/** PATCH /api/cleaning-templates/:id: the new content (runs already started keep their copy), or archived. */
export const CleaningTemplateUpdateSchema = z
  .object({
    name: NameSchema.optional(),
    frequency: CleaningFrequencySchema.optional(),
    steps: z.array(CleaningStepInputSchema).min(1, 'Add at least one step').max(30, 'At most 30 steps').optional(),
    equipmentIds: z.array(UuidSchema).max(100).optional(),
    archived: z.boolean().optional(),
  })
  .strict();
export type CleaningTemplateUpdate = z.input<typeof CleaningTemplateUpdateSchema>;

export const CleaningTemplateSchema = z.object({
  id: z.string(),
  name: z.string(),
  frequency: CleaningFrequencySchema,
  steps: z.array(CleaningStepSchema),
  equipmentIds: z.array(z.string()),
  archived: z.boolean(),
});
export type CleaningTemplate = z.infer<typeof CleaningTemplateSchema>;

// ---- Runs ------------------------------------------------------------------------------------

/** POST /api/cleaning-runs: start a run from a template, for the day or for a batch. */
export const StartCleaningRunInputSchema = z
  .object({
    templateId: UuidSchema,
    batchId: UuidSchema.optional(),
    notes: z.string().trim().max(2000, 'Keep notes under 2000 characters').optional(),
  })
  .strict();
export type StartCleaningRunInput = z.input<typeof StartCleaningRunInputSchema>;

/** The measurements of a sanitising step, as typed. */
export const SanitisingInputSchema = z
  .object({
    sanitiser: SanitiserSchema,
    /** A stored product: its label range is used (required for quaternary ammonium and label products). */
    productId: UuidSchema.optional(),
    concentrationPpm: z.number({ message: 'Enter the concentration in ppm' }).min(0, 'Cannot be negative').max(100_000, 'That is too large').optional(),
    waterTemperature: TemperatureInputSchema.optional(),
    ph: z.number({ message: 'Enter the pH' }).min(0, 'pH runs from 0 to 14').max(14, 'pH runs from 0 to 14').optional(),
    contactSeconds: z.number({ message: 'Enter the contact time' }).int('Whole seconds').min(0, 'Cannot be negative').max(86_400, 'That is too long').optional(),
    hardnessPpm: z.number().int('Whole ppm').min(0, 'Cannot be negative').max(10_000, 'That is too large').optional(),
  })
  .strict();
export type SanitisingInput = z.input<typeof SanitisingInputSchema>;

/** A step done. A failed sanitiser check may carry its reason here, or be redone with a new entry. */
export const RecordStepInputSchema = z
  .object({
    stepKey: z.string().min(1, 'Choose the step').max(40),
    note: z.string().trim().max(500, 'Keep the note under 500 characters').optional(),
    sanitising: SanitisingInputSchema.optional(),
    failureReason: CleaningReasonSchema.optional(),
  })
  .strict();

/** Explains an earlier failed check instead of redoing it. */
export const ExplainStepInputSchema = z.object({ explainsEntryId: UuidSchema, reason: CleaningReasonSchema }).strict();

/** POST /api/cleaning-runs/:id/steps (accepts an Idempotency-Key header). */
export const AddCleaningStepInputSchema = z.union([RecordStepInputSchema, ExplainStepInputSchema]);
export type RecordStepInput = z.input<typeof RecordStepInputSchema>;
export type ExplainStepInput = z.input<typeof ExplainStepInputSchema>;
export type AddCleaningStepInput = RecordStepInput | ExplainStepInput;

/**
 * POST /api/cleaning-runs/:id/signatures (accepts an Idempotency-Key header). The signer re-enters
 * their own password; on a kitchen device they also choose who they are (signerUserId).
 */
export const SignCleaningRunInputSchema = z
  .object({
    password: z.string().min(1, 'Enter your password to sign').max(1024),
    signerUserId: UuidSchema.optional(),
    /** The version the signer saw; a newer one makes the signature wait for a fresh look. */
    version: z.number().int().min(1).optional(),
  })
  .strict();
export type SignCleaningRunInput = z.input<typeof SignCleaningRunInputSchema>;

/** POST /api/cleaning-runs/:id/corrections: a new version with a reason, to be signed again. */
export const CorrectCleaningRunInputSchema = z
  .object({
    reason: CleaningReasonSchema,
    notes: z.string().trim().max(2000, 'Keep notes under 2000 characters').optional(),
    /** Steps entered again with corrected values; they replace that step's earlier entries' place as latest. */
    steps: z.array(RecordStepInputSchema).max(30).default([]),
  })
  .strict();
export type CorrectCleaningRunInput = z.input<typeof CorrectCleaningRunInputSchema>;

export const CleaningRunListQuerySchema = z
  .object({
    date: CalendarDateSchema.optional(),
    batchId: UuidSchema.optional(),
  })
  .strict();
export type CleaningRunListQuery = z.input<typeof CleaningRunListQuerySchema>;

export const CleaningRunParamsSchema = z.object({ id: UuidSchema });

const WhoWhenSchema = z.object({ at: z.string(), atLocal: z.string(), by: z.string() });

export const CleaningStepEntrySchema = WhoWhenSchema.extend({
  id: z.string(),
  stepKey: z.string(),
  entryKind: z.enum(['step', 'explanation']),
  explainsEntryId: z.string().nullable(),
  note: z.string(),
  sanitising: z
    .object({
      sanitiser: SanitiserSchema,
      productId: z.string().nullable(),
      productName: z.string().nullable(),
      concentrationPpm: z.string().nullable(),
      waterTemperature: z.object({ value: z.string(), unit: z.enum(['F', 'C']), display: z.string() }).nullable(),
      ph: z.string().nullable(),
      contactSeconds: z.number().nullable(),
      hardnessPpm: z.number().nullable(),
      passed: z.boolean(),
      problems: z.array(z.object({ field: z.string(), message: z.string() })),
    })
    .nullable(),
  failureReason: z.string().nullable(),
  carriedOver: z.boolean(),
});
export type CleaningStepEntry = z.infer<typeof CleaningStepEntrySchema>;

/** Signature manifestation: printed name, date and time with offset, and meaning, in every view. */
export const CleaningSignatureSchema = z.object({
  id: z.string(),
  version: z.number(),
  printedName: z.string(),
  signerUserId: z.string(),
  signerRole: z.string(),
  meaning: z.string(),
  signedAt: z.string(),
  /** ISO 8601 with the business zone's offset. */
  signedAtIso: z.string(),
  signedAtLocal: z.string(),
  deviceName: z.string().nullable(),
  recordHash: z.string(),
  /** 'valid' only while the hash matches the signed version's content. */
  validity: z.enum(['valid', 'invalid']),
  /** 'Signature valid' or 'Signature invalid', for screens and exports. */
  validityText: z.string(),
});
export type CleaningSignature = z.infer<typeof CleaningSignatureSchema>;

/** Per template step: whether it is done, and what still blocks signing. */
export const CleaningStepStatusSchema = z.object({
  key: z.string(),
  kind: CleaningStepKindSchema,
  label: z.string(),
  done: z.boolean(),
  /** The latest sanitiser check failed and has no reason yet: redo it or explain it. */
  needsRedoOrReason: z.boolean(),
  latestEntryId: z.string().nullable(),
});

export const CleaningRunVersionSchema = z.object({
  version: z.number(),
  notes: z.string(),
  reason: z.string().nullable(),
  createdAt: z.string(),
  createdAtLocal: z.string(),
  createdBy: z.string(),
  entries: z.array(CleaningStepEntrySchema),
  signature: CleaningSignatureSchema.nullable(),
});
export type CleaningRunVersion = z.infer<typeof CleaningRunVersionSchema>;

export const CleaningRunStatusSchema = z.enum(['in_progress', 'ready_to_sign', 'signed', 'signature_invalid']);

export const CleaningRunSchema = z.object({
  id: z.string(),
  templateId: z.string(),
  templateName: z.string(),
  frequency: CleaningFrequencySchema,
  batchId: z.string().nullable(),
  batchLotCode: z.string().nullable(),
  runDate: z.string(),
  started: WhoWhenSchema,
  equipmentIds: z.array(z.string()),
  status: CleaningRunStatusSchema,
  /** Why the run cannot be signed yet (empty when it can). */
  blockers: z.array(z.string()),
  currentVersion: z.number(),
  steps: z.array(CleaningStepStatusSchema),
  /** Newest first; the first is current. */
  versions: z.array(CleaningRunVersionSchema),
});
export type CleaningRun = z.infer<typeof CleaningRunSchema>;

export const CleaningRunListSchema = z.object({ runs: z.array(CleaningRunSchema), serverNow: z.string(), timeZone: z.string(), today: z.string() });
export type CleaningRunList = z.infer<typeof CleaningRunListSchema>;

/** GET /api/cleaning-runs/due: daily templates not yet started today, and the 4-hour surface clock. */
export const CleaningDueListSchema = z.object({
  serverNow: z.string(),
  today: z.string(),
  dailyTemplatesNotStarted: z.array(z.object({ id: z.string(), name: z.string() })),
  equipment: z.array(
    z.object({
      equipmentId: z.string(),
      name: z.string(),
      status: z.enum(['not_in_use', 'ok', 'due_soon', 'overdue']),
      nextDueAt: z.string().nullable(),
      nextDueAtLocal: z.string().nullable(),
      lastCleanedAtLocal: z.string().nullable(),
    }),
  ),
});
export type CleaningDueList = z.infer<typeof CleaningDueListSchema>;

/** GET /api/cleaning-runs/signers: who can sign on this kitchen device. */
export const CleaningSignerListSchema = z.object({ signers: z.array(z.object({ userId: z.string(), name: z.string(), role: z.string() })) });
export type CleaningSignerList = z.infer<typeof CleaningSignerListSchema>;
