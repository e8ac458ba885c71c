import { z } from 'zod';
import { BATCH_STATES } from '../domain/batch-states';
import { isCalendarDate } from '../domain/calendar-date';

const UuidSchema = z.string().uuid('That id is not valid');
const CalendarDateSchema = z.string().refine(isCalendarDate, 'Enter a date as YYYY-MM-DD');
const CountSchema = z.number().int('Enter a whole number').min(0, 'Cannot be negative').max(1_000_000, 'That number is too large');

export const BatchStateSchema = z.enum(BATCH_STATES);
export type BatchStateValue = z.infer<typeof BatchStateSchema>;

/** The supplier lot used for one ingredient; null records "no lot noted" (kept as a warning). */
export const IngredientLotChoiceSchema = z.object({
  ingredientId: UuidSchema,
  supplierLotId: UuidSchema.nullable(),
});
export type IngredientLotChoice = z.infer<typeof IngredientLotChoiceSchema>;

/** A sub-recipe (e.g. a frosting) supplied by another batch; null means its ingredients' lots are listed instead. */
export const SubRecipeBatchChoiceSchema = z.object({
  recipeId: UuidSchema,
  sourceBatchId: UuidSchema.nullable(),
});
export type SubRecipeBatchChoice = z.infer<typeof SubRecipeBatchChoiceSchema>;

const NotesSchema = z.string().trim().max(2000, 'Keep notes under 2000 characters');
const ShelfLifeSchema = z.number().int('Enter whole days').min(0, 'Cannot be negative').max(3650, 'Shelf life is at most 3650 days');
export const ReasonSchema = z.string().trim().min(3, 'Enter a reason (at least 3 characters)').max(1000, 'Keep the reason under 1000 characters');

const batchDetailsShape = {
  madeByUserId: UuidSchema.optional(),
  quantityPieces: CountSchema.nullable().optional(),
  quantityPackages: CountSchema.nullable().optional(),
  /** Defaults to the recipe version's shelf life. */
  shelfLifeDays: ShelfLifeSchema.nullable().optional(),
  notes: NotesSchema.optional(),
  lots: z.array(IngredientLotChoiceSchema).max(500).optional(),
  subRecipeBatches: z.array(SubRecipeBatchChoiceSchema).max(100).optional(),
};

/** POST /api/batches (owner, baker). Accepts an Idempotency-Key header. */
export const CreateBatchInputSchema = z
  .object({
    recipeVersionId: UuidSchema,
    /** Calendar date in the business's time zone; defaults to today there. */
    madeOn: CalendarDateSchema.optional(),
    ...batchDetailsShape,
  })
  .strict();
export type CreateBatchInput = z.infer<typeof CreateBatchInputSchema>;

/**
 * POST /api/batches/:id/versions: a correction is a new version with a reason. The lot code, recipe
 * version and made-on date stay. Omitted lots/subRecipeBatches keep the previous version's inputs.
 */
export const CorrectBatchInputSchema = z.object({ ...batchDetailsShape, reason: ReasonSchema }).strict();
export type CorrectBatchInput = z.infer<typeof CorrectBatchInputSchema>;

/** POST /api/batches/:id/state */
export const ChangeBatchStateInputSchema = z.object({ toState: BatchStateSchema, reason: ReasonSchema }).strict();
export type ChangeBatchStateInput = z.infer<typeof ChangeBatchStateInputSchema>;

/** Idempotency-Key request header (IETF draft-ietf-httpapi-idempotency-key-header-07). */
export const IdempotencyKeySchema = z.string().trim().min(8, 'The Idempotency-Key header must be 8 to 200 characters').max(200, 'The Idempotency-Key header must be 8 to 200 characters').regex(/^[\x21-\x7e]+$/, 'The Idempotency-Key header may hold only printable ASCII');

export const ListBatchesQuerySchema = z.object({
  state: BatchStateSchema.optional(),
  recipeId: UuidSchema.optional(),
  from: CalendarDateSchema.optional(),
  to: CalendarDateSchema.optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(50),
});
export type ListBatchesQuery = z.infer<typeof ListBatchesQuerySchema>;

export const BatchWarningSchema = z.object({
  code: z.enum(['no_supplier_lot']),
  message: z.string(),
  ingredientId: z.string().nullable(),
});
export type BatchWarning = z.infer<typeof BatchWarningSchema>;

export const BatchListItemSchema = z.object({
  id: z.string(),
  lotCode: z.string(),
  recipeId: z.string(),
  recipeName: z.string(),
  recipeVersion: z.number().int(),
  madeOn: z.string(),
  bestBy: z.string().nullable(),
  state: BatchStateSchema,
  version: z.number().int(),
  quantityPieces: z.number().int().nullable(),
  quantityPackages: z.number().int().nullable(),
  madeByName: z.string().nullable(),
  warningCount: z.number().int(),
});
export type BatchListItem = z.infer<typeof BatchListItemSchema>;

export const BatchPageSchema = z.object({
  items: z.array(BatchListItemSchema),
  page: z.number().int(),
  pageSize: z.number().int(),
  total: z.number().int(),
});
export type BatchPage = z.infer<typeof BatchPageSchema>;

export const BatchInputRowSchema = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('ingredient'),
    ingredientId: z.string(),
    ingredientName: z.string(),
    supplierLotId: z.string().nullable(),
    supplierLotCode: z.string().nullable(),
    receivedOn: z.string().nullable(),
  }),
  z.object({
    kind: z.literal('batch'),
    subRecipeId: z.string(),
    subRecipeName: z.string(),
    sourceBatchId: z.string(),
    sourceLotCode: z.string(),
  }),
]);
export type BatchInputRow = z.infer<typeof BatchInputRowSchema>;

export const BatchVersionSchema = z.object({
  version: z.number().int(),
  madeByUserId: z.string().nullable(),
  madeByName: z.string().nullable(),
  quantityPieces: z.number().int().nullable(),
  quantityPackages: z.number().int().nullable(),
  shelfLifeDays: z.number().int().nullable(),
  bestBy: z.string().nullable(),
  notes: z.string(),
  reason: z.string().nullable(),
  createdByName: z.string().nullable(),
  createdAt: z.string(),
  inputs: z.array(BatchInputRowSchema),
});
export type BatchVersion = z.infer<typeof BatchVersionSchema>;

export const BatchStateChangeSchema = z.object({
  fromState: BatchStateSchema.nullable(),
  toState: BatchStateSchema,
  reason: z.string(),
  changedByName: z.string(),
  changedAt: z.string(),
});
export type BatchStateChange = z.infer<typeof BatchStateChangeSchema>;

/** GET /api/batches/:id and the answer of every batch write. */
export const BatchDetailSchema = z.object({
  id: z.string(),
  lotCode: z.string(),
  /** Random code for the public lot page's URL; never the lot code. */
  publicCode: z.string(),
  recipeId: z.string(),
  recipeName: z.string(),
  recipeVersionId: z.string(),
  recipeVersion: z.number().int(),
  madeOn: z.string(),
  daySequence: z.number().int(),
  state: BatchStateSchema,
  allowedTransitions: z.array(BatchStateSchema),
  current: BatchVersionSchema,
  warnings: z.array(BatchWarningSchema),
  stateHistory: z.array(BatchStateChangeSchema),
  /** Newest first; the first is `current`. */
  versions: z.array(BatchVersionSchema),
  createdAt: z.string(),
});
export type BatchDetail = z.infer<typeof BatchDetailSchema>;

export const LotCandidatesQuerySchema = z.object({ recipeVersionId: UuidSchema });

/** GET /api/batches/lot-candidates?recipeVersionId= and /api/batches/:id/lot-candidates: choices for the form. */
export const LotCandidatesSchema = z.object({
  recipeVersionId: z.string(),
  recipeId: z.string(),
  recipeName: z.string(),
  recipeVersion: z.number().int(),
  shelfLifeDays: z.number().int().nullable(),
  ingredients: z.array(
    z.object({
      ingredientId: z.string(),
      name: z.string(),
      /** Used directly in the recipe (not only through a sub-recipe). */
      isDirect: z.boolean(),
      lots: z.array(z.object({ id: z.string(), lotCode: z.string(), receivedOn: z.string(), bestBy: z.string().nullable() })),
    }),
  ),
  subRecipes: z.array(
    z.object({
      recipeId: z.string(),
      name: z.string(),
      /** Leaf ingredients that need lots when no batch of this sub-recipe is picked. */
      ingredientIds: z.array(z.string()),
      batches: z.array(z.object({ id: z.string(), lotCode: z.string(), madeOn: z.string(), state: BatchStateSchema, bestBy: z.string().nullable() })),
    }),
  ),
});
export type LotCandidates = z.infer<typeof LotCandidatesSchema>;

/** GET /api/batches/recipe-options: recipes and their versions for the new-batch form. */
export const BatchRecipeOptionsSchema = z.object({
  recipes: z.array(
    z.object({
      recipeId: z.string(),
      name: z.string(),
      isSellable: z.boolean(),
      versions: z.array(z.object({ id: z.string(), version: z.number().int(), name: z.string(), shelfLifeDays: z.number().int().nullable() })),
    }),
  ),
});
export type BatchRecipeOptions = z.infer<typeof BatchRecipeOptionsSchema>;
