import { describe, expect, test } from 'vitest';
import Decimal from 'decimal.js';
import {
  celsiusToFahrenheit,
  fahrenheitToCelsius,
  formatTemperature,
  formatTemperatureBoth,
  isAtOrAbove,
  isAtOrBelow,
  parseTemperature,
  toUnit,
} from '../../../../shared/domain/temperature';

describe('conversion', () => {
  // NIST SP 811 B.8: t/°F = 1.8 × t/°C + 32 exactly; fixed points 0 °C = 32 °F, 100 °C = 212 °F, −40 = −40.
  test.each([
    ['0', '32'],
    ['100', '212'],
    ['-40', '-40'],
    ['37', '98.6'],
    ['5', '41'], // FDA Food Code 2022 3-501.16: 5 °C (41 °F)
    ['57', '134.6'], // the Food Code prints 135 °F as 57 °C, which is 134.6 °F exactly
    ['21', '69.8'], // the Food Code prints 70 °F as 21 °C
    ['77', '170.6'], // the Food Code prints 171 °F as 77 °C
    ['-273.15', '-459.67'], // absolute zero, NIST SP 811
    ['-18', '-0.4'],
  ])('%s °C is exactly %s °F', (c, f) => {
    expect(celsiusToFahrenheit(c).toString()).toBe(f);
    expect(fahrenheitToCelsius(f).toString()).toBe(new Decimal(c).toString());
  });

  test.each([
    // (F − 32) × 5/9 repeats; these are the exact fractions written to 10 places.
    ['135', '57.2222222222'],
    ['70', '21.1111111111'],
    ['165', '73.8888888889'],
    ['171', '77.2222222222'],
  ])('%s °F is %s… °C', (f, c) => {
    expect(fahrenheitToCelsius(f).toDecimalPlaces(10).toString()).toBe(c);
  });

  test('numbers convert through their decimal text, not binary floating point', () => {
    // 0.1 + 0.2 style error would show as 32.180000000000003.
    expect(celsiusToFahrenheit(0.1).toString()).toBe('32.18');
    expect(toUnit({ value: 41.1, unit: 'F' }, 'F').toString()).toBe('41.1');
    expect(toUnit({ value: 20, unit: 'C' }, 'F').toString()).toBe('68'); // 3-501.19/4-501.114: 20 °C (68 °F)
  });
});

describe('limits are compared in the unit of the reading', () => {
  const COLD = { fahrenheit: 41, celsius: 5 }; // FDA Food Code 2022 3-501.16(A)(2)
  const HOT = { fahrenheit: 135, celsius: 57 }; // FDA Food Code 2022 3-501.16(A)(1)
  test.each([
    // Boundary values from 3-501.16: 135 °F and 41 °F comply; 134.9 °F and 41.1 °F do not.
    [{ value: 41, unit: 'F' as const }, COLD, 'below', true],
    [{ value: 41.1, unit: 'F' as const }, COLD, 'below', false],
    [{ value: 5, unit: 'C' as const }, COLD, 'below', true],
    [{ value: 5.1, unit: 'C' as const }, COLD, 'below', false],
    [{ value: 135, unit: 'F' as const }, HOT, 'above', true],
    [{ value: 134.9, unit: 'F' as const }, HOT, 'above', false],
    [{ value: 57, unit: 'C' as const }, HOT, 'above', true],
    [{ value: '56.9', unit: 'C' as const }, HOT, 'above', false],
  ])('%j against %j (%s) is %s', (t, limit, side, expected) => {
    expect(side === 'below' ? isAtOrBelow(t, limit) : isAtOrAbove(t, limit)).toBe(expected);
  });
});

describe('parseTemperature', () => {
  test.each([
    ['41 °F', '41', 'F'],
    ['41F', '41', 'F'],
    ['41°f', '41', 'F'],
    ['5.5 °C', '5.5', 'C'],
    ['5,5 °C', '5.5', 'C'],
    ['-18 c', '-18', 'C'],
    ['\u221218 °C', '-18', 'C'],
    ['72 degrees F', '72', 'F'],
    ['165 Fahrenheit', '165', 'F'],
    ['41\u2109', '41', 'F'],
    ['5\u2103', '5', 'C'],
  ])('%j is %s °%s', (text, value, unit) => {
    expect(parseTemperature(text)).toEqual({ ok: true, temperature: { value, unit } });
  });

  test.each([
    ['41', 'Add the unit: °F or °C.'],
    ['41°', 'Add the unit: °F or °C.'],
    ['warm', 'Enter a temperature such as 41 °F or 5 °C.'],
    ['41 K', 'Enter a temperature such as 41 °F or 5 °C.'],
    ['-500 F', 'That is colder than absolute zero; check the reading.'], // below −459.67 °F (NIST SP 811)
  ])('%j is refused: %s', (text, message) => {
    expect(parseTemperature(text)).toEqual({ ok: false, message });
  });
});

describe('formatTemperature', () => {
  test.each([
    [{ value: 41, unit: 'F' as const }, '41 °F'],
    [{ value: '57.2222', unit: 'C' as const }, '57.2 °C'],
    [{ value: 0.05, unit: 'C' as const }, '0.1 °C'], // half rounds away from zero
    [{ value: -18, unit: 'C' as const }, '\u221218 °C'],
    [{ value: -0.01, unit: 'C' as const }, '0 °C'],
  ])('%j is %s', (t, text) => {
    expect(formatTemperature(t)).toBe(text);
  });
  test('both scales, measured first', () => {
    expect(formatTemperatureBoth({ value: 135, unit: 'F' })).toBe('135 °F (57.2 °C)');
    expect(formatTemperatureBoth({ value: 5, unit: 'C' })).toBe('5 °C (41 °F)');
  });
});
