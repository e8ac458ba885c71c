import { Dec } from './recipe-flatten';

/** Principal display panel shapes, 21 CFR 101.1. Dimensions in inches. */
export type PanelShape =
  | { shape: 'rectangle'; heightIn: number; widthIn: number }
  | { shape: 'cylinder'; heightIn: number; circumferenceIn: number }
  | { shape: 'other'; totalSurfaceIn2: number };

/**
 * Area of the principal display panel in square inches (21 CFR 101.1): height × width; 40 % of
 * height × circumference for a cylinder; 40 % of the total surface otherwise.
 */
export function principalDisplayPanelAreaIn2(panel: PanelShape): number {
  const r = (d: InstanceType<typeof Dec>) => d.toNumber();
  switch (panel.shape) {
    case 'rectangle': return r(new Dec(panel.heightIn).times(panel.widthIn));
    case 'cylinder': return r(new Dec(panel.heightIn).times(panel.circumferenceIn).times('0.4'));
    case 'other': return r(new Dec(panel.totalSurfaceIn2).times('0.4'));
  }
}

export interface TypeHeightTier {
  /** Upper bound of the tier's PDP area, in², inclusive; null for the last tier. */
  maxAreaIn2: number | null;
  minHeightIn: number;
  /** Exact millimetres of minHeightIn. */
  minHeightMm: number;
  source: string;
  isVerified: boolean;
}

// 21 CFR 101.105(i). Tiers above 25 in² are values from memory (same scheme as FTC 16 CFR 500.21).
export const NET_QUANTITY_TYPE_TIERS: readonly TypeHeightTier[] = [
  { maxAreaIn2: 5, minHeightIn: 1 / 16, minHeightMm: 1.5875, source: '21 CFR 101.105(i)', isVerified: true },
  { maxAreaIn2: 25, minHeightIn: 1 / 8, minHeightMm: 3.175, source: '21 CFR 101.105(i)', isVerified: true },
  { maxAreaIn2: 100, minHeightIn: 3 / 16, minHeightMm: 4.7625, source: '21 CFR 101.105(i) (value from memory)', isVerified: false },
  { maxAreaIn2: 400, minHeightIn: 1 / 4, minHeightMm: 6.35, source: '21 CFR 101.105(i) (value from memory)', isVerified: false },
  { maxAreaIn2: null, minHeightIn: 1 / 2, minHeightMm: 12.7, source: '21 CFR 101.105(i) (value from memory)', isVerified: false },
];

/** Minimum height of the net-quantity figures (lower-case "o", or capitals if all caps) for a PDP area. */
export function minNetQuantityTypeHeight(pdpAreaIn2: number): TypeHeightTier {
  if (!(pdpAreaIn2 > 0)) throw new Error('The display panel area must be more than zero.');
  return NET_QUANTITY_TYPE_TIERS.find((t) => t.maxAreaIn2 === null || pdpAreaIn2 <= t.maxAreaIn2)!;
}

/** 21 CFR 101.2(c): required label information never in letters under 1/16 inch. */
export const MIN_US_TYPE_HEIGHT_IN = 1 / 16;

/** A "Contains" line must be in type no smaller than the ingredient list's (21 U.S.C. 343(w)(1)(B)). */
export function isContainsTypeSizeOk(containsPt: number, ingredientsPt: number): boolean {
  return containsPt >= ingredientsPt;
}

/** EU 1169/2011 Art. 13(2) and Annex IV: x-height ≥ 1.2 mm, or ≥ 0.9 mm when the largest surface is < 80 cm². */
export function euMinXHeightMm(largestSurfaceCm2: number): number {
  return largestSurfaceCm2 < 80 ? 0.9 : 1.2;
}

/** 1 pt = 1/72 in (PostScript point); 1 in = 25.4 mm exactly. */
export const POINTS_PER_INCH = 72;
export const ptToIn = (pt: number) => pt / POINTS_PER_INCH;
export const inToPt = (inches: number) => inches * POINTS_PER_INCH;
export const inToMm = (inches: number) => new Dec(inches).times('25.4').toNumber();
export const mmToIn = (mm: number) => new Dec(mm).div('25.4').toNumber();
export const ptToMm = (pt: number) => new Dec(pt).times('25.4').div(POINTS_PER_INCH).toNumber();
export const mmToPt = (mm: number) => new Dec(mm).times(POINTS_PER_INCH).div('25.4').toNumber();

/** Font size in points needed for a glyph height (mm), given the font's glyph-height-to-em ratio (e.g. x-height 0.5). */
export function fontSizeForGlyphHeightPt(heightMm: number, glyphHeightPerEm: number): number {
  if (!(glyphHeightPerEm > 0)) throw new Error('The glyph height ratio must be more than zero.');
  return mmToPt(heightMm) / glyphHeightPerEm;
}
