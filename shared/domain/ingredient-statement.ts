import {
  derivedTerms, kindTerms, normaliseName, regimeMatch, sourceWord, termsFor, termsRegex,
  type AllergenDecl, type AllergenRegime, type RegimeMatch,
} from './allergens';
import { Dec, type FlatLeaf } from './recipe-flatten';

/** Thresholds 21 CFR 101.4(a)(2) allows for the "Contains 2% or less of" phrase. */
export const LESS_THAN_THRESHOLDS = [2, 1.5, 1, 0.5] as const;
export type LessThanThreshold = (typeof LESS_THAN_THRESHOLDS)[number];

/** A run of statement text; `isAllergen` marks an allergen name to emphasise (EU 1169/2011 Art. 21(1)(b)). */
export interface StatementSegment {
  text: string;
  isAllergen: boolean;
}

/** One line of the statement after identical ingredients were merged. */
export interface StatementEntry {
  labelName: string;
  subIngredients: string[];
  /** As-added grams, exact decimal string. */
  grams: string;
  /** Share of the total as-added weight, 0–100. */
  percent: number;
  ingredientIds: string[];
  allergens: AllergenDecl[];
  /** The declarations the regime treats as allergens, mapped onto its list. */
  matches: RegimeMatch[];
  isAfterThresholdPhrase: boolean;
}

export interface IngredientStatement {
  /** Full plain text, heading included: "Ingredients: Sugar, Wheat flour (…), …". */
  text: string;
  segments: StatementSegment[];
  entries: StatementEntry[];
  threshold: LessThanThreshold | null;
}

export interface IngredientStatementOptions {
  regime: AllergenRegime;
  /** Use the 21 CFR 101.4(a)(2) phrase for ingredients at or below this share. */
  lessThanThreshold?: LessThanThreshold | null;
  /** Product-level result of the EU sulphite test (> 10 mg/kg), from `productSulphitesMgPerKg`. */
  isSulphiteAboveThreshold?: boolean;
}

const clean = (s: string) => s.normalize('NFC').trim().replace(/\s+/g, ' ');
const cmp = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);
const KIND_NAMED = new Set(['tree_nut', 'fish', 'crustacean_shellfish']);
const declKey = (d: AllergenDecl) => `${d.source}\u0000${normaliseName(d.kind ?? '')}`;

interface Group {
  key: string;
  sortName: string;
  labelName: string;
  subIngredients: string[];
  grams: Dec;
  ingredientIds: string[];
  allergens: Map<string, AllergenDecl>;
}

/**
 * Merges identical ingredients (same normalised label name and same sub-ingredients) and sorts by
 * descending as-added weight (21 CFR 101.4(a)(1); EU 1169/2011 Art. 18(1)). Equal weights sort by
 * normalised label name, then sub-ingredients, by code point, so the order never depends on input order or
 * on the runtime's locale data. The displayed spelling of a merged name is the code-point-smallest one.
 */
export function mergeAndSort(leaves: readonly FlatLeaf[]): Group[] {
  const groups = new Map<string, Group>();
  for (const { ingredient, grams } of leaves) {
    const labelName = clean(ingredient.labelName);
    const subIngredients = ingredient.subIngredients.map(clean).filter(Boolean);
    const sortName = normaliseName(labelName);
    const key = `${sortName}\u0000${subIngredients.map(normaliseName).join('\u0001')}`;
    let g = groups.get(key);
    if (!g) {
      g = { key, sortName, labelName, subIngredients, grams: new Dec(0), ingredientIds: [], allergens: new Map() };
      groups.set(key, g);
    } else if (cmp(labelName, g.labelName) < 0 || (labelName === g.labelName && cmp(subIngredients.join('\u0001'), g.subIngredients.join('\u0001')) < 0)) {
      g.labelName = labelName;
      g.subIngredients = subIngredients;
    }
    g.grams = g.grams.plus(grams);
    g.ingredientIds.push(ingredient.id);
    for (const a of ingredient.allergens) g.allergens.set(declKey(a), a);
  }
  const out = [...groups.values()];
  for (const g of out) g.ingredientIds.sort(cmp);
  return out.sort((a, b) => b.grams.cmp(a.grams) || cmp(a.sortName, b.sortName) || cmp(a.key, b.key));
}

/** Splits `text` into plain and emphasised runs where `re` matches. */
function emphasise(text: string, re: RegExp | null): StatementSegment[] {
  if (!re) return [{ text, isAllergen: false }];
  const out: StatementSegment[] = [];
  let last = 0;
  re.lastIndex = 0;
  for (let m = re.exec(text); m; m = re.exec(text)) {
    if (m.index > last) out.push({ text: text.slice(last, m.index), isAllergen: false });
    out.push({ text: m[0], isAllergen: true });
    last = m.index + m[0].length;
  }
  if (last < text.length) out.push({ text: text.slice(last), isAllergen: false });
  return out;
}

/**
 * Builds the ingredient statement: merged, by descending as-added weight, compound ingredients followed by
 * their own ingredients in parentheses (21 CFR 101.4(b)(2)). Allergen names are flagged for emphasis; an
 * ingredient whose own text does not name its allergen gets the source in parentheses, e.g. "whey (milk)"
 * (21 U.S.C. 343(w)(1)(A); EU Art. 21(1)(a) "clear reference"). With a threshold, the ingredients at or below
 * it (never one above it) follow "Contains 2% or less of" (21 CFR 101.4(a)(2)).
 */
export function buildIngredientStatement(leaves: readonly FlatLeaf[], options: IngredientStatementOptions): IngredientStatement {
  const { regime } = options;
  const threshold = options.lessThanThreshold ?? null;
  if (threshold !== null && !LESS_THAN_THRESHOLDS.includes(threshold)) {
    throw new Error(`The threshold must be one of ${LESS_THAN_THRESHOLDS.join(', ')} percent (21 CFR 101.4(a)(2)).`);
  }
  const groups = mergeAndSort(leaves);
  const total = groups.reduce((s, g) => s.plus(g.grams), new Dec(0));
  const limit = threshold === null ? null : total.times(threshold);
  let tailFrom = groups.length;
  if (limit) while (tailFrom > 0 && groups[tailFrom - 1].grams.times(100).lte(limit)) tailFrom--;

  const segments: StatementSegment[] = [];
  const push = (s: StatementSegment) => {
    if (!s.text) return;
    const prev = segments[segments.length - 1];
    if (prev && prev.isAllergen === s.isAllergen) prev.text += s.text;
    else segments.push({ ...s });
  };
  if (groups.length) push({ text: 'Ingredients: ', isAllergen: false });

  const entries: StatementEntry[] = groups.map((g, i) => {
    const allergens = [...g.allergens.values()].sort((a, b) => cmp(declKey(a), declKey(b)));
    const pairs = allergens
      .map((d) => ({ d, m: regimeMatch(d, regime, options.isSulphiteAboveThreshold) }))
      .filter((p): p is { d: AllergenDecl; m: RegimeMatch } => p.m !== null);
    // US names the kind of nut, fish and shellfish (343(w)(2)); elsewhere the source word is enough.
    const named = pairs.map((p) => ({ ...p, t: regime.code === 'US' && KIND_NAMED.has(p.d.source) ? kindTerms(p.d) : termsFor(p.d) }));
    const terms = named.flatMap((p) => p.t);
    const re = terms.length ? termsRegex(terms) : null;
    const own = [g.labelName, ...g.subIngredients].join('\n');
    const unnamed = named.filter(({ t }) => t.length === 0 || !termsRegex(t).test(own));

    // Each unnamed source goes after the first part of the ingredient that carries it (e.g. "whey (milk)"),
    // else after the ingredient's name.
    const pieces = [g.labelName, ...g.subIngredients];
    const after = new Map<number, string[]>();
    for (const u of unnamed) {
      const derived = derivedTerms(u.d);
      const at = derived.length ? pieces.findIndex((p) => termsRegex(derived).test(p)) : -1;
      const word = sourceWord(u.m, regime);
      const list = after.get(Math.max(at, 0)) ?? [];
      if (!list.includes(word)) list.push(word);
      after.set(Math.max(at, 0), list);
    }
    const piece = (text: string, index: number) => {
      emphasise(text, re).forEach(push);
      const words = after.get(index);
      if (!words) return;
      push({ text: ' (', isAllergen: false });
      words.forEach((w, j) => {
        if (j) push({ text: ', ', isAllergen: false });
        push({ text: w, isAllergen: true });
      });
      push({ text: ')', isAllergen: false });
    };

    if (i > 0) push({ text: ', ', isAllergen: false });
    if (i === tailFrom) push({ text: `Contains ${threshold}% or less of `, isAllergen: false });
    piece(g.labelName, 0);
    if (g.subIngredients.length) {
      push({ text: ' (', isAllergen: false });
      g.subIngredients.forEach((s, j) => {
        if (j) push({ text: ', ', isAllergen: false });
        piece(s, j + 1);
      });
      push({ text: ')', isAllergen: false });
    }
    return {
      labelName: g.labelName,
      subIngredients: g.subIngredients,
      grams: g.grams.toDecimalPlaces(6).toFixed(),
      percent: total.isZero() ? 0 : g.grams.div(total).times(100).toNumber(),
      ingredientIds: g.ingredientIds,
      allergens,
      matches: pairs.map((p) => p.m),
      isAfterThresholdPhrase: i >= tailFrom,
    };
  });
  return { text: segments.map((s) => s.text).join(''), segments, entries, threshold };
}
