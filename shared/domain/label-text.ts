import type { LabelElementKey, RuleProfile, RuleSource } from '../contracts/rule-profiles';
import {
  crossContactStatement, EU_SULPHITE_THRESHOLD_MG_PER_KG, normaliseName, regimeAllergenList, sourcesNamedIn, usContainsLine,
  type AllergenDecl, type AllergenRegime, type DeclaredAllergen,
} from './allergens';
import { buildIngredientStatement, type IngredientStatement, type LessThanThreshold } from './ingredient-statement';
import { buildNetQuantity, type NetQuantity } from './net-quantity';
import {
  Dec, flattenRecipe, RecipeFlattenError, type FlatLeaf, type Grams, type IngredientDecl, type Lookup, type RecipeInput,
} from './recipe-flatten';
import { assessTcs, type TcsAssessment, type TcsInput } from './tcs-assessment';

export type CautionSeverity = 'block' | 'warn' | 'info';

export interface LabelCaution {
  code: string;
  severity: CautionSeverity;
  message: string;
  ingredientId?: string;
}

export interface LabelTextOptions {
  netQuantity?: { grams?: Grams | null; millilitres?: Grams | null; count?: number | null; countUnit?: { singular: string; plural: string } | null } | null;
  lessThanThreshold?: LessThanThreshold | null;
  /** pH / water activity of the finished product, for the Food Code 1-201.10(B) assessment. */
  tcs?: TcsInput | null;
  /** Allergens the kitchen also handles, for the voluntary cross-contact statement. */
  crossContact?: AllergenDecl[] | null;
}

export interface LabelTextInput {
  recipe: RecipeInput;
  recipes: Lookup<RecipeInput>;
  ingredients: Lookup<IngredientDecl>;
  profile: RuleProfile;
  options?: LabelTextOptions;
}

export interface AllergenStatement {
  regime: AllergenRegime;
  /** US "Contains: Milk, Egg, Wheat" line; null for EU/UK (emphasis in the list instead) or when it cannot be complete. */
  containsLine: string | null;
  allergens: DeclaredAllergen[];
  /** EU/UK: allergen names must be emphasised inside the ingredient list (Art. 21(1)(b)). */
  isEmphasisRequired: boolean;
  crossContact: { text: string; isVoluntary: true } | null;
  /** Product SO2 in mg/kg from the ingredients that state it; null when none do. */
  sulphitesMgPerKg: number | null;
}

export interface LabelStatement {
  key: 'homeKitchenStatement' | 'safeHandlingStatement';
  text: string;
  minPoints: number | null;
  source: RuleSource;
}

export interface LabelLeaf {
  ingredientId: string;
  labelName: string;
  /** As-added grams in one batch, exact to 6 decimal places. */
  grams: string;
  percent: number;
}

export interface LabelText {
  profileId: string;
  ingredientStatement: IngredientStatement;
  allergenStatement: AllergenStatement;
  netQuantity: NetQuantity | null;
  tcs: TcsAssessment;
  /** True when the product is treated as needing time/temperature control (a TCS ingredient or an open assessment). */
  isTcsProduct: boolean;
  statements: LabelStatement[];
  /** The profile's required elements, plus the TCS ones when the product is TCS. */
  requiredElements: LabelElementKey[];
  cautions: LabelCaution[];
  leaves: LabelLeaf[];
}

/**
 * Product SO2 (mg/kg) by as-added weight from ingredients that state it, and whether any ingredient declares
 * sulphites without a figure. EU 1169/2011 Annex II point 12 counts only "more than 10 mg/kg".
 */
export function productSulphites(leaves: readonly FlatLeaf[]): { mgPerKg: number | null; isUnknownDeclared: boolean } {
  let total = new Dec(0);
  let so2 = new Dec(0);
  let isStated = false;
  let isUnknownDeclared = false;
  for (const { ingredient, grams } of leaves) {
    total = total.plus(grams);
    const v = ingredient.sulphitesMgPerKg;
    if (v != null && Number.isFinite(v)) {
      isStated = true;
      so2 = so2.plus(grams.times(v));
    } else if (ingredient.allergens.some((a) => a.source === 'sulphites')) {
      isUnknownDeclared = true;
    }
  }
  return { mgPerKg: isStated && !total.isZero() ? so2.div(total).toNumber() : null, isUnknownDeclared };
}

const cmp = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);

/**
 * Everything the label needs as text, from the recipe and the rule profile: ingredient statement, allergen
 * statement, net quantity, TCS assessment, statements the profile requires and cautions. Pure and
 * deterministic (no clock, no I/O); near-linear in the number of leaves, so the editor can call it live.
 * A recipe that cannot be flattened (loop, missing part) gives an empty statement and a 'block' caution.
 */
export function buildLabelText(input: LabelTextInput): LabelText {
  const { recipe, recipes, ingredients, profile } = input;
  const options = input.options ?? {};
  const regime: AllergenRegime = { code: profile.allergenRegime.value.regime, ruleSetDate: profile.allergenRegime.value.ruleSetDate };
  const isUs = regime.code === 'US';
  const cautions: LabelCaution[] = [];
  const allowsTcs = profile.allowsTcsFoods.value;

  let leaves: FlatLeaf[] = [];
  try {
    leaves = flattenRecipe(recipe, recipes, ingredients);
  } catch (err) {
    if (!(err instanceof RecipeFlattenError)) throw err;
    cautions.push({ code: err.code, severity: 'block', message: err.message });
  }
  if (leaves.length === 0 && cautions.length === 0) {
    cautions.push({ code: 'recipe_empty', severity: 'block', message: `${recipe.name} has no ingredients yet.` });
  }

  const sulphites = productSulphites(leaves);
  const isSulphiteAbove = sulphites.isUnknownDeclared || (sulphites.mgPerKg !== null && sulphites.mgPerKg > EU_SULPHITE_THRESHOLD_MG_PER_KG);
  const statement = buildIngredientStatement(leaves, {
    regime,
    lessThanThreshold: options.lessThanThreshold ?? null,
    isSulphiteAboveThreshold: isSulphiteAbove,
  });

  // Allergens of the food, in the regime's own order, from every merged entry.
  const byKey = new Map<string, { kinds: Set<string>; isKindMissing: boolean; ids: Set<string> }>();
  for (const e of statement.entries) {
    for (const m of e.matches) {
      let a = byKey.get(m.key);
      if (!a) byKey.set(m.key, (a = { kinds: new Set(), isKindMissing: false, ids: new Set() }));
      const needsKind = isUs ? ['tree_nuts', 'fish', 'crustacean_shellfish'].includes(m.key) : m.key === 'nuts' || m.key === 'cereals_gluten';
      if (m.kind && needsKind) a.kinds.add(m.kind);
      if (m.isKindMissing) a.isKindMissing = true;
      e.ingredientIds.forEach((id) => a.ids.add(id));
    }
  }
  const allergens: DeclaredAllergen[] = regimeAllergenList(regime)
    .filter((r) => byKey.has(r.key))
    .map((r) => {
      const a = byKey.get(r.key)!;
      return { key: r.key, name: r.name, kinds: [...a.kinds].sort(cmp), isKindMissing: a.isKindMissing, ids: a.ids };
    })
    .map(({ ids, ...a }) => ({ ...a, ingredientIds: [...ids].sort(cmp) }));

  for (const l of leaves) {
    const ing = l.ingredient;
    const name = ing.labelName.trim() || ing.id;
    const declared = new Set(ing.allergens.map((a) => a.source));
    if (ing.needsTimeTemperatureControl) {
      cautions.push({
        code: 'tcs_ingredient', severity: allowsTcs ? 'warn' : 'block', ingredientId: ing.id,
        message: allowsTcs
          ? `${name} needs time/temperature control. Keep the product under temperature control and label it as your rules require.`
          : `${name} needs time/temperature control, which these cottage-food rules do not allow. Check with your local health authority.`,
      });
    }
    if (!ing.isVerified) {
      cautions.push({ code: 'ingredient_unverified', severity: 'warn', ingredientId: ing.id, message: `${name} has not been checked against its package label yet.` });
    }
    if (!ing.allergensConfirmed) {
      cautions.push({ code: 'allergens_unconfirmed', severity: 'warn', ingredientId: ing.id, message: `The allergens of ${name} have not been confirmed. Check the package before you print.` });
    }
    for (const a of ing.allergens) {
      if (['tree_nut', 'fish', 'crustacean_shellfish'].includes(a.source) && !a.kind?.trim() && (isUs || a.source === 'tree_nut')) {
        const what = a.source === 'tree_nut' ? 'which tree nut' : a.source === 'fish' ? 'which fish species' : 'which shellfish species';
        cautions.push({ code: 'allergen_kind_missing', severity: 'block', ingredientId: ing.id, message: `Say ${what} ${name} contains: the law needs the specific kind (21 U.S.C. 343(w)(2)).` });
      }
    }
    const text = [ing.labelName, ...ing.subIngredients].join('\n');
    for (const s of sourcesNamedIn(text)) {
      if (!declared.has(s)) {
        cautions.push({
          code: 'allergen_word_undeclared', severity: 'warn', ingredientId: ing.id,
          message: `${name} mentions ${s.replace(/_/g, ' ')} but does not declare it as an allergen. Check the package (highly refined oils are exempt in the US).`,
        });
      }
    }
    if (/\bgluten\b/i.test(text) && !['wheat', 'rye', 'barley', 'oats'].some((c) => declared.has(c as AllergenDecl['source']))) {
      cautions.push({ code: 'gluten_source_unnamed', severity: 'warn', ingredientId: ing.id, message: `${name} mentions gluten: declare the cereal it comes from (for example wheat).` });
    }
  }
  for (const a of statement.entries.flatMap((e) => e.matches.filter((m) => m.isKindUnknown).map((m) => ({ e, m })))) {
    cautions.push({ code: 'allergen_kind_unknown', severity: 'warn', ingredientId: a.e.ingredientIds[0], message: `"${a.m.kind}" is not a kind we know; it is declared to be safe. Check the spelling.` });
  }
  if (!isUs && sulphites.isUnknownDeclared) {
    cautions.push({ code: 'sulphites_unknown', severity: 'warn', message: 'An ingredient declares sulphites without a figure, so sulphites are declared. Enter the mg/kg to check the 10 mg/kg limit.' });
  }

  const tcs: TcsAssessment = options.tcs
    ? assessTcs(options.tcs)
    : { result: 'unknown', table: 'B', reason: 'Enter the pH and water activity of the finished product to assess it.' };
  if (tcs.result === 'needs_review') {
    cautions.push({ code: 'tcs_needs_review', severity: allowsTcs ? 'warn' : 'block', message: `${tcs.reason} This is not a finding that the food is safe.` });
  } else if (tcs.result === 'unknown') {
    cautions.push({ code: 'tcs_unknown', severity: 'info', message: tcs.reason });
  }
  const isTcsProduct = leaves.some((l) => l.ingredient.needsTimeTemperatureControl) || tcs.result === 'needs_review';

  const containsLine = isUs ? usContainsLine(allergens) : null;
  const handled = options.crossContact ?? [];
  const allergenStatement: AllergenStatement = {
    regime,
    containsLine,
    allergens,
    isEmphasisRequired: !isUs,
    crossContact: handled.length ? crossContactStatement(handled, leaves.flatMap((l) => l.ingredient.allergens)) : null,
    sulphitesMgPerKg: sulphites.mgPerKg,
  };

  const nq = options.netQuantity;
  let netQuantity: NetQuantity | null = null;
  try {
    netQuantity = nq ? buildNetQuantity({ ...nq, units: profile.netQuantity.value.units, rounding: profile.netQuantity.value.rounding }) : null;
  } catch {
    cautions.push({ code: 'net_quantity_invalid', severity: 'block', message: 'The net quantity must be a number above zero.' });
  }

  const statements: LabelStatement[] = [];
  const home = profile.homeKitchenStatement.value;
  if (home) statements.push({ key: 'homeKitchenStatement', text: home.text, minPoints: home.minPoints, source: profile.homeKitchenStatement.source });
  const safe = profile.tcsStatement.value;
  if (safe && isTcsProduct) statements.push({ key: 'safeHandlingStatement', text: safe.text, minPoints: safe.minPoints, source: profile.tcsStatement.source });

  const requiredElements = [...new Set([
    ...profile.requiredLabelElements.map((e) => e.key),
    ...(isTcsProduct ? profile.tcsRequiredLabelElements.map((e) => e.key) : []),
  ])];
  if (requiredElements.includes('netQuantity') && !netQuantity && !cautions.some((c) => c.code === 'net_quantity_invalid')) {
    cautions.push({ code: 'net_quantity_missing', severity: 'block', message: 'Enter the net quantity of the package (weight, volume or count).' });
  }
  cautions.push({ code: 'local_rules', severity: 'info', message: profile.caution });

  const total = leaves.reduce((s, l) => s.plus(l.grams), new Dec(0));
  const labelLeaves: LabelLeaf[] = leaves
    .map((l) => ({ l, name: normaliseName(l.ingredient.labelName) }))
    .sort((a, b) => b.l.grams.cmp(a.l.grams) || cmp(a.name, b.name) || cmp(a.l.ingredient.id, b.l.ingredient.id))
    .map(({ l }) => ({
      ingredientId: l.ingredient.id,
      labelName: l.ingredient.labelName,
      grams: l.grams.toDecimalPlaces(6).toFixed(),
      percent: total.isZero() ? 0 : l.grams.div(total).times(100).toNumber(),
    }));

  return { profileId: profile.id, ingredientStatement: statement, allergenStatement, netQuantity, tcs, isTcsProduct, statements, requiredElements, cautions, leaves: labelLeaves };
}
