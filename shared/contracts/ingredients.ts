import { z } from 'zod';
import { ALLERGEN_SOURCES } from '../domain/allergens';

/** Sources whose declaration must name the kind (21 U.S.C. 343(w)(2): tree nut, fish, crustacean shellfish). */
export const KIND_REQUIRED_SOURCES = ['tree_nut', 'fish', 'crustacean_shellfish'] as const;

export const AllergenSourceSchema = z.enum(ALLERGEN_SOURCES, 'Choose an allergen from the list');

export const AllergenDeclSchema = z
  .object({
    source: AllergenSourceSchema,
    kind: z.string().trim().max(60, 'Keep the kind under 60 characters').nullable().optional(),
  })
  .superRefine((d, ctx) => {
    if ((KIND_REQUIRED_SOURCES as readonly string[]).includes(d.source) && !d.kind) {
      const what = d.source === 'tree_nut' ? 'tree nut (for example almond)' : d.source === 'fish' ? 'fish (for example salmon)' : 'shellfish (for example shrimp)';
      ctx.addIssue({ code: 'custom', path: ['kind'], message: `Name the ${what}: the label must say which one` });
    }
  });

const text = (max: number, label: string) => z.string().trim().max(max, `Keep ${label} under ${max} characters`);

const IngredientFieldsSchema = z.object({
  labelName: z.string().trim().min(1, 'Enter the name as printed on the package').max(200, 'Keep the name under 200 characters'),
  /** Ordered as the package lists them (21 CFR 101.4(b)(2)); empty for a single ingredient. */
  subIngredients: z.array(z.string().trim().min(1, 'Remove the empty sub-ingredient').max(200, 'Keep each sub-ingredient under 200 characters')).max(100, 'At most 100 sub-ingredients'),
  allergens: z.array(AllergenDeclSchema).max(30, 'At most 30 allergens'),
  allergensConfirmed: z.boolean(),
  sulphitesMgPerKg: z.number('Enter a number of mg/kg').min(0, 'Sulphites cannot be negative').max(1_000_000, 'That is more than the whole kilogram').nullable(),
  needsTimeTemperatureControl: z.boolean(),
  supplierName: text(120, 'the supplier'),
  supplierItemCode: text(60, 'the item code'),
  notes: text(2000, 'notes'),
});

export const CreateIngredientInputSchema = IngredientFieldsSchema.extend({
  subIngredients: IngredientFieldsSchema.shape.subIngredients.default([]),
  allergens: IngredientFieldsSchema.shape.allergens.default([]),
  allergensConfirmed: z.boolean().default(false),
  sulphitesMgPerKg: IngredientFieldsSchema.shape.sulphitesMgPerKg.default(null),
  needsTimeTemperatureControl: z.boolean().default(false),
  supplierName: IngredientFieldsSchema.shape.supplierName.default(''),
  supplierItemCode: IngredientFieldsSchema.shape.supplierItemCode.default(''),
  notes: IngredientFieldsSchema.shape.notes.default(''),
});
export type CreateIngredientInput = z.infer<typeof CreateIngredientInputSchema>;
export type CreateIngredientFormValues = z.input<typeof CreateIngredientInputSchema>;

const ReasonSchema = z.string('Say why you are changing it').trim().min(3, 'Say why you are changing it (at least 3 characters)').max(500, 'Keep the reason under 500 characters');

/** An edit makes a new version; the reason is kept with it. Omitted fields keep their current value. */
export const UpdateIngredientInputSchema = IngredientFieldsSchema.partial().extend({
  reason: ReasonSchema,
  /** The version the editor started from; a newer one answers 409 so nobody overwrites unseen changes. */
  baseVersion: z.number().int().positive().optional(),
});
export type UpdateIngredientInput = z.infer<typeof UpdateIngredientInputSchema>;

export const ArchiveIngredientInputSchema = z.object({ reason: ReasonSchema });
export type ArchiveIngredientInput = z.infer<typeof ArchiveIngredientInputSchema>;

/** "I compared this record with the package in hand": records who and when, and confirms the allergens. */
export const VerifyIngredientInputSchema = z.object({ note: text(500, 'the note').optional() });
export type VerifyIngredientInput = z.infer<typeof VerifyIngredientInputSchema>;

export const PersonRefSchema = z.object({ userId: z.string().nullable(), name: z.string() });
export type PersonRef = z.infer<typeof PersonRefSchema>;

export const LabelCheckSchema = z.object({
  id: z.string(),
  outcome: z.enum(['matches', 'changed']),
  notes: z.string(),
  checkedBy: PersonRefSchema,
  checkedAt: z.string(),
});
export type LabelCheck = z.infer<typeof LabelCheckSchema>;

export const SupplierLotSchema = z.object({
  id: z.string(),
  ingredientId: z.string(),
  ingredientName: z.string(),
  lotCode: z.string(),
  receivedOn: z.string(),
  bestBy: z.string().nullable(),
  quantity: z.string(),
  notes: z.string(),
  createdBy: PersonRefSchema.nullable(),
  createdAt: z.string(),
  /** Every re-check of this lot's package label, newest first. */
  labelChecks: z.array(LabelCheckSchema),
  /** True until someone compares this lot's label with the stored declaration. */
  needsLabelRecheck: z.boolean(),
});
export type SupplierLot = z.infer<typeof SupplierLotSchema>;

const IsoDateSchema = z.iso.date('Enter a date as YYYY-MM-DD');

export const CreateSupplierLotInputSchema = z
  .object({
    lotCode: z.string().trim().min(1, 'Enter the lot code printed on the package').max(60, 'Keep the lot code under 60 characters'),
    receivedOn: IsoDateSchema,
    bestBy: IsoDateSchema.nullable().optional(),
    quantity: text(60, 'the quantity').default(''),
    notes: text(1000, 'notes').default(''),
  })
  .refine((l) => !l.bestBy || l.bestBy >= l.receivedOn, { path: ['bestBy'], message: 'The best-by date cannot be before the day it arrived' });
export type CreateSupplierLotInput = z.infer<typeof CreateSupplierLotInputSchema>;
export type CreateSupplierLotFormValues = z.input<typeof CreateSupplierLotInputSchema>;

export const LabelCheckInputSchema = z
  .object({
    outcome: z.enum(['matches', 'changed'], 'Choose whether the label matches'),
    notes: text(1000, 'notes').default(''),
  })
  .refine((c) => c.outcome === 'matches' || c.notes.length > 0, { path: ['notes'], message: 'Say what changed on the label' });
export type LabelCheckInput = z.infer<typeof LabelCheckInputSchema>;
export type LabelCheckFormValues = z.input<typeof LabelCheckInputSchema>;

export const LabelFileSchema = z.object({
  id: z.string(),
  ingredientId: z.string(),
  displayName: z.string(),
  contentType: z.string(),
  byteSize: z.number(),
  sha256: z.string(),
  isImage: z.boolean(),
  uploadedBy: PersonRefSchema.nullable(),
  createdAt: z.string(),
});
export type LabelFile = z.infer<typeof LabelFileSchema>;

/** At most this many label photos/PDFs per ingredient (files are kept as evidence, never deleted). */
export const MAX_LABEL_FILES_PER_INGREDIENT = 10;

export const IngredientSchema = z.object({
  id: z.string(),
  version: z.number(),
  labelName: z.string(),
  subIngredients: z.array(z.string()),
  allergens: z.array(z.object({ source: AllergenSourceSchema, kind: z.string().nullable().optional() })),
  allergensConfirmed: z.boolean(),
  sulphitesMgPerKg: z.number().nullable(),
  needsTimeTemperatureControl: z.boolean(),
  supplierName: z.string(),
  supplierItemCode: z.string(),
  notes: z.string(),
  isArchived: z.boolean(),
  isVerified: z.boolean(),
  verifiedBy: PersonRefSchema.nullable(),
  verifiedAt: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
  updatedBy: PersonRefSchema.nullable(),
  labelFileCount: z.number(),
  lotCount: z.number(),
  /** Some lot of it arrived and nobody has compared its package label yet. */
  needsLabelRecheck: z.boolean(),
});
export type Ingredient = z.infer<typeof IngredientSchema>;

export const IngredientChangeKindSchema = z.enum(['create', 'edit', 'verify', 'archive', 'restore']);

export const IngredientVersionSchema = IngredientSchema.pick({
  version: true, labelName: true, subIngredients: true, allergens: true, allergensConfirmed: true, sulphitesMgPerKg: true,
  needsTimeTemperatureControl: true, supplierName: true, supplierItemCode: true, notes: true, isArchived: true,
  verifiedBy: true, verifiedAt: true,
}).extend({
  id: z.string(),
  change: IngredientChangeKindSchema,
  reason: z.string().nullable(),
  createdBy: PersonRefSchema.nullable(),
  createdAt: z.string(),
});
export type IngredientVersion = z.infer<typeof IngredientVersionSchema>;

export const IngredientDetailSchema = IngredientSchema.extend({
  versions: z.array(IngredientVersionSchema),
  labelFiles: z.array(LabelFileSchema),
  lots: z.array(SupplierLotSchema),
});
export type IngredientDetail = z.infer<typeof IngredientDetailSchema>;

const flag = z.enum(['true', 'false']).transform((v) => v === 'true');

export const ListIngredientsQuerySchema = z.object({
  q: z.string().trim().max(100, 'Keep the search under 100 characters').optional(),
  allergen: AllergenSourceSchema.optional(),
  status: z.enum(['unverified', 'recheck', 'tcs']).optional(),
  includeArchived: flag.optional(),
});
export type ListIngredientsQuery = z.infer<typeof ListIngredientsQuerySchema>;
/** The query string as the client sends it. */
export type ListIngredientsParams = z.input<typeof ListIngredientsQuerySchema>;

export const IngredientListSchema = z.object({ items: z.array(IngredientSchema) });
export type IngredientList = z.infer<typeof IngredientListSchema>;

export const SupplierLotListSchema = z.object({ items: z.array(SupplierLotSchema) });
export const LabelFileListSchema = z.object({ items: z.array(LabelFileSchema), limit: z.number() });
export const IngredientVersionListSchema = z.object({ items: z.array(IngredientVersionSchema) });

/** CSV import: the text of the file (or send the file as multipart field "file"). */
export const ImportCsvInputSchema = z.object({
  csv: z.string('Paste the CSV text or choose a file').min(1, 'The CSV is empty').max(1_000_000, 'Keep the CSV under 1 MB'),
});
export type ImportCsvInput = z.infer<typeof ImportCsvInputSchema>;

export const ImportRowErrorSchema = z.object({ rowNumber: z.number(), field: z.string(), message: z.string() });
export type ImportRowError = z.infer<typeof ImportRowErrorSchema>;

export const ImportPreviewRowSchema = z.object({
  /** Line number in the spreadsheet (the header is row 1). */
  rowNumber: z.number(),
  /** The parsed ingredient, or null when the row has errors. */
  ingredient: CreateIngredientInputSchema.nullable(),
  errors: z.array(ImportRowErrorSchema),
});
export type ImportPreviewRow = z.infer<typeof ImportPreviewRowSchema>;

export const ImportPreviewSchema = z.object({
  rows: z.array(ImportPreviewRowSchema),
  validCount: z.number(),
  errorCount: z.number(),
  /** A problem with the whole file (no header, unknown columns): nothing can be imported. */
  fileErrors: z.array(z.string()),
});
export type ImportPreview = z.infer<typeof ImportPreviewSchema>;

export const ImportResultSchema = z.object({
  created: z.array(z.object({ rowNumber: z.number(), id: z.string(), labelName: z.string() })),
  skipped: z.array(ImportPreviewRowSchema),
});
export type ImportResult = z.infer<typeof ImportResultSchema>;
