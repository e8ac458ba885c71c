import { describe, expect, test } from 'vitest';
import { editableWeight, fromGrams, packageNetGrams, toGrams } from '../../../../shared/domain/weight-units';
import { diffLabelText, type LabelTextSummary } from '../../../../shared/domain/recipe-label';

describe('toGrams', () => {
  // Exact: 1 lb = 453.59237 g, 1 oz = lb/16 = 28.349523125 g (NIST HB 44 App. C; 1959 international pound).
  test.each([
    ['8', 'oz', '226.796185'],
    ['4', 'oz', '113.3980925'],
    ['24', 'oz', '680.388555'],
    ['1', 'lb', '453.59237'],
    ['2.5', 'lb', '1133.980925'],
    ['0.25', 'kg', '250'],
    ['12.50', 'g', '12.5'],
  ] as const)('%s %s → %s g', (amount, unit, grams) => {
    expect(toGrams(amount, unit)).toBe(grams);
  });

  test('round-trips to the typed amount', () => {
    expect(fromGrams(toGrams('8', 'oz'), 'oz')).toBe('8');
    expect(fromGrams(toGrams('1.75', 'lb'), 'lb')).toBe('1.75');
  });

  test('a stored weight is offered for editing in a unit that keeps it exact within 6 decimals', () => {
    expect(editableWeight('28.349523125')).toEqual({ amount: '1', unit: 'oz' });
    expect(editableWeight('453.59237')).toEqual({ amount: '453.59237', unit: 'g' });
    expect(editableWeight('42.5242846875')).toEqual({ amount: '1.5', unit: 'oz' });
  });

  test('refuses negative or non-numeric amounts', () => {
    expect(() => toGrams('-1', 'g')).toThrow(RangeError);
    expect(() => toGrams('1e3', 'g')).toThrow(RangeError);
  });

  test('net weight per package is piece weight × pieces, exact', () => {
    expect(packageNetGrams('28', 6)).toBe('168');
    expect(packageNetGrams(toGrams('1.5', 'oz'), 6)).toBe('255.145708125');
    expect(packageNetGrams(null, 6)).toBeNull();
    expect(packageNetGrams('28', null)).toBeNull();
  });
});

describe('diffLabelText', () => {
  const v1: LabelTextSummary = {
    ingredientStatement: 'Ingredients: Sugar, Wheat flour (wheat flour, niacin), Butter (milk)',
    containsLine: 'Contains: Milk, Wheat',
    allergens: ['Milk', 'Wheat'],
    netQuantity: '6 pieces, Net wt 5.92 oz (168 g)',
    statements: [],
  };
  test('the same text has no changes', () => expect(diffLabelText(v1, v1)).toEqual([]));
  test('names the entries and allergens that appeared or went', () => {
    const v2 = { ...v1, ingredientStatement: 'Ingredients: Sugar, Wheat flour (wheat flour, niacin), Almond flour', allergens: ['Tree nuts (Almond)', 'Wheat'], containsLine: 'Contains: Almond, Wheat' };
    const changes = diffLabelText(v1, v2);
    expect(changes.map((c) => c.field)).toEqual(['ingredientStatement', 'containsLine', 'allergens']);
    expect(changes[0]).toMatchObject({ added: ['Almond flour'], removed: ['Butter (milk)'] });
    expect(changes[2]).toMatchObject({ added: ['Tree nuts (Almond)'], removed: ['Milk'] });
  });
});
