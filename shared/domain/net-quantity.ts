import { Dec, type Grams } from './recipe-flatten';

/** Exact avoirdupois pound, grams (1959 international yard and pound; NIST HB 44 App. C). */
export const GRAMS_PER_POUND = '453.59237';
/** Exact avoirdupois ounce = pound / 16. */
export const GRAMS_PER_OUNCE = '28.349523125';
/** Exact US fluid ounce = 231 in³ / 128 × 16.387064 mL/in³. */
export const ML_PER_US_FLUID_OUNCE = '29.5735295625';
/** Exact inch, 16 CFR 500.19. */
export const MM_PER_INCH = '25.4';

/** 'round-down' never overstates (NIST HB 130 UPLR); 'nearest' rounds half up (FDA example "1 gal (3.79 L)"). */
export type NetRounding = 'round-down' | 'nearest';
/** 'us-dual': US customary and metric (FPLA as amended 1992); 'metric': metric only (EU 1169/2011 Art. 23). */
export type NetUnits = 'us-dual' | 'metric';

export interface NetQuantityInput {
  /** Net weight in grams, exact decimal string as stored. */
  grams?: Grams | null;
  /** Net volume in millilitres, for liquids (used only when grams is not given). */
  millilitres?: Grams | null;
  /** Optional count shown first, e.g. 12 → "12 pieces". */
  count?: number | null;
  countUnit?: { singular: string; plural: string } | null;
  units: NetUnits;
  rounding: NetRounding;
}

export interface NetQuantity {
  text: string;
  /** Exact grams as given (weight only). */
  grams: string | null;
  millilitres: string | null;
  metricText: string | null;
  customaryText: string | null;
  countText: string | null;
}

const mode = (r: NetRounding) => (r === 'round-down' ? Dec.ROUND_DOWN : Dec.ROUND_HALF_UP);
const fmt = (d: InstanceType<typeof Dec>) => d.toFixed();

/**
 * The metric figure: three significant digits, two below 100 (16 CFR 500.19(b)); kg/L from 1000 g/mL.
 * Round-down never shows more than the package holds.
 */
export function formatMetric(amount: Grams, unit: 'g' | 'mL', rounding: NetRounding): string {
  const v = new Dec(amount);
  const sd = v.lt(100) ? 2 : 3;
  const r = v.isZero() ? v : v.toSignificantDigits(sd, mode(rounding));
  if (r.gte(1000)) return `${fmt(r.div(1000))} ${unit === 'g' ? 'kg' : 'L'}`;
  return `${fmt(r)} ${unit}`;
}

const twoPlaces = (d: InstanceType<typeof Dec>, rounding: NetRounding) => d.toDecimalPlaces(2, mode(rounding));

/**
 * US customary weight: ounces below 1 lb; "24 oz (1 lb 8 oz)" from 1 lb to under 4 lb; pounds from 4 lb
 * (21 CFR 101.105(j), value from memory for the paragraph). Decimals to at most two places.
 */
export function formatCustomaryWeight(grams: Grams, rounding: NetRounding): string {
  const g = new Dec(grams);
  const oz = twoPlaces(g.div(GRAMS_PER_OUNCE), rounding);
  if (oz.lt(16)) return `${fmt(oz)} oz`;
  if (oz.lt(64)) {
    const lb = oz.div(16).floor();
    const rest = oz.minus(lb.times(16));
    return `${fmt(oz)} oz (${fmt(lb)} lb${rest.isZero() ? '' : ` ${fmt(rest)} oz`})`;
  }
  return `${fmt(twoPlaces(g.div(GRAMS_PER_POUND), rounding))} lb`;
}

/** US customary volume: fl oz below 1 pint, "32 fl oz (1 qt)" below 1 gallon, gallons from there (231 in³ gallon). */
export function formatCustomaryVolume(millilitres: Grams, rounding: NetRounding): string {
  const ml = new Dec(millilitres);
  const floz = twoPlaces(ml.div(ML_PER_US_FLUID_OUNCE), rounding);
  if (floz.lt(16)) return `${fmt(floz)} fl oz`;
  if (floz.lt(128)) {
    const qt = floz.div(32).floor();
    const pt = floz.minus(qt.times(32)).div(16).floor();
    const rest = floz.minus(qt.times(32)).minus(pt.times(16));
    const parts = [qt.gt(0) ? `${fmt(qt)} qt` : '', pt.gt(0) ? `${fmt(pt)} pt` : '', rest.gt(0) ? `${fmt(rest)} fl oz` : ''];
    return `${fmt(floz)} fl oz (${parts.filter(Boolean).join(' ')})`;
  }
  return `${fmt(twoPlaces(ml.div(ML_PER_US_FLUID_OUNCE).div(128), rounding))} gal`;
}

/**
 * The net-quantity line, e.g. "Net wt 8 oz (226 g)", "Net wt 24 oz (1 lb 8 oz) 680 g",
 * "Net contents 1 gal (3.78 L)", "12 pieces, Net wt 8 oz (226 g)"; metric-only: "Net weight 226 g".
 * Null when neither a weight, a volume nor a count is given.
 */
export function buildNetQuantity(input: NetQuantityInput): NetQuantity | null {
  const hasGrams = input.grams != null && input.grams !== '';
  const hasMl = !hasGrams && input.millilitres != null && input.millilitres !== '';
  const count = input.count != null && input.count > 0 ? input.count : null;
  if (!hasGrams && !hasMl && count === null) return null;
  const unit = input.countUnit ?? { singular: 'piece', plural: 'pieces' };
  const countText = count === null ? null : `${count} ${count === 1 ? unit.singular : unit.plural}`;
  let metricText: string | null = null;
  let customaryText: string | null = null;
  let measure: string | null = null;
  if (hasGrams || hasMl) {
    const amount = new Dec((hasGrams ? input.grams : input.millilitres)!);
    if (amount.lte(0)) throw new Error('The net quantity must be more than zero.');
    metricText = formatMetric(amount.toFixed(), hasGrams ? 'g' : 'mL', input.rounding);
    if (input.units === 'metric') {
      measure = `${hasGrams ? 'Net weight' : 'Net volume'} ${metricText}`;
    } else {
      customaryText = hasGrams ? formatCustomaryWeight(amount.toFixed(), input.rounding) : formatCustomaryVolume(amount.toFixed(), input.rounding);
      const label = hasGrams ? 'Net wt' : 'Net contents';
      measure = customaryText.includes('(') ? `${label} ${customaryText} ${metricText}` : `${label} ${customaryText} (${metricText})`;
    }
  }
  return {
    text: [countText, measure].filter(Boolean).join(', '),
    grams: hasGrams ? new Dec(input.grams!).toFixed() : null,
    millilitres: hasMl ? new Dec(input.millilitres!).toFixed() : null,
    metricText,
    customaryText,
    countText,
  };
}

/** Exact grams for a number of avoirdupois ounces, as a decimal string. */
export function ouncesToGrams(ounces: Grams): string {
  return new Dec(ounces).times(GRAMS_PER_OUNCE).toFixed();
}

/** Exact grams for a number of avoirdupois pounds, as a decimal string. */
export function poundsToGrams(pounds: Grams): string {
  return new Dec(pounds).times(GRAMS_PER_POUND).toFixed();
}

/** Exact millilitres for a number of US fluid ounces, as a decimal string. */
export function fluidOuncesToMillilitres(fluidOunces: Grams): string {
  return new Dec(fluidOunces).times(ML_PER_US_FLUID_OUNCE).toFixed();
}
