import { and, eq } from 'drizzle-orm';
import type { SeedContext, SeedStep } from './demo';
import { ingredientVersions } from '../schema/ingredients';
import { currentIngredientVersions } from '../../features/ingredients/ingredients.queries';
import { createIngredient, updateIngredient } from '../../features/ingredients/ingredients.service';
import { createRecipe, saveRecipeVersion } from '../../features/recipes/recipes.service';
import { copyRuleProfile, saveRuleProfileVersion } from '../../features/rule-profiles/rule-profiles.service';
import { CreateIngredientInputSchema, type CreateIngredientFormValues } from '../../../shared/contracts/ingredients';
import { RecipeVersionInputSchema, type RecipeVersionInput } from '../../../shared/contracts/recipes';

/** ctx.shared key: demo recipe ids by name, for later steps. */
export const SEED_RECIPES_KEY = 'recipes';

// Invented ingredients the recipes need. What the ingredients step made (same key, or same label name) is
// reused; anything missing is made here, so the recipes never depend on that step's exact list.
const NEEDED: Record<string, CreateIngredientFormValues & { aliases?: string[] }> = {
  flour: { labelName: 'Enriched cake flour', aliases: ['cake flour', 'all-purpose flour', 'wheat flour'], subIngredients: ['bleached wheat flour', 'niacin', 'reduced iron', 'thiamin mononitrate', 'riboflavin', 'folic acid'], allergens: [{ source: 'wheat' }], allergensConfirmed: true },
  sugar: { labelName: 'Granulated sugar', aliases: ['sugar', 'cane sugar'], allergensConfirmed: true },
  eggs: { labelName: 'Whole eggs', aliases: ['eggs', 'large eggs'], allergens: [{ source: 'egg' }], allergensConfirmed: true },
  butter: { labelName: 'Unsalted butter', aliases: ['butter'], subIngredients: ['cream'], allergens: [{ source: 'milk' }], allergensConfirmed: true },
  milk: { labelName: 'Whole milk', aliases: ['milk'], subIngredients: ['milk', 'vitamin D3'], allergens: [{ source: 'milk' }], allergensConfirmed: true },
  bakingPowder: { labelName: 'Baking powder', subIngredients: ['sodium acid pyrophosphate', 'sodium bicarbonate', 'corn starch', 'monocalcium phosphate'], allergensConfirmed: true },
  vanilla: { labelName: 'Pure vanilla extract', aliases: ['vanilla extract'], subIngredients: ['water', 'alcohol', 'vanilla bean extractives'], allergensConfirmed: true },
  powderedSugar: { labelName: 'Powdered sugar', aliases: ['confectioners sugar'], subIngredients: ['sugar', 'corn starch'], allergensConfirmed: true },
  coating: { labelName: 'White candy coating', aliases: ['white candy melts', 'white confectionery coating'], subIngredients: ['sugar', 'palm kernel oil', 'nonfat milk powder', 'soy lecithin', 'salt', 'vanillin'], allergens: [{ source: 'milk' }, { source: 'soy' }], allergensConfirmed: true },
  sprinkles: { labelName: 'Rainbow sprinkles', aliases: ['sprinkles'], subIngredients: ['sugar', 'corn starch', 'palm kernel oil', 'confectioner\u2019s glaze', 'carnauba wax', 'artificial colors (Red 40, Yellow 5, Blue 1)'], allergensConfirmed: true },
  almondFlour: { labelName: 'Blanched almond flour', aliases: ['almond flour'], subIngredients: ['blanched almonds'], allergens: [{ source: 'tree_nut', kind: 'almond' }], allergensConfirmed: true },
  coconut: { labelName: 'Sweetened shredded coconut', aliases: ['shredded coconut'], subIngredients: ['coconut', 'sugar', 'water', 'propylene glycol', 'salt', 'sodium metabisulfite'], allergens: [{ source: 'tree_nut', kind: 'coconut' }, { source: 'sulphites' }], allergensConfirmed: true },
  creamCheese: { labelName: 'Cream cheese', subIngredients: ['pasteurized milk and cream', 'salt', 'carob bean gum', 'cheese culture'], allergens: [{ source: 'milk' }], allergensConfirmed: true, needsTimeTemperatureControl: true },
};

const DAY = 86_400_000;

export const recipesSeedStep: SeedStep = {
  name: 'recipes',
  run: async (ctx: SeedContext) => {
    const { db, businessId, actors } = ctx;
    const daysAgo = (d: number) => new Date(ctx.now.getTime() - d * DAY);
    const existing = await currentIngredientVersions(db, businessId);
    const byName = new Map(existing.map((v) => [v.labelName.trim().toLowerCase(), v.ingredientId]));
    const fromStep = (ctx.shared.get('ingredients') ?? {}) as Record<string, string>;
    const ing: Record<string, string> = {};
    for (const [key, spec] of Object.entries(NEEDED)) {
      const { aliases = [], ...values } = spec;
      const found = fromStep[key] ?? [values.labelName, ...aliases].map((n) => byName.get(n.toLowerCase())).find(Boolean);
      ing[key] = found ?? (await createIngredient(db, actors.baker, CreateIngredientInputSchema.parse(values), daysAgo(45))).id;
    }

    const i = (key: string, amount: string, unit: 'g' | 'kg' | 'oz' | 'lb' = 'g') => ({ kind: 'ingredient' as const, ingredientId: ing[key]!, amount, unit });
    const r = (id: string, amount: string, unit: 'g' | 'kg' | 'oz' | 'lb' = 'g') => ({ kind: 'recipe' as const, recipeId: id, amount, unit });
    const parse = (v: RecipeVersionInput) => RecipeVersionInputSchema.parse(v);
    const ids: Record<string, string> = {};
    const make = async (v: RecipeVersionInput, who: 'owner' | 'baker', at: Date) => {
      const d = await createRecipe(db, actors[who], parse(v), at);
      ids[v.name] = d.recipe.id;
      return d.recipe.id;
    };

    const cakeBase = await make({
      name: 'Vanilla cake base', isSellable: false, notes: 'Two 9-inch rounds at 350 °F for 30 minutes; cool completely before crumbling.',
      components: [i('flour', '1', 'lb'), i('sugar', '12', 'oz'), i('eggs', '200'), i('butter', '8', 'oz'), i('milk', '240'), i('bakingPowder', '12'), i('vanilla', '8')],
      yieldWeight: { amount: '1350', unit: 'g' }, shelfLifeDays: 3,
    }, 'owner', daysAgo(40));
    const binder = await make({
      name: 'Buttercream binder', isSellable: false, notes: 'Beat until pale; use the same day.',
      components: [i('butter', '4', 'oz'), i('powderedSugar', '250'), i('vanilla', '4')],
    }, 'owner', daysAgo(40));

    const classic: RecipeVersionInput = {
      name: 'Classic vanilla cake pops', isSellable: true,
      components: [r(cakeBase, '450'), r(binder, '120'), i('coating', '300')],
      yieldPieces: 24, pieceWeight: { amount: '28', unit: 'g' }, piecesPerPackage: 6, shelfLifeDays: 7,
      // Measured by the invented lab report on file: pH 6.8, aw 0.83 → Food Code 1-201.10(B) Table A, not TCS.
      ph: 6.8, waterActivity: 0.83, isHeatTreatedAndPackaged: true,
      notes: 'Dip twice; sprinkle before the coating sets.',
    };
    const classicId = await make(classic, 'owner', daysAgo(38));
    await saveRecipeVersion(db, actors.baker, classicId, {
      ...parse({ ...classic, components: [r(cakeBase, '450'), r(binder, '120'), i('coating', '12', 'oz'), i('sprinkles', '15')] }),
      reason: 'Rainbow sprinkles on top; more coating (a 12 oz bag per batch) so they stick', basedOnVersion: 1,
    }, daysAgo(24));
    await saveRecipeVersion(db, actors.baker, classicId, {
      ...parse({ ...classic, components: [r(cakeBase, '450'), r(binder, '120'), i('coating', '12', 'oz'), i('sprinkles', '0.5', 'oz'), i('vanilla', '2')], shelfLifeDays: 10 }),
      reason: 'A drop of vanilla in the coating; shelf life 10 days after the keeping test', basedOnVersion: 2,
    }, daysAgo(12));

    await make({
      name: 'Almond birthday cake pops', isSellable: true,
      components: [r(cakeBase, '350'), i('almondFlour', '100'), r(binder, '110'), i('coating', '300'), i('sprinkles', '20')],
      yieldPieces: 24, pieceWeight: { amount: '1', unit: 'oz' }, piecesPerPackage: 6, shelfLifeDays: 7, ph: 6.7, waterActivity: 0.84,
    }, 'baker', daysAgo(30));
    await make({
      name: 'Coconut snowball pops', isSellable: true,
      notes: 'Coconut was on the FDA tree-nut list before January 2025; we still tell customers it contains coconut.',
      components: [r(cakeBase, '420'), r(binder, '100'), i('coating', '280'), i('coconut', '90')],
      yieldPieces: 20, pieceWeight: { amount: '30', unit: 'g' }, piecesPerPackage: 4, shelfLifeDays: 7, ph: 6.6, waterActivity: 0.82,
    }, 'baker', daysAgo(28));
    await make({
      name: 'Cream cheese frosted pops', isSellable: true,
      notes: 'Keep refrigerated. No pH or water-activity test yet: treat as needing time/temperature control.',
      components: [r(cakeBase, '450'), i('creamCheese', '8', 'oz'), i('powderedSugar', '150'), i('coating', '250')],
      yieldPieces: 24, pieceWeight: { amount: '32', unit: 'g' }, piecesPerPackage: 6, shelfLifeDays: 5, holdingPolicy: 'tphc_4h',
    }, 'baker', daysAgo(20));

    // The sprinkles supplier changed its recipe after the classic pops were saved: the recipe now says its
    // label text changed since version 3 until someone reviews it and saves a new version.
    const [sprinkles] = await db.select().from(ingredientVersions).where(and(eq(ingredientVersions.businessId, businessId), eq(ingredientVersions.ingredientId, ing.sprinkles!)));
    if (sprinkles && !sprinkles.subIngredients.includes('sunflower lecithin')) {
      await updateIngredient(db, actors.baker, ing.sprinkles!, { subIngredients: [...sprinkles.subIngredients, 'sunflower lecithin'], reason: 'New bag lists sunflower lecithin' }, daysAgo(3));
    }

    // The owner's working copy of the Texas profile, with the unverified sales cap replaced by what the
    // (invented) county office said, still marked unverified until it is in writing.
    const copy = await copyRuleProfile(db, actors.owner, { basedOnId: 'us-tx-2025-09', name: 'Texas 2025 — Juniper Lane working copy' }, daysAgo(15));
    await saveRuleProfileVersion(db, actors.owner, copy.profile.id, {
      profile: {
        ...copy.profile,
        salesCap: {
          value: { amount: 150000, currency: 'USD', year: 2026, period: 'calendar-year' },
          source: { citation: 'Phone call with Millbrook County Health Department (invented), awaiting written confirmation', verified: false, checkedOn: daysAgo(15).toISOString().slice(0, 10) },
        },
      },
      reason: 'County office quoted the enacted $150,000 cap', basedOnVersion: 1,
    }, daysAgo(14));

    ctx.shared.set(SEED_RECIPES_KEY, ids);
  },
};
