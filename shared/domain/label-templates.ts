import { inToPt, mmToPt } from './label-format';

/** A label size on the stock, in real units; `widthPt`/`heightPt` are PDF points (1/72 in). */
export interface LabelTemplate {
  id: string;
  name: string;
  shape: 'rectangle' | 'round';
  /** Size as the stock is sold, e.g. 2 × 3 in or 50 × 30 mm (width × height). */
  unit: 'in' | 'mm';
  width: number;
  height: number;
  widthPt: number;
  heightPt: number;
}

const inch = (id: string, name: string, w: number, h: number, shape: LabelTemplate['shape'] = 'rectangle'): LabelTemplate => ({
  id, name, shape, unit: 'in', width: w, height: h, widthPt: inToPt(w), heightPt: inToPt(h),
});
const mm = (id: string, name: string, w: number, h: number): LabelTemplate => ({
  id, name, shape: 'rectangle', unit: 'mm', width: w, height: h, widthPt: mmToPt(w), heightPt: mmToPt(h),
});

/** Common label-stock sizes (common practice; no standard sets them). */
export const LABEL_TEMPLATES: readonly LabelTemplate[] = Object.freeze([
  inch('square-2in', '2 × 2 in square', 2, 2),
  inch('round-2in', '2 in round', 2, 2, 'round'),
  inch('rect-3x2in', '3 × 2 in', 3, 2),
  inch('rect-4x3in', '4 × 3 in', 4, 3),
  mm('rect-50x30mm', '50 × 30 mm', 50, 30),
  mm('rect-60x40mm', '60 × 40 mm', 60, 40),
]);

export const LABEL_TEMPLATE_IDS = LABEL_TEMPLATES.map((t) => t.id) as [string, ...string[]];

/** A template by id, or undefined. */
export function getLabelTemplate(id: string): LabelTemplate | undefined {
  return LABEL_TEMPLATES.find((t) => t.id === id);
}

/** Area of the label face in square inches (a round label is a circle, π r²). */
export function labelAreaIn2(t: LabelTemplate): number {
  const w = t.widthPt / 72;
  const h = t.heightPt / 72;
  return t.shape === 'round' ? Math.PI * (w / 2) ** 2 : w * h;
}

/** ISO 216 A4 is 210 × 297 mm; US Letter is 8.5 × 11 in (ANSI/ASME Y14.1). */
export const PAPER_SIZES = {
  letter: { name: 'US Letter (8.5 × 11 in)', widthPt: inToPt(8.5), heightPt: inToPt(11) },
  a4: { name: 'A4 (210 × 297 mm)', widthPt: mmToPt(210), heightPt: mmToPt(297) },
} as const;
export type PaperSize = keyof typeof PAPER_SIZES;

export interface SheetSpec {
  /** 'roll': one label per page the size of the label, for label printers (margins and gutters unused). */
  paper: PaperSize | 'roll';
  /** Page margins in mm. */
  marginTopMm: number;
  marginLeftMm: number;
  marginRightMm: number;
  marginBottomMm: number;
  /** Space between labels in mm: across (between columns) and down (between rows). */
  gutterXMm: number;
  gutterYMm: number;
}

export interface LabelSlot {
  /** Lower-left corner of the label in PDF coordinates (origin bottom-left of the page). */
  x: number;
  y: number;
}

export interface SheetLayout {
  pageWidthPt: number;
  pageHeightPt: number;
  columns: number;
  rows: number;
  perPage: number;
  /** Slots in reading order: left to right, top to bottom. */
  slots: LabelSlot[];
}

/**
 * How many labels of a template fit on a sheet: columns = ⌊(usable width + gutter) / (label width + gutter)⌋,
 * rows likewise, laid out from the top-left margin. Zero columns or rows means the label does not fit.
 */
export function sheetLayout(template: LabelTemplate, sheet: SheetSpec): SheetLayout {
  if (sheet.paper === 'roll') {
    return { pageWidthPt: template.widthPt, pageHeightPt: template.heightPt, columns: 1, rows: 1, perPage: 1, slots: [{ x: 0, y: 0 }] };
  }
  const paper = PAPER_SIZES[sheet.paper];
  const gx = mmToPt(sheet.gutterXMm);
  const gy = mmToPt(sheet.gutterYMm);
  const usableW = paper.widthPt - mmToPt(sheet.marginLeftMm) - mmToPt(sheet.marginRightMm);
  const usableH = paper.heightPt - mmToPt(sheet.marginTopMm) - mmToPt(sheet.marginBottomMm);
  // A hair of tolerance so a sheet designed to fit exactly is not lost to rounding.
  const fit = (usable: number, size: number, gap: number) => Math.max(0, Math.floor((usable + gap + 1e-6) / (size + gap)));
  const columns = fit(usableW, template.widthPt, gx);
  const rows = fit(usableH, template.heightPt, gy);
  const slots: LabelSlot[] = [];
  const top = paper.heightPt - mmToPt(sheet.marginTopMm);
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < columns; c++) {
      slots.push({ x: mmToPt(sheet.marginLeftMm) + c * (template.widthPt + gx), y: top - template.heightPt - r * (template.heightPt + gy) });
    }
  }
  return { pageWidthPt: paper.widthPt, pageHeightPt: paper.heightPt, columns, rows, perPage: columns * rows, slots };
}

/** Office printers rarely print closer than about 6.35 mm (1/4 in) to the edge (common practice). */
export const DEFAULT_SHEET: SheetSpec = {
  paper: 'letter', marginTopMm: 12.7, marginLeftMm: 12.7, marginRightMm: 12.7, marginBottomMm: 12.7, gutterXMm: 3, gutterYMm: 3,
};
