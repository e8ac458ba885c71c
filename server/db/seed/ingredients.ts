import { eq } from 'drizzle-orm';
import type { SeedContext, SeedStep } from './demo';
import { businesses } from '../schema/business';
import { localDiskStorage } from '../../lib/storage';
import { checkUploadedFile } from '../../lib/uploads';
import { createIngredient, updateIngredient, verifyIngredient } from '../../features/ingredients/ingredients.service';
import { addLabelFile } from '../../features/ingredients/label-files.service';
import { createSupplierLot, recordLabelCheck } from '../../features/ingredients/supplier-lots.service';
import { addCalendarDays } from '../../../shared/domain/calendar-date';
import { businessLocalDate, localDateTimeToInstants } from '../../../shared/domain/zoned-time';
import type { CreateIngredientFormValues } from '../../../shared/contracts/ingredients';
import { CreateIngredientInputSchema } from '../../../shared/contracts/ingredients';
import { drawLabelPng, drawSpecSheetPdf } from './label-images';

/** ctx.shared key: demo ingredient ids by short key ('flour', 'sugar', 'butter', …). */
export const SEED_INGREDIENTS_KEY = 'ingredients';

interface ShelfItem {
  key: string;
  input: CreateIngredientFormValues;
  /** Days ago each lot arrived (newest last); the last one is left without a label re-check when `recheckPending`. */
  lots: number[];
  verifiedBy?: 'owner' | 'baker';
  photo?: 'png' | 'pdf';
  recheckPending?: boolean;
}

// Invented suppliers in invented Millbrook. Declarations are typical of US retail packages (common practice).
const SHELF: ShelfItem[] = [
  { key: 'flour', lots: [52, 24], verifiedBy: 'owner', photo: 'png', input: { labelName: 'All-purpose flour, enriched, bleached', subIngredients: ['wheat flour', 'niacin', 'reduced iron', 'thiamine mononitrate', 'riboflavin', 'folic acid'], allergens: [{ source: 'wheat' }], allergensConfirmed: true, supplierName: 'Millbrook Mill & Grain', supplierItemCode: 'AP-25LB' } },
  { key: 'sugar', lots: [50, 18], verifiedBy: 'owner', input: { labelName: 'Granulated sugar', supplierName: 'Millbrook Mill & Grain', supplierItemCode: 'GS-25LB', allergensConfirmed: true } },
  { key: 'butter', lots: [40, 12, 3], verifiedBy: 'baker', photo: 'png', input: { labelName: 'Unsalted butter', subIngredients: ['cream'], allergens: [{ source: 'milk' }], allergensConfirmed: true, supplierName: 'Hollow Creek Dairy', supplierItemCode: 'UB-1LB' } },
  { key: 'eggs', lots: [20, 6], verifiedBy: 'baker', input: { labelName: 'Large eggs, grade A', allergens: [{ source: 'egg' }], allergensConfirmed: true, supplierName: 'Hollow Creek Dairy', supplierItemCode: 'EGG-LG-30' } },
  { key: 'vanilla', lots: [45], verifiedBy: 'owner', input: { labelName: 'Pure vanilla extract', subIngredients: ['vanilla bean extractives in water', 'alcohol (35%)'], allergensConfirmed: true, supplierName: 'Cedar Row Baking Supply', supplierItemCode: 'VX-16' } },
  { key: 'coating', lots: [38, 9], verifiedBy: 'baker', photo: 'pdf', input: { labelName: 'White candy coating', subIngredients: ['sugar', 'palm kernel oil', 'whey powder', 'nonfat milk', 'soy lecithin', 'vanilla'], allergens: [{ source: 'milk' }, { source: 'soy' }], allergensConfirmed: true, supplierName: 'Cedar Row Baking Supply', supplierItemCode: 'WCW-5LB' } },
  { key: 'sprinkles', lots: [33, 2], verifiedBy: 'owner', photo: 'png', recheckPending: true, input: { labelName: 'Rainbow sprinkles', subIngredients: ['sugar', 'corn starch', 'palm oil', 'confectioner\'s glaze', 'carnauba wax', 'colours (red 40, yellow 5, yellow 6, blue 1)', 'soy lecithin'], allergens: [{ source: 'soy' }], allergensConfirmed: true, supplierName: 'Cedar Row Baking Supply', supplierItemCode: 'RS-2LB' } },
  { key: 'almondFlour', lots: [28], verifiedBy: 'owner', photo: 'png', input: { labelName: 'Blanched almond flour', subIngredients: ['blanched almonds'], allergens: [{ source: 'tree_nut', kind: 'almond' }], allergensConfirmed: true, supplierName: 'Cedar Row Baking Supply', supplierItemCode: 'ALF-3LB' } },
  // A TCS ingredient, shown with the caution: most cottage-food rules do not allow it (e.g. Tex. Health & Safety Code 437.001(2-b); value from memory).
  { key: 'creamCheese', lots: [14], verifiedBy: 'baker', input: { labelName: 'Cream cheese', subIngredients: ['pasteurized milk and cream', 'salt', 'carob bean gum', 'cheese culture'], allergens: [{ source: 'milk' }], allergensConfirmed: true, needsTimeTemperatureControl: true, supplierName: 'Hollow Creek Dairy', supplierItemCode: 'CC-8OZ', notes: 'Kept for a test recipe only; not used in products sold under the cottage food rules.' } },
  { key: 'cocoa', lots: [47], verifiedBy: 'owner', input: { labelName: 'Unsweetened cocoa powder', subIngredients: ['cocoa processed with alkali'], allergensConfirmed: true, supplierName: 'Cedar Row Baking Supply', supplierItemCode: 'CP-1LB' } },
  { key: 'salt', lots: [58], verifiedBy: 'owner', input: { labelName: 'Fine sea salt', allergensConfirmed: true, supplierName: 'Millbrook Mill & Grain', supplierItemCode: 'SS-26OZ' } },
  { key: 'bakingPowder', lots: [44], verifiedBy: 'baker', input: { labelName: 'Double-acting baking powder', subIngredients: ['sodium acid pyrophosphate', 'sodium bicarbonate', 'corn starch', 'monocalcium phosphate'], allergensConfirmed: true, supplierName: 'Millbrook Mill & Grain', supplierItemCode: 'BP-10OZ' } },
  { key: 'gelColour', lots: [31], input: { labelName: 'Sky blue gel food colour', subIngredients: ['water', 'glycerin', 'corn syrup', 'modified corn starch', 'blue 1', 'sodium benzoate (preservative)'], allergensConfirmed: false, supplierName: 'Cedar Row Baking Supply', supplierItemCode: 'GEL-SKY' } },
  // Coconut was a tree nut on FDA's list before Edition 5 of the allergen guidance (Jan 2025), not after.
  { key: 'coconut', lots: [26], verifiedBy: 'owner', photo: 'png', input: { labelName: 'Sweetened shredded coconut', subIngredients: ['coconut', 'sugar', 'water', 'propylene glycol', 'salt', 'sodium metabisulfite (to preserve freshness)'], allergens: [{ source: 'tree_nut', kind: 'coconut' }, { source: 'sulphites' }], sulphitesMgPerKg: 35, allergensConfirmed: true, supplierName: 'Cedar Row Baking Supply', supplierItemCode: 'COC-14OZ' } },
];

export const ingredientsSeedStep: SeedStep = {
  name: 'ingredients',
  run: async (ctx: SeedContext) => {
    const { db, actors } = ctx;
    const storage = localDiskStorage(ctx.uploadDir);
    const [business] = await db.select().from(businesses).where(eq(businesses.id, ctx.businessId));
    const tz = business!.timeZone;
    const today = businessLocalDate(ctx.now, tz);
    const at = (daysAgo: number, hour: number) => {
      const t = localDateTimeToInstants(`${addCalendarDays(today, -daysAgo)}T${String(hour).padStart(2, '0')}:00`, tz)[0] ?? ctx.now;
      return t.getTime() > ctx.now.getTime() ? ctx.now : t;
    };
    const ids: Record<string, string> = {};
    for (const item of SHELF) {
      const first = Math.max(...item.lots) + 1;
      const created = await createIngredient(db, actors.owner, CreateIngredientInputSchema.parse(item.input), at(first, 10));
      ids[item.key] = created.id;
      if (item.photo) {
        const bytes = item.photo === 'png'
          ? drawLabelPng(item.input.labelName)
          : await drawSpecSheetPdf(item.input.labelName, [`Ingredients: ${(item.input.subIngredients ?? []).join(', ')}.`, 'Contains: Milk, Soy.', `Item ${item.input.supplierItemCode}`]);
        const name = item.photo === 'png' ? `${item.key}-label.png` : `${item.key}-spec-sheet.pdf`;
        const checked = await checkUploadedFile({ buffer: bytes, size: bytes.length, originalname: name } as Express.Multer.File, ['png', 'pdf']);
        await addLabelFile(db, storage, actors.owner, created.id, checked, at(first, 11));
      }
      if (item.verifiedBy) await verifyIngredient(db, actors[item.verifiedBy], created.id, {}, at(first, 12));
      for (const [i, daysAgo] of item.lots.entries()) {
        const lot = await createSupplierLot(db, actors.baker, created.id, {
          lotCode: `${item.input.supplierItemCode?.split('-')[0]}${String(2600 + daysAgo * 7 + i)}`,
          receivedOn: addCalendarDays(today, -daysAgo), bestBy: addCalendarDays(today, 180 - daysAgo), quantity: i === 0 ? '2 cases' : '1 case', notes: '',
        }, at(daysAgo, 15));
        const isLast = i === item.lots.length - 1;
        if (item.recheckPending && isLast) continue;
        const changed = isLast && item.key === 'coating';
        await recordLabelCheck(db, actors[i % 2 ? 'owner' : 'baker'], lot.id, changed
          ? { outcome: 'changed', notes: 'Ingredient list now has salt after soy lecithin.' }
          : { outcome: 'matches', notes: isLast && item.key === 'butter' ? 'Same panel; new carton design only.' : '' }, at(daysAgo, 16));
      }
    }
    // A supplier reformulation caught at a label re-check, then recorded as a new version with its reason.
    await updateIngredient(db, actors.owner, ids.coating!, {
      subIngredients: ['sugar', 'palm kernel oil', 'whey powder', 'nonfat milk', 'soy lecithin', 'salt', 'vanilla'],
      reason: 'New lot label adds salt after soy lecithin (checked against the package).',
    }, at(9, 17));
    await verifyIngredient(db, actors.baker, ids.coating!, { note: 'new formula' }, at(9, 18));
    ctx.shared.set(SEED_INGREDIENTS_KEY, ids);
  },
};
