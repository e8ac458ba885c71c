import type { LabelTemplate } from './label-templates';
import { labelAreaIn2 } from './label-templates';
import { euMinXHeightMm, fontSizeForGlyphHeightPt, inToMm, minNetQuantityTypeHeight, mmToPt } from './label-format';

/** Text widths and glyph heights of the label font (Lato in the PDF); injected so this stays pure. */
export interface TextMeasure {
  width(text: string, isBold: boolean, sizePt: number): number;
  /** Height of the lower-case "o" (x-height) per em, e.g. 0.5065 for Lato Regular. */
  xHeightPerEm: { regular: number; bold: number };
}

export interface TextRun {
  text: string;
  isBold: boolean;
}

export type LabelBlockKey =
  | 'productName' | 'ingredients' | 'contains' | 'crossContact' | 'safeHandlingStatement' | 'homeKitchenStatement'
  | 'business' | 'dates' | 'lot' | 'netQuantity';

/** How a block's size is chosen: with the body text, or never below its own legal minimum. */
export interface LabelBlock {
  key: LabelBlockKey;
  runs: TextRun[];
  /** Size relative to the body text (the title is larger). */
  scale: number;
  /** A floor in points (a statement's minimum, the net-quantity height); the block never goes below it. */
  minPt: number;
}

export interface PlacedPiece {
  text: string;
  isBold: boolean;
  /** x of the piece's left edge, from the label's left edge (pt). */
  x: number;
  /** First piece of a word: a space precedes it unless it starts the line. */
  isWordStart: boolean;
}

export interface PlacedLine {
  block: LabelBlockKey;
  sizePt: number;
  /** Baseline, from the label's bottom edge (pt). */
  y: number;
  pieces: PlacedPiece[];
}

export interface QrPlacement {
  /** Lower-left corner of the symbol including its quiet zone, from the label's lower-left (pt). */
  x: number;
  y: number;
  /** Side of the symbol including the 4-module quiet zone on each side (pt). */
  sizePt: number;
  moduleSizeMm: number;
}

export interface LabelLayout {
  bodyPt: number;
  lines: PlacedLine[];
  qr: QrPlacement;
  /** Size each block was set in, in points. */
  sizes: Partial<Record<LabelBlockKey, number>>;
}

export interface LegalMinimum {
  key: 'body' | 'netQuantity';
  pt: number;
  source: string;
}

/** ISO/IEC 18004 quiet zone: 4 modules on every side. */
export const QR_QUIET_ZONE_MODULES = 4;
/** Smallest module we print: 0.33 mm scans with phone cameras at arm's length (common practice). */
export const MIN_QR_MODULE_MM = 0.33;
const LINE_HEIGHT = 1.18;
const SIZE_STEP = 0.25;

/** Edge allowance: label printers drift about 1 mm, so text stays 1.5 mm inside the edge (common practice). */
export const LABEL_INSET_PT = mmToPt(1.5);

/**
 * The smallest body text the rules allow on this label, as a font size for the given x-height ratio.
 * US: 1/16 in lower-case height (21 CFR 101.2(c)), or 1/32 in when the surface is under 12 in²
 * (101.2(c) small-package exception, value from memory; the label face stands in for the surface).
 * EU/UK: x-height 1.2 mm, or 0.9 mm under 80 cm² (Reg. 1169/2011 Art. 13(2), Annex IV).
 */
export function minBodyPt(template: LabelTemplate, regime: 'US' | 'EU' | 'UK', xHeightPerEm: number): LegalMinimum {
  const area = labelAreaIn2(template);
  if (regime === 'US') {
    const small = area < 12;
    const heightMm = inToMm(small ? 1 / 32 : 1 / 16);
    return { key: 'body', pt: fontSizeForGlyphHeightPt(heightMm, xHeightPerEm), source: small ? '21 CFR 101.2(c) small-package exception, 1/32 in (value from memory)' : '21 CFR 101.2(c), 1/16 in' };
  }
  const cm2 = area * 6.4516;
  return { key: 'body', pt: fontSizeForGlyphHeightPt(euMinXHeightMm(cm2), xHeightPerEm), source: `Reg. (EU) No 1169/2011 Art. 13(2), x-height ${euMinXHeightMm(cm2)} mm` };
}

/** Net-quantity type size by display-panel area (21 CFR 101.105(i)); the label face is taken as the panel. */
export function minNetQuantityPt(template: LabelTemplate, xHeightPerEm: number): LegalMinimum {
  const tier = minNetQuantityTypeHeight(labelAreaIn2(template));
  return { key: 'netQuantity', pt: fontSizeForGlyphHeightPt(tier.minHeightMm, xHeightPerEm), source: `${tier.source}, ${tier.minHeightMm} mm` };
}

type Word = TextRun[];

/** Splits runs into words; a word may mix bold and regular pieces ("(milk),"). */
function words(runs: readonly TextRun[]): Word[] {
  const out: Word[] = [];
  let cur: Word = [];
  for (const run of runs) {
    const parts = run.text.split(/(\s+)/);
    for (const p of parts) {
      if (p === '') continue;
      if (/^\s+$/.test(p)) {
        if (cur.length) out.push(cur);
        cur = [];
      } else cur.push({ text: p, isBold: run.isBold });
    }
  }
  if (cur.length) out.push(cur);
  return out;
}

const wordWidth = (m: TextMeasure, w: Word, size: number) => w.reduce((s, p) => s + m.width(p.text, p.isBold, size), 0);

/** Usable horizontal span [left, right] for a line between yBottom and yTop, or null. */
type Span = (yBottom: number, yTop: number) => [number, number] | null;

interface Flow {
  lines: PlacedLine[];
  /** y of the bottom of the last line, or null if it ran out of room. */
  bottom: number | null;
}

/** Greedy word wrap from `top` downwards; lines that meet an obstacle move down until they fit or pass `floor`. */
function flowDown(m: TextMeasure, blocks: readonly { block: LabelBlock; size: number }[], top: number, floor: number, span: Span, isCentred: boolean): Flow {
  const lines: PlacedLine[] = [];
  let y = top;
  for (const { block, size } of blocks) {
    const lh = size * LINE_HEIGHT;
    const space = m.width(' ', false, size);
    const ws = words(block.runs);
    let i = 0;
    while (i < ws.length) {
      let s = span(y - lh, y);
      while (!s && y - lh >= floor) {
        y -= 1;
        s = span(y - lh, y);
      }
      if (!s || y - lh < floor - 1e-6) return { lines, bottom: null };
      const [left, right] = s;
      const avail = right - left;
      const line: Word[] = [];
      let width = 0;
      while (i < ws.length) {
        const w = wordWidth(m, ws[i]!, size);
        const next = line.length ? width + space + w : w;
        if (next > avail + 1e-6) break;
        line.push(ws[i]!);
        width = next;
        i++;
      }
      if (line.length === 0) {
        // One word is wider than the room here (beside the QR): try lower down, or give up at the floor.
        y -= 1;
        continue;
      }
      let x = isCentred ? left + (avail - width) / 2 : left;
      const pieces: PlacedPiece[] = [];
      line.forEach((w, wi) => {
        if (wi > 0) x += space;
        w.forEach((p, pi) => {
          pieces.push({ text: p.text, isBold: p.isBold, x, isWordStart: pi === 0 });
          x += m.width(p.text, p.isBold, size);
        });
      });
      // Baseline sits a descent above the line's bottom (about 0.2 em for Lato).
      lines.push({ block: block.key, sizePt: size, y: y - lh + size * 0.24, pieces });
      y -= lh;
    }
    y -= size * 0.25;
  }
  return { lines, bottom: y };
}

export interface LayoutInput {
  template: LabelTemplate;
  /** Blocks flowed from the top, in order. */
  blocks: LabelBlock[];
  /** Anchored at the bottom edge (the net quantity goes in the bottom 30 % of the panel, 21 CFR 101.105(f)). */
  bottomBlock: LabelBlock | null;
  /** Modules per side of the QR symbol without the quiet zone (e.g. 33 for version 4). */
  qrModules: number;
  /** Body size range to try, largest first. */
  maxBodyPt: number;
  minBodyPt: number;
}

export type LayoutResult = { fits: true; layout: LabelLayout } | { fits: false; smallestTriedPt: number };

/** The QR side for a label: about 36 % of the short side, at least MIN_QR_MODULE_MM per module, at most 1 in. */
export function qrSizePt(template: LabelTemplate, qrModules: number): { sizePt: number; moduleSizeMm: number } {
  const total = qrModules + 2 * QR_QUIET_ZONE_MODULES;
  const short = Math.min(template.widthPt, template.heightPt);
  const sizePt = Math.min(72, Math.max(mmToPt(MIN_QR_MODULE_MM) * total, short * 0.36));
  return { sizePt, moduleSizeMm: (sizePt / total) * (25.4 / 72) };
}

/**
 * Lays the label out: net quantity at the bottom, the QR above it at the right (mid-height on round labels),
 * everything else flowed from the top, tried from `maxBodyPt` down in 0.25 pt steps until it fits.
 * Blocks never go below their own minimum. Round labels use the circle's chord as the line width.
 */
export function layoutLabel(m: TextMeasure, input: LayoutInput): LayoutResult {
  const { template } = input;
  const W = template.widthPt;
  const H = template.heightPt;
  const inset = LABEL_INSET_PT;
  const isRound = template.shape === 'round';
  const r = W / 2;
  const circleSpan = (yb: number, yt: number): [number, number] | null => {
    const rr = r - inset;
    const dy = Math.max(Math.abs(yb - r), Math.abs(yt - r));
    if (dy >= rr) return null;
    const half = Math.sqrt(rr * rr - dy * dy);
    return [r - half, r + half];
  };
  const box = (yb: number, yt: number): [number, number] | null => (yb < inset - 1e-6 || yt > H - inset + 1e-6 ? null : [inset, W - inset]);
  const base: Span = isRound ? circleSpan : box;
  const qr = qrSizePt(template, input.qrModules);

  for (let body = input.maxBodyPt; body >= input.minBodyPt - 1e-9; body = Math.round((body - SIZE_STEP) * 100) / 100) {
    const sized = (b: LabelBlock) => ({ block: b, size: Math.max(b.minPt, body * b.scale) });
    // Bottom block: flowed in the lowest band that holds it.
    let bottomLines: PlacedLine[] = [];
    let bottomTop = inset;
    if (input.bottomBlock) {
      const s = sized(input.bottomBlock);
      let placed: Flow | null = null;
      for (let top = inset + s.size * LINE_HEIGHT; top <= H * 0.3 + s.size * LINE_HEIGHT * 3; top += 1) {
        const f = flowDown(m, [s], top, inset, base, isRound);
        if (f.bottom !== null) {
          placed = f;
          bottomTop = top;
          break;
        }
      }
      if (!placed) continue;
      bottomLines = placed.lines;
    }
    // The QR sits on the bottom block at the right; on a round label at mid-height, as far right as the circle allows.
    const q = qr.sizePt;
    const qrY = isRound ? Math.max(bottomTop + 1, r - q / 2) : bottomTop + 1;
    let qrX = W - inset - q + mmToPt(1);
    if (isRound) {
      const dy = Math.max(Math.abs(qrY - r), Math.abs(qrY + q - r));
      const reach = (r - inset) ** 2 - dy ** 2;
      if (reach <= 0) continue;
      qrX = r + Math.sqrt(reach) - q;
    }
    if (qrY + q > H - inset) continue;
    const gap = 2;
    const span: Span = (yb, yt) => {
      const s = base(yb, yt);
      if (!s) return null;
      if (yb >= qrY + q || yt <= qrY) return s;
      const right = Math.min(s[1], qrX - gap);
      return right - s[0] >= Math.min(36, W * 0.3) ? [s[0], right] : null;
    };
    const f = flowDown(m, input.blocks.map(sized), H - inset, bottomTop, span, isRound);
    if (f.bottom === null) continue;
    const sizes: LabelLayout['sizes'] = {};
    for (const b of [...input.blocks, ...(input.bottomBlock ? [input.bottomBlock] : [])]) sizes[b.key] = sized(b).size;
    return { fits: true, layout: { bodyPt: body, lines: [...f.lines, ...bottomLines], qr: { x: qrX, y: qrY, sizePt: qr.sizePt, moduleSizeMm: qr.moduleSizeMm }, sizes } };
  }
  return { fits: false, smallestTriedPt: input.minBodyPt };
}

/** The text a block was printed with, pieces joined as laid out (for checking nothing was lost). */
export function printedText(layout: LabelLayout, block: LabelBlockKey): string {
  return layout.lines
    .filter((l) => l.block === block)
    .map((l) => l.pieces.map((p, i) => (i > 0 && p.isWordStart ? ' ' : '') + p.text).join(''))
    .join(' ');
}
