import { describe, expect, test } from 'vitest';
import {
  checkContainsLine, crossContactStatement, EU_ANNEX_II_ALLERGENS, EU_NUTS, EU_SULPHITE_THRESHOLD_MG_PER_KG, isEuNut, isTreeNut,
  regimeMatch, UK_ALLERGENS, US_MAJOR_ALLERGENS, US_TREE_NUTS_2025, usContainsLine, usMajorAllergensFor, type DeclaredAllergen,
} from '../../../../shared/domain/allergens';

const US_2025 = { code: 'US' as const, ruleSetDate: '2025-01-06' };
const EU = { code: 'EU' as const, ruleSetDate: '2011-10-25' };

describe('US major food allergens', () => {
  // 21 U.S.C. 321(qq)(1) as amended by the FASTER Act (Pub. L. 117-11): nine, in statutory order.
  test('the nine majors in statutory order', () => {
    expect(US_MAJOR_ALLERGENS.map((a) => a.key)).toEqual(['milk', 'egg', 'fish', 'crustacean_shellfish', 'tree_nuts', 'wheat', 'peanuts', 'soybeans', 'sesame']);
  });
  // Sesame applies to food introduced into interstate commerce on/after 1 Jan 2023 (FASTER Act).
  test.each([
    ['2022-12-31', 8, false],
    ['2023-01-01', 9, true],
    ['2025-01-06', 9, true],
  ])('a rule set dated %s has %i majors (sesame: %s)', (date, count, hasSesame) => {
    expect(usMajorAllergensFor(date)).toHaveLength(count);
    expect(regimeMatch({ source: 'sesame' }, { code: 'US', ruleSetDate: date }) !== null).toBe(hasSesame);
  });
  // FDA Q&A on Food Allergens Ed. 5 (6 Jan 2025) Appendix I: 12 tree nuts; coconut, chestnut, shea … removed.
  test('the 2025 FDA tree-nut list has 12 entries', () => expect(US_TREE_NUTS_2025).toHaveLength(12));
  test.each([
    ['coconut', '2025-01-06', false], ['coconut', '2024-12-31', true],
    ['shea nut', '2025-01-06', false], ['Chestnut', '2020-01-01', true],
    ['almonds', '2025-01-06', true], ['Filbert', '2025-01-06', true], ['pine nut', '2025-01-06', true],
    ['Macadamia nut', '2025-01-06', true], ['hickory nut', '2025-01-06', false], ['pumpkin seed', '2025-01-06', false],
  ])('isTreeNut(%j) under the rule set of %s is %s', (kind, date, expected) => {
    expect(isTreeNut(kind, date)).toBe(expected);
  });
  // Molluscs are not a US major allergen (21 U.S.C. 321(qq)); they are EU Annex II point 14.
  test.each([
    [{ source: 'mollusc' as const, kind: 'scallop' }, null, 'molluscs'],
    [{ source: 'celery' as const }, null, 'celery'],
    [{ source: 'oats' as const }, null, 'cereals_gluten'],
    [{ source: 'wheat' as const, kind: 'spelt' }, 'wheat', 'cereals_gluten'],
    [{ source: 'soy' as const }, 'soybeans', 'soybeans'],
  ])('%j maps to US %s and EU %s', (decl, us, eu) => {
    expect(regimeMatch(decl, US_2025)?.key ?? null).toBe(us);
    expect(regimeMatch(decl, EU)?.key ?? null).toBe(eu);
  });
  // 343(w)(2): tree nuts, fish and Crustacean shellfish need the specific kind.
  test.each([
    [{ source: 'tree_nut' as const }, true],
    [{ source: 'fish' as const }, true],
    [{ source: 'crustacean_shellfish' as const, kind: '  ' }, true],
    [{ source: 'fish' as const, kind: 'salmon' }, false],
  ])('%j: kind missing = %s', (decl, missing) => {
    expect(regimeMatch(decl, US_2025)!.isKindMissing).toBe(missing);
  });
});

describe('EU / UK Annex II', () => {
  // Reg. (EU) No 1169/2011 Annex II: 14 substances; point 8 names 8 nuts.
  test('14 allergens, 8 nuts, and the UK keeps the same 14', () => {
    expect(EU_ANNEX_II_ALLERGENS).toHaveLength(14);
    expect(EU_NUTS).toHaveLength(8);
    expect(UK_ALLERGENS.map((a) => a.key)).toEqual(EU_ANNEX_II_ALLERGENS.map((a) => a.key));
  });
  test.each([['almond', true], ['pecan', true], ['Brazil nuts', true], ['coconut', false], ['pine nut', false]])('isEuNut(%j) is %s (Annex II point 8)', (k, v) => {
    expect(isEuNut(k)).toBe(v);
  });
  // Annex II point 12: "more than 10 mg/kg" total SO2 — exactly 10 does not trigger.
  test('sulphites count only above 10 mg/kg', () => {
    expect(EU_SULPHITE_THRESHOLD_MG_PER_KG).toBe(10);
    expect(regimeMatch({ source: 'sulphites' }, EU, false)).toBeNull();
    expect(regimeMatch({ source: 'sulphites' }, EU, true)?.key).toBe('sulphites');
  });
});

const milk: DeclaredAllergen = { key: 'milk', name: 'Milk', kinds: [], isKindMissing: false, ingredientIds: ['a'] };
const nuts: DeclaredAllergen = { key: 'tree_nuts', name: 'Tree nuts', kinds: ['Almond', 'Pecan'], isKindMissing: false, ingredientIds: ['b'] };
const wheat: DeclaredAllergen = { key: 'wheat', name: 'Wheat', kinds: [], isKindMissing: false, ingredientIds: ['c'] };

describe('US Contains line (21 U.S.C. 343(w)(1)(B), (w)(2))', () => {
  test('lists every allergen with the nut kinds', () => {
    expect(usContainsLine([milk, nuts, wheat])).toBe('Contains: Milk, Almond, Pecan, Wheat');
  });
  test('is never written when a kind is missing, or when there is nothing to declare', () => {
    expect(usContainsLine([milk, { ...nuts, kinds: [], isKindMissing: true }])).toBeNull();
    expect(usContainsLine([])).toBeNull();
  });
  test.each([
    ['Contains: Milk, Almond, Pecan, Wheat', []],
    ['Contains milk, almonds, pecans and wheat', []],
    ['Contains: Milk, Tree nuts, Wheat', ['Almond is not named.', 'Pecan is not named.', '"Tree nuts" alone is not enough: name each nut (for example "Almond").']],
    ['Contains: Milk, Almond, Pecan, Gluten', ['Wheat is not named.', '"Gluten" does not name the food source: say "Wheat".']],
    ['Contains: Almond, Pecan, Wheat', ['Milk is not named.']],
    ['Milk, Almond, Pecan, Wheat', ['The statement must start with the word "Contains".']],
  ])('checkContainsLine(%j)', (line, problems) => {
    expect(checkContainsLine(line, [milk, nuts, wheat])).toEqual(problems);
  });
});

describe('voluntary cross-contact statement (advisory; not required by federal law)', () => {
  test.each([
    [[{ source: 'peanut' as const }], [], 'Made in a home kitchen that also handles peanuts.'],
    [[{ source: 'peanut' as const }, { source: 'sesame' as const }, { source: 'tree_nut' as const }], [], 'Made in a home kitchen that also handles peanuts, sesame and tree nuts.'],
    [[{ source: 'milk' as const }, { source: 'peanut' as const }], [{ source: 'milk' as const }], 'Made in a home kitchen that also handles peanuts.'],
  ])('%j with %j', (handled, contained, text) => {
    expect(crossContactStatement(handled, contained)).toEqual({ text, isVoluntary: true });
  });
  test('nothing left to mention gives null', () => {
    expect(crossContactStatement([{ source: 'milk' }], [{ source: 'milk' }])).toBeNull();
  });
});
