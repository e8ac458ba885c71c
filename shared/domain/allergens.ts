/**
 * Allergen regimes: US (21 U.S.C. 321(qq), FDA Q&A on Food Allergens Ed. 5, Jan 2025), EU (Reg. (EU)
 * No 1169/2011 Annex II) and UK (same 14 substances). Ingredients declare what they contain in one shared
 * vocabulary (`AllergenSource`); each regime maps that onto its own list.
 */

/** What an ingredient can contain, across all regimes. Gluten is not a source: name the cereal. */
export const ALLERGEN_SOURCES = [
  'milk', 'egg', 'fish', 'crustacean_shellfish', 'mollusc', 'tree_nut', 'peanut', 'wheat', 'rye', 'barley',
  'oats', 'soy', 'sesame', 'celery', 'mustard', 'lupin', 'sulphites',
] as const;
export type AllergenSource = (typeof ALLERGEN_SOURCES)[number];

/**
 * One allergen an ingredient declares. `kind` names the tree nut, fish species or crustacean species
 * (21 U.S.C. 343(w)(2) requires it for those three), or the wheat species / milk animal where known.
 */
export interface AllergenDecl {
  source: AllergenSource;
  kind?: string | null;
}

export type AllergenRegimeCode = 'US' | 'EU' | 'UK';

/** US majors in statutory order, 21 U.S.C. 321(qq)(1) as amended by the FASTER Act 2021. */
export const US_MAJOR_ALLERGENS = [
  { key: 'milk', name: 'Milk' },
  { key: 'egg', name: 'Egg' },
  { key: 'fish', name: 'Fish' },
  { key: 'crustacean_shellfish', name: 'Crustacean shellfish' },
  { key: 'tree_nuts', name: 'Tree nuts' },
  { key: 'wheat', name: 'Wheat' },
  { key: 'peanuts', name: 'Peanut' },
  { key: 'soybeans', name: 'Soy' },
  { key: 'sesame', name: 'Sesame' },
] as const;

/** Sesame is a major allergen for food introduced into interstate commerce on/after this date (Pub. L. 117-11). */
export const US_SESAME_FROM = '2023-01-01';
/** FDA Q&A on Food Allergens, Edition 5 (final guidance, 6 Jan 2025): the 12-nut list applies from here. */
export const US_TREE_NUT_LIST_2025_FROM = '2025-01-06';

/** EU Reg. 1169/2011 Annex II, in Annex order (points 1–14). */
export const EU_ANNEX_II_ALLERGENS = [
  { key: 'cereals_gluten', name: 'Cereals containing gluten' },
  { key: 'crustaceans', name: 'Crustaceans' },
  { key: 'eggs', name: 'Eggs' },
  { key: 'fish', name: 'Fish' },
  { key: 'peanuts', name: 'Peanuts' },
  { key: 'soybeans', name: 'Soybeans' },
  { key: 'milk', name: 'Milk' },
  { key: 'nuts', name: 'Nuts' },
  { key: 'celery', name: 'Celery' },
  { key: 'mustard', name: 'Mustard' },
  { key: 'sesame', name: 'Sesame seeds' },
  { key: 'sulphites', name: 'Sulphur dioxide and sulphites' },
  { key: 'lupin', name: 'Lupin' },
  { key: 'molluscs', name: 'Molluscs' },
] as const;
/** The UK retained the same 14 (Food Information Regulations 2014, SI 2014/1855). */
export const UK_ALLERGENS = EU_ANNEX_II_ALLERGENS;

/** Annex II point 12: only "at concentrations of more than 10 mg/kg or 10 mg/litre in terms of the total SO2". */
export const EU_SULPHITE_THRESHOLD_MG_PER_KG = 10;

export type RegimeAllergenKey =
  | (typeof US_MAJOR_ALLERGENS)[number]['key']
  | (typeof EU_ANNEX_II_ALLERGENS)[number]['key'];

interface NutInfo { us: string; eu?: string; aliases: string[] }

// Display names: FDA Ed. 5 Appendix I (US) and Annex II point 8 (EU). Aliases are common label spellings.
const NUTS: Record<string, NutInfo> = {
  almond: { us: 'Almond', eu: 'almonds', aliases: ['almond'] },
  black_walnut: { us: 'Black walnut', aliases: ['black walnut'] },
  brazil_nut: { us: 'Brazil nut', eu: 'Brazil nuts', aliases: ['brazil nut'] },
  california_walnut: { us: 'California walnut', aliases: ['california walnut'] },
  cashew: { us: 'Cashew', eu: 'cashews', aliases: ['cashew', 'cashew nut'] },
  hazelnut: { us: 'Hazelnut', eu: 'hazelnuts', aliases: ['hazelnut', 'filbert', 'hazel nut'] },
  heartnut: { us: 'Heartnut', aliases: ['heartnut', 'japanese walnut'] },
  macadamia: { us: 'Macadamia nut', eu: 'macadamia nuts', aliases: ['macadamia', 'macadamia nut', 'bush nut', 'queensland nut'] },
  pecan: { us: 'Pecan', eu: 'pecan nuts', aliases: ['pecan', 'pecan nut'] },
  pine_nut: { us: 'Pine nut', aliases: ['pine nut', 'pinon nut', 'piñon nut', 'pinon', 'piñon', 'pignoli'] },
  pistachio: { us: 'Pistachio', eu: 'pistachio nuts', aliases: ['pistachio', 'pistachio nut'] },
  walnut: { us: 'Walnut', eu: 'walnuts', aliases: ['walnut', 'english walnut', 'persian walnut'] },
  // Removed by FDA Ed. 5 (Jan 2025); on the earlier FDA list. Lichee nut: value from memory.
  coconut: { us: 'Coconut', aliases: ['coconut'] },
  beech_nut: { us: 'Beech nut', aliases: ['beech nut', 'beechnut'] },
  butternut: { us: 'Butternut', aliases: ['butternut'] },
  chestnut: { us: 'Chestnut', aliases: ['chestnut'] },
  chinquapin: { us: 'Chinquapin', aliases: ['chinquapin'] },
  kola_nut: { us: 'Kola nut', aliases: ['kola nut', 'cola nut'] },
  ginkgo_nut: { us: 'Ginkgo nut', aliases: ['ginkgo nut', 'ginkgo'] },
  hickory_nut: { us: 'Hickory nut', aliases: ['hickory nut', 'hickory'] },
  palm_nut: { us: 'Palm nut', aliases: ['palm nut'] },
  pili_nut: { us: 'Pili nut', aliases: ['pili nut'] },
  shea_nut: { us: 'Shea nut', aliases: ['shea nut', 'sheanut'] },
  lichee_nut: { us: 'Lichee nut', aliases: ['lichee nut', 'lychee nut'] },
};

/** FDA Q&A Ed. 5 (6 Jan 2025) Appendix I: the 12 tree nuts. */
export const US_TREE_NUTS_2025 = [
  'almond', 'black_walnut', 'brazil_nut', 'california_walnut', 'cashew', 'hazelnut', 'heartnut', 'macadamia',
  'pecan', 'pine_nut', 'pistachio', 'walnut',
] as const;
/** The earlier FDA list: the 12 plus those Ed. 5 removed (coconut, beech nut, …); lichee nut from memory. */
export const US_TREE_NUTS_PRE_2025 = [
  ...US_TREE_NUTS_2025, 'coconut', 'beech_nut', 'butternut', 'chestnut', 'chinquapin', 'kola_nut', 'ginkgo_nut',
  'hickory_nut', 'palm_nut', 'pili_nut', 'shea_nut', 'lichee_nut',
] as const;
/** Annex II point 8: the 8 nuts (no coconut, no pine nut). */
export const EU_NUTS = ['almond', 'hazelnut', 'walnut', 'cashew', 'pecan', 'brazil_nut', 'pistachio', 'macadamia'] as const;

const NUT_BY_ALIAS = new Map<string, string>();
for (const [key, info] of Object.entries(NUTS)) {
  NUT_BY_ALIAS.set(key.replace(/_/g, ' '), key);
  for (const a of info.aliases) NUT_BY_ALIAS.set(a, key);
}

/** Lower-case, trimmed, single-spaced, NFC: the form names are compared in. */
export function normaliseName(text: string): string {
  return text.normalize('NFC').trim().replace(/\s+/g, ' ').toLowerCase();
}

/** The tree-nut key for a kind as typed ("Almonds", "filbert"), or null when it is not one we know. */
export function treeNutKey(kind: string): string | null {
  const k = normaliseName(kind);
  return NUT_BY_ALIAS.get(k) ?? NUT_BY_ALIAS.get(k.replace(/e?s$/, '')) ?? NUT_BY_ALIAS.get(k.replace(/s$/, '')) ?? null;
}

/** Whether a kind is a US tree nut under the FDA list in force on `ruleSetDate` (ISO date). */
export function isTreeNut(kind: string, ruleSetDate: string): boolean {
  const key = treeNutKey(kind);
  if (!key) return false;
  const list: readonly string[] = ruleSetDate >= US_TREE_NUT_LIST_2025_FROM ? US_TREE_NUTS_2025 : US_TREE_NUTS_PRE_2025;
  return list.includes(key);
}

/** Whether a kind is one of the 8 Annex II nuts. */
export function isEuNut(kind: string): boolean {
  const key = treeNutKey(kind);
  return key !== null && (EU_NUTS as readonly string[]).includes(key);
}

/** US majors for a rule set dated `ruleSetDate`: 8 before sesame applied, 9 from 2023-01-01. */
export function usMajorAllergensFor(ruleSetDate: string) {
  return US_MAJOR_ALLERGENS.filter((a) => a.key !== 'sesame' || ruleSetDate >= US_SESAME_FROM);
}

export interface AllergenRegime {
  code: AllergenRegimeCode;
  /** ISO date of the rule set the lists are taken from. */
  ruleSetDate: string;
}

/** The outcome of mapping one declaration onto a regime. */
export interface RegimeMatch {
  key: RegimeAllergenKey;
  /** Display name of the specific kind (e.g. "Almond", "Salmon", "Spelt"), when the regime names kinds. */
  kind: string | null;
  /** True when the regime needs the kind named and the declaration does not give it. */
  isKindMissing: boolean;
  /** True when the kind is not on any list we know (declared anyway, to be safe). */
  isKindUnknown: boolean;
}

const capitalise = (s: string) => (s ? s[0].toUpperCase() + s.slice(1) : s);
const cleanKind = (k: string | null | undefined) => (k && k.trim() ? k.trim().replace(/\s+/g, ' ') : null);

/**
 * Maps one ingredient declaration onto a regime's list, or null when the regime does not treat it as an
 * allergen (e.g. celery in the US, coconut under the 2025 FDA list, pine nut in the EU). Sulphites are
 * decided at product level (concentration), so callers pass `isSulphiteAboveThreshold`.
 */
export function regimeMatch(decl: AllergenDecl, regime: AllergenRegime, isSulphiteAboveThreshold = false): RegimeMatch | null {
  const kind = cleanKind(decl.kind);
  const plain = (key: RegimeAllergenKey, k: string | null = null): RegimeMatch => ({ key, kind: k, isKindMissing: false, isKindUnknown: false });
  if (regime.code === 'US') {
    switch (decl.source) {
      case 'milk': return plain('milk');
      case 'egg': return plain('egg');
      case 'wheat': return plain('wheat');
      case 'peanut': return plain('peanuts');
      case 'soy': return plain('soybeans');
      case 'sesame': return regime.ruleSetDate >= US_SESAME_FROM ? plain('sesame') : null;
      case 'fish':
      case 'crustacean_shellfish': {
        const key = decl.source;
        return { key, kind: kind ? capitalise(kind) : null, isKindMissing: !kind, isKindUnknown: false };
      }
      case 'tree_nut': {
        if (!kind) return { key: 'tree_nuts', kind: null, isKindMissing: true, isKindUnknown: false };
        const nut = treeNutKey(kind);
        if (!nut) return { key: 'tree_nuts', kind: capitalise(kind), isKindMissing: false, isKindUnknown: true };
        return isTreeNut(kind, regime.ruleSetDate) ? plain('tree_nuts', NUTS[nut].us) : null;
      }
      default: return null;
    }
  }
  switch (decl.source) {
    case 'wheat': return plain('cereals_gluten', kind ? capitalise(kind) : 'Wheat');
    case 'rye': return plain('cereals_gluten', 'Rye');
    case 'barley': return plain('cereals_gluten', 'Barley');
    case 'oats': return plain('cereals_gluten', 'Oats');
    case 'crustacean_shellfish': return plain('crustaceans', kind ? capitalise(kind) : null);
    case 'egg': return plain('eggs');
    case 'fish': return plain('fish', kind ? capitalise(kind) : null);
    case 'peanut': return plain('peanuts');
    case 'soy': return plain('soybeans');
    case 'milk': return plain('milk');
    case 'celery': return plain('celery');
    case 'mustard': return plain('mustard');
    case 'sesame': return plain('sesame');
    case 'lupin': return plain('lupin');
    case 'mollusc': return plain('molluscs', kind ? capitalise(kind) : null);
    case 'sulphites': return isSulphiteAboveThreshold ? plain('sulphites') : null;
    case 'tree_nut': {
      // Annex II names the nut; "nuts" alone is not a clear reference (Art. 21(1)(a)).
      if (!kind) return { key: 'nuts', kind: null, isKindMissing: true, isKindUnknown: false };
      const nut = treeNutKey(kind);
      if (!nut) return { key: 'nuts', kind: capitalise(kind), isKindMissing: false, isKindUnknown: true };
      return isEuNut(kind) ? plain('nuts', capitalise(NUTS[nut].eu!)) : null;
    }
  }
}

/** The regime's list in its own order (statutory order for the US, Annex order for the EU/UK). */
export function regimeAllergenList(regime: AllergenRegime): ReadonlyArray<{ key: RegimeAllergenKey; name: string }> {
  return regime.code === 'US' ? usMajorAllergensFor(regime.ruleSetDate) : EU_ANNEX_II_ALLERGENS;
}

/** The word printed in parentheses after an ingredient that does not name its allergen itself, e.g. "whey (milk)". */
export function sourceWord(m: RegimeMatch, regime: AllergenRegime): string {
  if (m.kind) return m.kind.toLowerCase();
  const words: Partial<Record<RegimeAllergenKey, string>> = {
    milk: 'milk', egg: 'egg', eggs: 'egg', wheat: 'wheat', peanuts: 'peanut', soybeans: regime.code === 'UK' ? 'soya' : 'soy',
    sesame: 'sesame', fish: 'fish', crustaceans: 'crustaceans', molluscs: 'molluscs', celery: 'celery',
    mustard: 'mustard', lupin: 'lupin', sulphites: 'sulphites', tree_nuts: 'tree nuts', nuts: 'nuts',
    crustacean_shellfish: 'shellfish', cereals_gluten: 'wheat',
  };
  return words[m.key] ?? m.key;
}

// Words that, when present in an ingredient's own text, already name the source (21 U.S.C. 343(w)(1)(A)).
const SOURCE_TERMS: Record<AllergenSource, string[]> = {
  milk: ['milk'],
  egg: ['egg', 'eggs'],
  fish: ['fish'],
  crustacean_shellfish: ['crustacean', 'crustaceans', 'shellfish', 'shrimp', 'prawn', 'prawns', 'crab', 'lobster'],
  mollusc: ['mollusc', 'molluscs', 'mollusk', 'clam', 'oyster', 'scallop', 'squid', 'mussel', 'mussels'],
  tree_nut: [],
  peanut: ['peanut', 'peanuts', 'groundnut', 'groundnuts'],
  wheat: ['wheat'],
  rye: ['rye'],
  barley: ['barley'],
  oats: ['oat', 'oats'],
  soy: ['soy', 'soya', 'soybean', 'soybeans'],
  sesame: ['sesame'],
  celery: ['celery', 'celeriac'],
  mustard: ['mustard'],
  lupin: ['lupin', 'lupine'],
  sulphites: ['sulphite', 'sulphites', 'sulfite', 'sulfites', 'sulphur dioxide', 'sulfur dioxide', 'metabisulphite', 'metabisulfite'],
};

// Common derived ingredients, so the source can follow the part that carries it: "whey (milk)", "lecithin (soy)"
// (21 U.S.C. 343(w)(1)(A) examples). Common practice list, not exhaustive.
const DERIVED_TERMS: Partial<Record<AllergenSource, string[]>> = {
  milk: ['whey', 'butter', 'buttermilk', 'cream', 'cheese', 'lactose', 'casein', 'caseinate', 'ghee', 'yogurt', 'yoghurt', 'curd'],
  egg: ['albumen', 'albumin', 'meringue', 'mayonnaise', 'lysozyme'],
  wheat: ['flour', 'semolina', 'durum', 'spelt', 'farina', 'couscous', 'bulgur', 'seitan', 'khorasan', 'kamut', 'einkorn', 'emmer', 'triticale'],
  soy: ['lecithin', 'tofu', 'edamame', 'miso', 'tempeh'],
  sesame: ['tahini'],
};

/** Words for ingredients derived from a source (e.g. whey from milk), to place "(milk)" after them. */
export function derivedTerms(decl: AllergenDecl): string[] {
  return DERIVED_TERMS[decl.source] ?? [];
}

/** Words that name the specific kind of a declaration (a nut's aliases, a species), plural forms included. */
export function kindTerms(decl: AllergenDecl): string[] {
  return termsFor(decl, false);
}

/** Words that count as naming this declaration in an ingredient's text (plural forms included). */
export function termsFor(decl: AllergenDecl, includeSourceWords = true): string[] {
  const terms = new Set(includeSourceWords ? SOURCE_TERMS[decl.source] : []);
  const kind = cleanKind(decl.kind);
  if (kind) {
    const k = normaliseName(kind);
    terms.add(k);
    if (decl.source === 'tree_nut') {
      const nut = treeNutKey(kind);
      for (const a of nut ? NUTS[nut].aliases : []) terms.add(a);
    }
  }
  for (const t of [...terms]) if (!t.endsWith('s')) terms.add(t + 's');
  return [...terms];
}

const regexCache = new Map<string, RegExp>();
/** A case-insensitive whole-word regex for any of the terms (cached: the editor calls this on every keystroke). */
export function termsRegex(terms: readonly string[]): RegExp {
  const sorted = [...new Set(terms)].sort((a, b) => b.length - a.length || (a < b ? -1 : 1));
  const id = sorted.join('|');
  let re = regexCache.get(id);
  if (!re) {
    const body = sorted.map((t) => t.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')).join('|');
    re = new RegExp(`(?<![\\p{L}\\p{N}])(?:${body})(?![\\p{L}\\p{N}])`, 'giu');
    regexCache.set(id, re);
  }
  re.lastIndex = 0;
  return re;
}

let namedRegexes: Array<[AllergenSource, RegExp]> | null = null;

/** Every allergen word we know, for spotting an ingredient whose text names an allergen it does not declare. */
export function sourcesNamedIn(text: string): AllergenSource[] {
  namedRegexes ??= ALLERGEN_SOURCES.map((source) => {
    const terms = source === 'tree_nut' ? Object.values(NUTS).flatMap((n) => n.aliases) : termsFor({ source });
    return [source, new RegExp(termsRegex(terms).source, 'iu')] as [AllergenSource, RegExp];
  });
  return namedRegexes.filter(([, re]) => re.test(text)).map(([source]) => source);
}

/** One allergen of the finished food, as a regime lists it. */
export interface DeclaredAllergen {
  key: RegimeAllergenKey;
  name: string;
  /** Specific kinds in first-seen-sorted order (e.g. ["Almond", "Pecan"]); empty when the regime names none. */
  kinds: string[];
  /** True when a kind the law requires was not given (a "Contains" line cannot be written). */
  isKindMissing: boolean;
  ingredientIds: string[];
}

/**
 * The US "Contains" line, listing every major allergen of the food (FDA: a Contains statement must list all
 * of them, 21 U.S.C. 343(w)(1)(B)), with the kind of tree nut, fish and shellfish (343(w)(2)).
 * Format: "Contains: Milk, Egg, Almond, Wheat, Soy" in statutory order. Null when there is nothing to
 * declare or a required kind is missing (a partial or "tree nuts" line is never written).
 */
export function usContainsLine(allergens: readonly DeclaredAllergen[]): string | null {
  if (allergens.length === 0 || allergens.some((a) => a.isKindMissing)) return null;
  const names = allergens.flatMap((a) => (a.kinds.length ? a.kinds : [a.name]));
  return `Contains: ${names.join(', ')}`;
}

const CONTAINS_SYNONYMS: Partial<Record<RegimeAllergenKey, string[]>> = {
  milk: ['milk'],
  egg: ['egg', 'eggs'],
  wheat: ['wheat'],
  peanuts: ['peanut', 'peanuts'],
  soybeans: ['soy', 'soya', 'soybean', 'soybeans'],
  sesame: ['sesame'],
};

/**
 * Checks a (possibly hand-edited) US Contains line against the food's allergens. Returns the problems in plain
 * words; empty means it lists them all. Flags a missing allergen, "tree nuts"/"fish"/"shellfish" without the
 * kind (343(w)(2)) and "gluten" without "wheat" (gluten does not name the food source).
 */
export function checkContainsLine(line: string, allergens: readonly DeclaredAllergen[]): string[] {
  const problems: string[] = [];
  if (!/^\s*contains\b/i.test(line)) problems.push('The statement must start with the word "Contains".');
  const text = normaliseName(line.replace(/^\s*contains\s*:?/i, ''));
  const has = (terms: string[]) => termsRegex(terms.flatMap((t) => [t, t + 's'])).test(text);
  for (const a of allergens) {
    if (a.kinds.length) {
      for (const k of a.kinds) {
        const nut = a.key === 'tree_nuts' ? treeNutKey(k) : null;
        if (!has(nut ? NUTS[nut].aliases : [normaliseName(k)])) problems.push(`${k} is not named.`);
      }
    } else if (a.isKindMissing) {
      problems.push(`Name the specific kind of ${a.name.toLowerCase()}.`);
    } else if (!has(CONTAINS_SYNONYMS[a.key] ?? [normaliseName(a.name)])) {
      problems.push(`${a.name} is not named.`);
    }
  }
  const nutKinds = allergens.filter((a) => a.key === 'tree_nuts').flatMap((a) => a.kinds);
  const isEveryNutNamed = nutKinds.length > 0 && nutKinds.every((k) => has(NUTS[treeNutKey(k) ?? '']?.aliases ?? [normaliseName(k)]));
  if (/\btree nuts?\b/.test(text) && !isEveryNutNamed) {
    problems.push('"Tree nuts" alone is not enough: name each nut (for example "Almond").');
  }
  if (/\bgluten\b/.test(text) && !has(['wheat'])) problems.push('"Gluten" does not name the food source: say "Wheat".');
  return problems;
}

const EVERYDAY: Record<AllergenSource, string> = {
  milk: 'milk', egg: 'eggs', fish: 'fish', crustacean_shellfish: 'shellfish', mollusc: 'molluscs', tree_nut: 'tree nuts',
  peanut: 'peanuts', wheat: 'wheat', rye: 'rye', barley: 'barley', oats: 'oats', soy: 'soy', sesame: 'sesame',
  celery: 'celery', mustard: 'mustard', lupin: 'lupin', sulphites: 'sulphites',
};

/** Plain lower-case name for a declaration ("peanuts", "pecan", "tree nuts"), for customer-facing wording. */
export function everydayName(decl: AllergenDecl): string {
  const kind = cleanKind(decl.kind);
  return kind && decl.source !== 'wheat' && decl.source !== 'milk' ? kind.toLowerCase() : EVERYDAY[decl.source];
}

/**
 * Our own voluntary cross-contact wording (advisory statements are not required by federal law), e.g.
 * "Made in a home kitchen that also handles peanuts and sesame." Lists only what the food does not already
 * contain; null when nothing is left.
 */
export function crossContactStatement(handled: readonly AllergenDecl[], contained: readonly AllergenDecl[]): { text: string; isVoluntary: true } | null {
  const have = new Set(contained.map(everydayName));
  const rest = [...new Set(handled.map(everydayName))].filter((n) => !have.has(n));
  if (rest.length === 0) return null;
  const list = rest.length === 1 ? rest[0] : `${rest.slice(0, -1).join(', ')} and ${rest[rest.length - 1]}`;
  return { text: `Made in a home kitchen that also handles ${list}.`, isVoluntary: true };
}
