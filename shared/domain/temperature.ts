import Decimal from 'decimal.js';

/** 'C' for degrees Celsius, 'F' for degrees Fahrenheit. */
export type TemperatureUnit = 'C' | 'F';

/** A temperature as entered: the number and the unit it was measured in. */
export interface Temperature {
  value: number | string;
  unit: TemperatureUnit;
}

/**
 * A limit as a code publishes it, in both scales. The Food Code's °C figures are rounded
 * (135 °F is printed as 57 °C), so a reading is compared with the figure in its own unit.
 */
export interface TemperatureLimit {
  fahrenheit: number;
  celsius: number;
}

/** Result of parseTemperature. */
export type ParsedTemperature = { ok: true; temperature: { value: string; unit: TemperatureUnit } } | { ok: false; message: string };

const NINE_FIFTHS = new Decimal(9).div(5);
const ABSOLUTE_ZERO: Record<TemperatureUnit, Decimal> = { C: new Decimal('-273.15'), F: new Decimal('-459.67') };
const PATTERN = /^\s*([+\-\u2212]?\d+(?:[.,]\d+)?)\s*(?:°|º|deg(?:rees?)?)?\s*(c|f|celsius|fahrenheit)\s*$/i;
const SYMBOL_PATTERN = /^\s*([+\-\u2212]?\d+(?:[.,]\d+)?)\s*([\u2103\u2109])\s*$/;

const dec = (v: number | string) => new Decimal(typeof v === 'number' ? v.toString() : v);

/** Exact °C from °F: (F − 32) × 5/9 (NIST SP 811 B.8 defines t/°C = (t/°F − 32)/1.8). */
export function fahrenheitToCelsius(fahrenheit: number | string): Decimal {
  return dec(fahrenheit).minus(32).div(NINE_FIFTHS);
}

/** Exact °F from °C: C × 9/5 + 32 (NIST SP 811 B.8). */
export function celsiusToFahrenheit(celsius: number | string): Decimal {
  return dec(celsius).times(NINE_FIFTHS).plus(32);
}

/** The temperature in the requested unit, exact to decimal.js precision (20 significant digits). */
export function toUnit(t: Temperature, unit: TemperatureUnit): Decimal {
  if (t.unit === unit) return dec(t.value);
  return unit === 'C' ? fahrenheitToCelsius(t.value) : celsiusToFahrenheit(t.value);
}

function limitIn(limit: TemperatureLimit, unit: TemperatureUnit): Decimal {
  return dec(unit === 'C' ? limit.celsius : limit.fahrenheit);
}

/** True when t ≤ limit, compared in the unit t was measured in. */
export function isAtOrBelow(t: Temperature, limit: TemperatureLimit): boolean {
  return dec(t.value).lte(limitIn(limit, t.unit));
}

/** True when t ≥ limit, compared in the unit t was measured in. */
export function isAtOrAbove(t: Temperature, limit: TemperatureLimit): boolean {
  return dec(t.value).gte(limitIn(limit, t.unit));
}

/**
 * Reads what a person typed: '41 °F', '41F', '5.5 °C', '-18 c', '−18 °C', '72 degrees F', '41℉'.
 * A decimal comma is accepted. A number without a unit, or below absolute zero, is refused with a
 * message, because guessing the unit is how a cold reading becomes a hot one.
 */
export function parseTemperature(text: string): ParsedTemperature {
  const m = PATTERN.exec(text) ?? SYMBOL_PATTERN.exec(text);
  if (!m) {
    return /^\s*[+\-\u2212]?\d+(?:[.,]\d+)?\s*°?\s*$/.test(text)
      ? { ok: false, message: 'Add the unit: °F or °C.' }
      : { ok: false, message: 'Enter a temperature such as 41 °F or 5 °C.' };
  }
  const value = new Decimal(m[1]!.replace('\u2212', '-').replace(',', '.'));
  const u = m[2]!.toUpperCase();
  const unit: TemperatureUnit = u.startsWith('C') || u === '\u2103' ? 'C' : 'F';
  if (value.lt(ABSOLUTE_ZERO[unit])) return { ok: false, message: 'That is colder than absolute zero; check the reading.' };
  return { ok: true, temperature: { value: value.toString(), unit } };
}

/**
 * '41 °F', '5.6 °C'. Rounds half away from zero to `decimals` places (default 1) and drops a trailing
 * '.0'; negative values use the minus sign U+2212 for print.
 */
export function formatTemperature(t: Temperature, decimals = 1): string {
  const rounded = dec(t.value).toDecimalPlaces(decimals, Decimal.ROUND_HALF_UP);
  const text = rounded.isZero() ? '0' : rounded.abs().toString();
  return `${rounded.isNegative() && !rounded.isZero() ? '\u2212' : ''}${text} °${t.unit}`;
}

/** Both scales, the measured one first: '41 °F (5 °C)'. */
export function formatTemperatureBoth(t: Temperature, decimals = 1): string {
  const other: TemperatureUnit = t.unit === 'F' ? 'C' : 'F';
  return `${formatTemperature(t, decimals)} (${formatTemperature({ value: toUnit(t, other).toString(), unit: other }, decimals)})`;
}
