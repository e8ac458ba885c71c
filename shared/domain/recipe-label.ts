import type { RuleProfile } from '../contracts/rule-profiles';
import { buildLabelText, type LabelText, type LabelTextOptions } from './label-text';
import type { IngredientDecl, Lookup, RecipeComponent, RecipeInput } from './recipe-flatten';
import { packageNetGrams } from './weight-units';

/** What a saved (or draft) recipe version holds that the label needs. Weights are gram strings. */
export interface RecipeVersionForLabel {
  recipeId: string;
  name: string;
  isSellable: boolean;
  components: RecipeComponent[];
  yieldGrams: string | null;
  pieceGrams: string | null;
  piecesPerPackage: number | null;
  ph: number | null;
  waterActivity: number | null;
  /** Food Code 1-201.10(B): Table A when heat-treated and packaged, Table B otherwise. */
  isHeatTreatedAndPackaged: boolean;
}

/** The flattening input for one version. */
export function recipeInputOf(v: Pick<RecipeVersionForLabel, 'recipeId' | 'name' | 'components' | 'yieldGrams'>): RecipeInput {
  return { id: v.recipeId, name: v.name, components: v.components, yieldGrams: v.yieldGrams };
}

/**
 * Label options for a version: net quantity per package = piece weight × pieces per package (with the count,
 * 21 CFR 101.105), and the finished product's pH/aw for the TCS assessment.
 */
export function labelOptionsForRecipe(v: RecipeVersionForLabel): LabelTextOptions {
  const grams = v.isSellable ? packageNetGrams(v.pieceGrams, v.piecesPerPackage) : null;
  return {
    netQuantity: grams ? { grams, count: v.piecesPerPackage } : null,
    tcs: { ph: v.ph, aw: v.waterActivity, isHeatTreated: v.isHeatTreatedAndPackaged, isPackaged: v.isHeatTreatedAndPackaged },
  };
}

/**
 * The label text of a recipe version under a rule profile: the one call both the server (save, preview) and
 * the browser's live preview make, so the two always agree. `recipes` holds the current version of every
 * other recipe (sub-recipes are used as they are now). An in-between recipe has no package, so the
 * missing-net-quantity caution is left out for it.
 */
export function labelTextForRecipe(
  v: RecipeVersionForLabel,
  recipes: Lookup<RecipeInput>,
  ingredients: Lookup<IngredientDecl>,
  profile: RuleProfile,
): LabelText {
  const self = recipeInputOf(v);
  const all = new Map(recipes);
  all.set(self.id, self);
  const text = buildLabelText({ recipe: self, recipes: all, ingredients, profile, options: labelOptionsForRecipe(v) });
  return v.isSellable ? text : { ...text, cautions: text.cautions.filter((c) => c.code !== 'net_quantity_missing') };
}

/** The printed parts of a label text, for comparing two of them. */
export interface LabelTextSummary {
  ingredientStatement: string;
  containsLine: string | null;
  allergens: string[];
  netQuantity: string | null;
  statements: string[];
}

/** Reduces a label text to what is printed (cautions and percentages left out). */
export function summariseLabelText(t: Pick<LabelText, 'ingredientStatement' | 'allergenStatement' | 'netQuantity' | 'statements'>): LabelTextSummary {
  return {
    ingredientStatement: t.ingredientStatement.text,
    containsLine: t.allergenStatement.containsLine,
    allergens: t.allergenStatement.allergens.map((a) => (a.kinds.length ? `${a.name} (${a.kinds.join(', ')})` : a.name)),
    netQuantity: t.netQuantity?.text ?? null,
    statements: t.statements.map((s) => s.text),
  };
}

export interface LabelTextChange {
  field: keyof LabelTextSummary;
  label: string;
  before: string;
  after: string;
  /** For lists (ingredient entries, allergens): what appeared and what went. */
  added: string[];
  removed: string[];
}

const FIELD_LABELS: Record<keyof LabelTextSummary, string> = {
  ingredientStatement: 'Ingredient statement',
  containsLine: 'Contains line',
  allergens: 'Allergens',
  netQuantity: 'Net quantity',
  statements: 'Required statements',
};

// Top-level entries of "Ingredients: A, B (x, y), C": split on commas outside parentheses.
function statementEntries(text: string): string[] {
  const body = text.replace(/^Ingredients:\s*/, '');
  const out: string[] = [];
  let depth = 0;
  let cur = '';
  for (const ch of body) {
    if (ch === '(') depth++;
    if (ch === ')') depth = Math.max(0, depth - 1);
    if (ch === ',' && depth === 0) {
      out.push(cur.trim());
      cur = '';
    } else cur += ch;
  }
  if (cur.trim()) out.push(cur.trim());
  return out;
}

/**
 * What changed between two label texts (e.g. version 1 and version 2 of a recipe), field by field, with the
 * ingredient entries and allergens that appeared or went. Empty when the printed text is the same.
 */
export function diffLabelText(before: LabelTextSummary, after: LabelTextSummary): LabelTextChange[] {
  const changes: LabelTextChange[] = [];
  for (const field of Object.keys(FIELD_LABELS) as (keyof LabelTextSummary)[]) {
    const b = before[field];
    const a = after[field];
    const asList = (v: LabelTextSummary[keyof LabelTextSummary]) =>
      Array.isArray(v) ? v : field === 'ingredientStatement' && typeof v === 'string' ? statementEntries(v) : v ? [v] : [];
    const bl = asList(b);
    const al = asList(a);
    const text = (v: LabelTextSummary[keyof LabelTextSummary], l: string[]) =>
      typeof v === 'string' ? v : v === null ? '' : l.join(field === 'statements' ? ' / ' : ', ');
    const bt = text(b, bl);
    const at = text(a, al);
    if (bt === at) continue;
    changes.push({
      field,
      label: FIELD_LABELS[field],
      before: bt,
      after: at,
      added: al.filter((x) => !bl.includes(x)),
      removed: bl.filter((x) => !al.includes(x)),
    });
  }
  return changes;
}

/** Whether the printed label text differs from a saved snapshot (e.g. an ingredient was edited since). */
export function hasLabelTextChanged(saved: LabelTextSummary, current: LabelTextSummary): boolean {
  return diffLabelText(saved, current).length > 0;
}
