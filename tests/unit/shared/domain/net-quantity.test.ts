import Decimal from 'decimal.js';
import { describe, expect, test } from 'vitest';
import {
  buildNetQuantity, fluidOuncesToMillilitres, formatMetric, GRAMS_PER_OUNCE, GRAMS_PER_POUND, ML_PER_US_FLUID_OUNCE, ouncesToGrams, poundsToGrams,
} from '../../../../shared/domain/net-quantity';

describe('exact NIST conversions', () => {
  // NIST: 1 lb = 453.59237 g exactly; 1 oz = lb/16; 1 US fl oz = 1/128 gal of 231 in³ (in = 2.54 cm, 16 CFR 500.19).
  test('constants', () => {
    expect([GRAMS_PER_POUND, GRAMS_PER_OUNCE, ML_PER_US_FLUID_OUNCE]).toEqual(['453.59237', '28.349523125', '29.5735295625']);
    expect(new Decimal(231).times('16.387064').div(128).toFixed()).toBe(ML_PER_US_FLUID_OUNCE);
  });
  // Derived check values (exact).
  test.each([
    [4, '113.3980925'], [8, '226.796185'], [12, '340.1942775'], [16, '453.59237'], [24, '680.388555'], [32, '907.18474'],
  ])('%i oz = %s g', (oz, g) => expect(ouncesToGrams(oz)).toBe(g));
  test.each([[8, '236.5882365'], [16, '473.176473'], [32, '946.352946'], [128, '3785.411784']])('%i fl oz = %s mL', (floz, ml) => {
    expect(fluidOuncesToMillilitres(floz)).toBe(ml);
  });
  test('2 lb = 907.18474 g', () => expect(poundsToGrams(2)).toBe('907.18474'));
});

describe('buildNetQuantity', () => {
  // Metric rounding: 3 digits, 2 below 100 (16 CFR 500.19(b)); round-down never overstates (NIST HB 130 UPLR).
  test.each([
    ['226.796185', 'round-down', 'Net wt 8 oz (226 g)'],
    ['226.796185', 'nearest', 'Net wt 8 oz (227 g)'],
    ['340.1942775', 'round-down', 'Net wt 12 oz (340 g)'],
    ['453.59237', 'round-down', 'Net wt 16 oz (1 lb) 453 g'],
    ['453.59237', 'nearest', 'Net wt 16 oz (1 lb) 454 g'],
    ['680.388555', 'round-down', 'Net wt 24 oz (1 lb 8 oz) 680 g'],
    ['680.388555', 'nearest', 'Net wt 24 oz (1 lb 8 oz) 680 g'],
    ['113.3980925', 'round-down', 'Net wt 4 oz (113 g)'],
    ['56.69904625', 'round-down', 'Net wt 2 oz (56 g)'],
    ['56.69904625', 'nearest', 'Net wt 2 oz (57 g)'],
    ['1360.77711', 'round-down', 'Net wt 48 oz (3 lb) 1.36 kg'],
    ['1814.36948', 'round-down', 'Net wt 4 lb (1.81 kg)'],
    ['250', 'round-down', 'Net wt 8.81 oz (250 g)'],
    ['250', 'nearest', 'Net wt 8.82 oz (250 g)'],
  ] as const)('%s g, %s → %j', (grams, rounding, text) => {
    expect(buildNetQuantity({ grams, units: 'us-dual', rounding })!.text).toBe(text);
  });
  // FDA example "Net contents 1 gal (3.79 L)" rounds to nearest; round-down gives 3.78 L.
  test.each([
    ['3785.411784', 'round-down', 'Net contents 1 gal (3.78 L)'],
    ['3785.411784', 'nearest', 'Net contents 1 gal (3.79 L)'],
    ['236.5882365', 'round-down', 'Net contents 8 fl oz (236 mL)'],
    ['946.352946', 'round-down', 'Net contents 32 fl oz (1 qt) 946 mL'],
    ['473.176473', 'nearest', 'Net contents 16 fl oz (1 pt) 473 mL'],
  ] as const)('%s mL, %s → %j', (millilitres, rounding, text) => {
    expect(buildNetQuantity({ millilitres, units: 'us-dual', rounding })!.text).toBe(text);
  });
  test.each([
    [{ grams: '226.796185', count: 12 }, '12 pieces, Net wt 8 oz (226 g)'],
    [{ count: 1, countUnit: { singular: 'cake pop', plural: 'cake pops' } }, '1 cake pop'],
    [{ count: 6, countUnit: { singular: 'cake pop', plural: 'cake pops' } }, '6 cake pops'],
  ])('count prefix %j', (input, text) => {
    expect(buildNetQuantity({ ...input, units: 'us-dual', rounding: 'round-down' })!.text).toBe(text);
  });
  test('metric-only profiles print only the metric figure', () => {
    expect(buildNetQuantity({ grams: '226.796185', units: 'metric', rounding: 'round-down' })!.text).toBe('Net weight 226 g');
  });
  test('nothing to declare gives null; zero is refused', () => {
    expect(buildNetQuantity({ units: 'us-dual', rounding: 'round-down' })).toBeNull();
    expect(() => buildNetQuantity({ grams: '0', units: 'us-dual', rounding: 'round-down' })).toThrow('more than zero');
  });
  test.each([['99.9', 'round-down', '99 g'], ['99.96', 'nearest', '100 g'], ['5.678', 'round-down', '5.6 g'], ['1234.5', 'nearest', '1.23 kg']] as const)(
    'formatMetric(%s, %s) = %s (never more than 3 significant digits, 2 below 100)', (v, r, t) => expect(formatMetric(v, 'g', r)).toBe(t),
  );
});
