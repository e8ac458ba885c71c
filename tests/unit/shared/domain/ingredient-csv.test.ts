import { describe, expect, test } from 'vitest';
import { csvRowToIngredientFields, normaliseHeader, parseAllergenCell, parseYesNo } from '../../../../shared/domain/ingredient-csv';

describe('parseAllergenCell', () => {
  // Tree nut, fish and crustacean kinds must be named (21 U.S.C. 343(w)(2)); the "source:kind" form carries them.
  test.each([
    ['milk; soy', [{ source: 'milk' }, { source: 'soy' }]],
    ['milk; tree_nut:almond', [{ source: 'milk' }, { source: 'tree_nut', kind: 'almond' }]],
    ['Tree nut: Pecan', [{ source: 'tree_nut', kind: 'Pecan' }]],
    ['Almonds', [{ source: 'tree_nut', kind: 'almonds' }]],
    ['eggs, wheat', [{ source: 'egg' }, { source: 'wheat' }]],
    ['shellfish:shrimp', [{ source: 'crustacean_shellfish', kind: 'shrimp' }]],
    ['soya; sulfites', [{ source: 'soy' }, { source: 'sulphites' }]],
    ['', []],
  ])('%j', (cell, expected) => {
    expect(parseAllergenCell(cell)).toEqual({ allergens: expected, errors: [] });
  });

  test('an unknown word is reported, the rest still read', () => {
    const r = parseAllergenCell('milk; gluten');
    expect(r.allergens).toEqual([{ source: 'milk' }]);
    expect(r.errors[0]).toMatch(/"gluten" is not an allergen/);
  });
});

describe('parseYesNo and headers', () => {
  test.each([['yes', true], ['Y', true], ['1', true], ['no', false], ['', false], ['maybe', null]])('%j → %j', (v, out) => {
    expect(parseYesNo(v)).toBe(out);
  });
  test('headers are normalised', () => {
    expect(normaliseHeader('\uFEFFLabel Name')).toBe('label_name');
    expect(normaliseHeader('Supplier-Item-Code')).toBe('supplier_item_code');
  });
});

describe('csvRowToIngredientFields', () => {
  test('a full row maps onto the contract fields in package order', () => {
    const r = csvRowToIngredientFields({
      label_name: 'All-purpose flour', sub_ingredients: 'wheat flour; niacin; reduced iron', allergens: 'wheat',
      sulphites_mg_per_kg: '12,5', needs_tcs: 'no', supplier: 'Millbrook Mill', supplier_item_code: 'AP-50',
    });
    expect(r.errors).toEqual([]);
    expect(r.values).toMatchObject({ labelName: 'All-purpose flour', subIngredients: ['wheat flour', 'niacin', 'reduced iron'], allergens: [{ source: 'wheat' }], sulphitesMgPerKg: 12.5, needsTimeTemperatureControl: false });
  });
  test('a bad number and a bad yes/no name their columns', () => {
    const r = csvRowToIngredientFields({ label_name: 'x', sulphites_mg_per_kg: 'lots', needs_tcs: 'sometimes' });
    expect(r.errors.map((e) => e.field).sort()).toEqual(['needs_tcs', 'sulphites_mg_per_kg']);
  });
});
