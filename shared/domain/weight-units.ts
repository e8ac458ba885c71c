import { GRAMS_PER_OUNCE, GRAMS_PER_POUND } from './net-quantity';
import { Dec, type Grams } from './recipe-flatten';

/** Units a baker may type a weight in. Stored weights are always grams. */
export const WEIGHT_UNITS = ['g', 'kg', 'oz', 'lb'] as const;
export type WeightUnit = (typeof WEIGHT_UNITS)[number];

// Exact factors: 1 lb = 453.59237 g and 1 oz = lb/16 (NIST HB 44 App. C; 1959 international pound).
const GRAMS_PER: Record<WeightUnit, string> = { g: '1', kg: '1000', oz: GRAMS_PER_OUNCE, lb: GRAMS_PER_POUND };

/** Plain decimal text: digits with an optional fraction (no sign, no exponent). */
export const DECIMAL_TEXT = /^\d{1,9}(\.\d{1,6})?$/;

/**
 * Exact grams for an amount in a unit, as a decimal string without trailing zeros,
 * e.g. toGrams('8', 'oz') → '226.796185', toGrams('1.5', 'kg') → '1500'.
 * @throws RangeError when the amount is not a non-negative decimal number.
 */
export function toGrams(amount: Grams, unit: WeightUnit): string {
  const text = typeof amount === 'number' ? String(amount) : amount.trim();
  if (!/^\d+(\.\d+)?$/.test(text)) throw new RangeError(`"${amount}" is not a weight of zero or more.`);
  return new Dec(text).times(GRAMS_PER[unit]).toFixed();
}

/** Grams expressed in a unit, exact (may have many decimals), e.g. fromGrams('226.796185', 'oz') → '8'. */
export function fromGrams(grams: Grams, unit: WeightUnit): string {
  return new Dec(grams).div(GRAMS_PER[unit]).toFixed();
}

/** Normalises stored grams text ('226.7961850' → '226.796185'). */
export function normaliseGrams(grams: Grams): string {
  return new Dec(grams).toFixed();
}

/** Net weight of one package: piece weight × pieces per package, exact; null when either is missing. */
export function packageNetGrams(pieceGrams: Grams | null | undefined, piecesPerPackage: number | null | undefined): string | null {
  if (pieceGrams == null || pieceGrams === '' || piecesPerPackage == null || piecesPerPackage <= 0) return null;
  return new Dec(pieceGrams).times(piecesPerPackage).toFixed();
}

/**
 * A stored gram weight as an amount a person can edit (at most 6 decimals, as the editor accepts): grams when
 * exact, else ounces or pounds when those are exact (28.349523125 g → 1 oz), else grams to 6 decimals.
 */
export function editableWeight(grams: Grams): { amount: string; unit: WeightUnit } {
  const fits = (s: string) => !s.includes('.') || s.split('.')[1]!.length <= 6;
  for (const unit of ['g', 'oz', 'lb'] as const) {
    const amount = fromGrams(grams, unit);
    if (fits(amount)) return { amount, unit };
  }
  return { amount: new Dec(grams).toDecimalPlaces(6).toFixed(), unit: 'g' };
}
