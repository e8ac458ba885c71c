import { z } from 'zod';
import { HOLDING_POLICIES } from '../domain/holding-policies';
import type { LabelText } from '../domain/label-text';
import type { IngredientDecl } from '../domain/recipe-flatten';
import type { LabelTextChange, LabelTextSummary, RecipeVersionForLabel } from '../domain/recipe-label';
import { DECIMAL_TEXT, WEIGHT_UNITS } from '../domain/weight-units';

const UuidSchema = z.string().uuid('That id is not valid');

export const WeightUnitSchema = z.enum(WEIGHT_UNITS, 'Choose g, kg, oz or lb');
export const AmountSchema = z
  .string('Enter a weight')
  .trim()
  .regex(DECIMAL_TEXT, 'Enter a weight such as 250 or 8.5 (up to 6 decimal places)');

/** A weight as typed: amount and unit. Stored as exact grams. */
export const WeightInputSchema = z.object({
  amount: AmountSchema.refine((a) => Number(a) > 0, 'Use a weight above zero'),
  unit: WeightUnitSchema,
});
export type WeightInput = z.infer<typeof WeightInputSchema>;

export const ComponentInputSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('ingredient'), ingredientId: UuidSchema, amount: WeightInputSchema.shape.amount, unit: WeightUnitSchema }),
  z.object({ kind: z.literal('recipe'), recipeId: UuidSchema, amount: WeightInputSchema.shape.amount, unit: WeightUnitSchema }),
]);
export type ComponentInput = z.infer<typeof ComponentInputSchema>;

/** Holding-policy override for this recipe (null: the rule profile's policy). 'custom' needs minutes, set per batch. */
export const RECIPE_HOLDING_POLICIES = HOLDING_POLICIES.filter((p) => p !== 'custom') as ['none', 'tphc_4h', 'tphc_6h', 'cooling'];
export const RecipeHoldingPolicySchema = z.enum(RECIPE_HOLDING_POLICIES);

const optionalInt = (min: number, max: number, what: string) =>
  z.number(`Enter ${what} as a whole number`).int(`Enter ${what} as a whole number`).min(min, `Use ${min} or more`).max(max, `Use ${max} or less`).nullable();

/** What the recipe editor sends: a whole version. */
export const RecipeVersionInputSchema = z
  .object({
    name: z.string('Enter a name').trim().min(1, 'Enter a name').max(120, 'Keep the name under 120 characters'),
    isSellable: z.boolean(),
    components: z.array(ComponentInputSchema).min(1, 'Add at least one ingredient or recipe').max(200, 'Use at most 200 components'),
    /** Weight of the finished batch (after baking); null = the sum of the components. */
    yieldWeight: WeightInputSchema.nullable().default(null),
    yieldPieces: optionalInt(1, 100000, 'the number of pieces').default(null),
    pieceWeight: WeightInputSchema.nullable().default(null),
    piecesPerPackage: optionalInt(1, 10000, 'pieces per package').default(null),
    shelfLifeDays: optionalInt(0, 3650, 'the shelf life in days').default(null),
    ph: z.number('Enter the pH as a number').min(0, 'pH runs from 0 to 14').max(14, 'pH runs from 0 to 14').nullable().default(null),
    waterActivity: z.number('Enter the water activity as a number').min(0, 'Water activity runs from 0 to 1').max(1, 'Water activity runs from 0 to 1').nullable().default(null),
    /** Food Code 1-201.10(B): heat-treated and then packaged → Table A; otherwise Table B. */
    isHeatTreatedAndPackaged: z.boolean().default(true),
    holdingPolicy: RecipeHoldingPolicySchema.nullable().default(null),
    notes: z.string().trim().max(4000, 'Keep the notes under 4000 characters').default(''),
    /** Why this version was made; required for every version after the first. */
    reason: z.string().trim().max(500, 'Keep the reason under 500 characters').optional(),
  })
  .superRefine((v, ctx) => {
    if (v.piecesPerPackage !== null && v.pieceWeight === null) {
      ctx.addIssue({ code: 'custom', path: ['pieceWeight'], message: 'Enter the weight of one piece to work out the net quantity' });
    }
    if (v.isSellable && v.piecesPerPackage === null) {
      ctx.addIssue({ code: 'custom', path: ['piecesPerPackage'], message: 'Enter how many pieces go in one package' });
    }
  });
export type RecipeVersionInput = z.input<typeof RecipeVersionInputSchema>;
export type ParsedRecipeVersionInput = z.output<typeof RecipeVersionInputSchema>;

/** POST /api/recipes: the first version. */
export const CreateRecipeInputSchema = RecipeVersionInputSchema;

/** POST /api/recipes/:id/versions: a new version; basedOnVersion guards against two editors at once. */
export const SaveRecipeVersionInputSchema = z.intersection(
  RecipeVersionInputSchema,
  z.object({
    reason: z.string('Say why you are changing the recipe').trim().min(1, 'Say why you are changing the recipe').max(500, 'Keep the reason under 500 characters'),
    basedOnVersion: z.number().int().positive(),
  }),
);
export type SaveRecipeVersionInput = z.input<typeof SaveRecipeVersionInputSchema>;

/** POST /api/recipes/:id/archive */
export const ArchiveRecipeInputSchema = z.object({
  reason: z.string('Say why').trim().min(1, 'Say why the recipe is archived').max(500, 'Keep the reason under 500 characters'),
  isArchived: z.boolean().default(true),
});

export const RecipeParamsSchema = z.object({ id: UuidSchema });
export const RecipeVersionParamsSchema = z.object({ id: UuidSchema, version: z.coerce.number('Not a version number').int().positive() });
export const RecipeListQuerySchema = z.object({ includeArchived: z.enum(['true', 'false']).optional() });
export const LabelPreviewQuerySchema = z.object({
  profileId: z.string().trim().min(1).max(64).optional(),
  version: z.coerce.number().int().positive().optional(),
});
export const AllergenMatrixQuerySchema = z.object({ profileId: z.string().trim().min(1).max(64).optional() });

/** A component as stored, with the current name of what it points at. */
export interface RecipeComponentView {
  kind: 'ingredient' | 'recipe';
  ingredientId: string | null;
  recipeId: string | null;
  grams: string;
  /** What the baker typed (for editing in the same unit). */
  entered: WeightInput;
  name: string;
}

export interface RecipeVersion {
  id: string;
  recipeId: string;
  version: number;
  name: string;
  isSellable: boolean;
  components: RecipeComponentView[];
  yieldGrams: string | null;
  yieldPieces: number | null;
  pieceGrams: string | null;
  piecesPerPackage: number | null;
  /** piece weight × pieces per package, exact grams. */
  netGramsPerPackage: string | null;
  shelfLifeDays: number | null;
  ph: number | null;
  waterActivity: number | null;
  isHeatTreatedAndPackaged: boolean;
  holdingPolicy: z.infer<typeof RecipeHoldingPolicySchema> | null;
  notes: string;
  reason: string | null;
  isArchived: boolean;
  createdAt: string;
  createdBy: string | null;
  /** Label text stored when this version was saved, for the business's rule profile then. */
  labelSnapshot: LabelText | null;
  snapshotProfileId: string | null;
}

export interface RecipeSummary {
  id: string;
  name: string;
  isSellable: boolean;
  isArchived: boolean;
  version: number;
  updatedAt: string;
  /** Allergen names in the current label text, e.g. "Milk", "Tree nuts (Almond)". */
  allergens: string[];
  tcsResult: 'non_tcs' | 'needs_review' | 'unknown';
  /** Current computed label text differs from the latest version's snapshot. */
  isLabelChanged: boolean;
}

export interface RecipeVersionMeta {
  version: number;
  name: string;
  reason: string | null;
  isArchived: boolean;
  createdAt: string;
  createdBy: string | null;
  /** Printed label text saved with this version. */
  summary: LabelTextSummary | null;
  /** Changes from the previous version's saved label text. */
  changes: LabelTextChange[];
}

/** GET /api/recipes/:id */
export interface RecipeDetail {
  recipe: RecipeSummary;
  current: RecipeVersion;
  /** Computed now, with today's ingredients and sub-recipes, for the business's rule profile. */
  labelText: LabelText;
  profileId: string;
  /** What differs between the latest snapshot and the label text now. */
  labelChanges: LabelTextChange[];
  versions: RecipeVersionMeta[];
  /** Recipes whose current version uses this one. */
  usedBy: { id: string; name: string }[];
}

export interface RecipeList { recipes: RecipeSummary[] }
export interface RecipeVersionList { versions: RecipeVersionMeta[] }
export interface LabelPreview { profileId: string; version: number; labelText: LabelText }

/** GET /api/recipes/label-inputs: what the browser needs to compute label text itself. */
export interface LabelInputs {
  ingredients: (IngredientDecl & { isArchived: boolean })[];
  recipes: (RecipeVersionForLabel & { isArchived: boolean })[];
}

/** GET /api/allergen-matrix */
export interface AllergenMatrix {
  profileId: string;
  regime: { code: 'US' | 'EU' | 'UK'; ruleSetDate: string };
  allergens: { key: string; name: string }[];
  products: {
    recipeId: string;
    name: string;
    version: number;
    cells: { key: string; isPresent: boolean; kinds: string[] }[];
    containsLine: string | null;
    /** Something keeps the row from being trusted yet (unconfirmed allergens, missing kind, unverified ingredient). */
    warnings: string[];
  }[];
}
