import { PDFDocument, PrintScaling, rgb, type PDFPage } from 'pdf-lib';
import QRCode from 'qrcode';
import { embedLato, type PdfFonts } from '../../lib/pdf-fonts';
import { QR_QUIET_ZONE_MODULES, type LabelLayout } from '../../../shared/domain/label-layout';
import { sheetLayout, type LabelTemplate, type SheetLayout, type SheetSpec } from '../../../shared/domain/label-templates';
import { mmToPt } from '../../../shared/domain/label-format';

const INK = rgb(0, 0, 0);

/** QR error correction M (about 15 % of codewords recoverable, ISO/IEC 18004): survives print wear, keeps modules large. */
export const QR_ERROR_CORRECTION = 'M' as const;

/** The QR symbol for a URL: modules per side (no quiet zone) and whether module (row, col) is dark. */
export function qrMatrix(url: string): { size: number; isDark: (row: number, col: number) => boolean } {
  const qr = QRCode.create(url, { errorCorrectionLevel: QR_ERROR_CORRECTION });
  return { size: qr.modules.size, isDark: (r, c) => Boolean(qr.modules.get(r, c)) };
}

/** Draws the QR with its quiet zone left blank; dark modules in one row are merged into one rectangle. */
function drawQr(page: PDFPage, url: string, x: number, y: number, sizePt: number) {
  const m = qrMatrix(url);
  const unit = sizePt / (m.size + 2 * QR_QUIET_ZONE_MODULES);
  const x0 = x + QR_QUIET_ZONE_MODULES * unit;
  const top = y + sizePt - QR_QUIET_ZONE_MODULES * unit;
  for (let r = 0; r < m.size; r++) {
    let c = 0;
    while (c < m.size) {
      if (!m.isDark(r, c)) {
        c++;
        continue;
      }
      const start = c;
      while (c < m.size && m.isDark(r, c)) c++;
      // A hair of overlap so anti-aliased viewers show no seams between modules.
      page.drawRectangle({ x: x0 + start * unit, y: top - (r + 1) * unit, width: (c - start) * unit + 0.01, height: unit + 0.01, color: INK });
    }
  }
}

/** Draws one label with its lower-left corner at (ox, oy). */
function drawLabel(page: PDFPage, fonts: PdfFonts, layout: LabelLayout, lotUrl: string, ox = 0, oy = 0) {
  for (const line of layout.lines) {
    for (const p of line.pieces) {
      page.drawText(p.text, { x: ox + p.x, y: oy + line.y, size: line.sizePt, font: p.isBold ? fonts.bold : fonts.regular, color: INK });
    }
  }
  drawQr(page, lotUrl, ox + layout.qr.x, oy + layout.qr.y, layout.qr.sizePt);
}

export interface ProofPage {
  title: string;
  lines: string[];
  caution: string;
}

export interface LabelPdfInput {
  layout: LabelLayout;
  template: LabelTemplate;
  sheet: SheetSpec;
  count: number;
  lotUrl: string;
  title: string;
  now: Date;
  /** A first page with the caution and a size check; the label stock pages carry only labels. */
  proof?: ProofPage | null;
}

export interface LabelPdf {
  bytes: Uint8Array;
  pages: number;
  sheet: SheetLayout;
}

function wrap(text: string, width: number, measure: (s: string) => number): string[] {
  const out: string[] = [];
  let line = '';
  for (const word of text.split(/\s+/)) {
    const next = line ? `${line} ${word}` : word;
    if (measure(next) > width && line) {
      out.push(line);
      line = word;
    } else line = next;
  }
  if (line) out.push(line);
  return out;
}

function drawProofPage(doc: PDFDocument, fonts: PdfFonts, input: LabelPdfInput, label: Awaited<ReturnType<PDFDocument['embedPdf']>>[number], sheet: SheetLayout) {
  const page = doc.addPage([sheet.pageWidthPt, sheet.pageHeightPt]);
  const W = sheet.pageWidthPt;
  const margin = Math.min(mmToPt(12), W * 0.08);
  const width = W - 2 * margin;
  let y = sheet.pageHeightPt - margin - 14;
  const text = (s: string, size: number, bold = false) => {
    const font = bold ? fonts.bold : fonts.regular;
    for (const l of wrap(s, width, (t) => font.widthOfTextAtSize(t, size))) {
      page.drawText(l, { x: margin, y, size, font, color: INK });
      y -= size * 1.3;
    }
    y -= size * 0.4;
  };
  const small = W < 300;
  text(input.proof!.title, small ? 9 : 14, true);
  text(`Caution: ${input.proof!.caution}`, small ? 6 : 9, true);
  text('Print at 100 % ("actual size"); do not fit to page. The line below must measure 1 in (25.4 mm).', small ? 6 : 9);
  page.drawLine({ start: { x: margin, y }, end: { x: margin + 72, y }, thickness: 1, color: INK });
  page.drawLine({ start: { x: margin, y: y - 3 }, end: { x: margin, y: y + 3 }, thickness: 1, color: INK });
  page.drawLine({ start: { x: margin + 72, y: y - 3 }, end: { x: margin + 72, y: y + 3 }, thickness: 1, color: INK });
  y -= 14;
  for (const l of input.proof!.lines) text(l, small ? 6 : 9);
  // One label at actual size with its outline, for checking against the stock.
  const { widthPt: w, heightPt: h } = input.template;
  if (y - h > margin) {
    const x = margin;
    const by = y - h;
    page.drawPage(label, { x, y: by, width: w, height: h });
    const grey = rgb(0.55, 0.55, 0.55);
    if (input.template.shape === 'round') page.drawEllipse({ x: x + w / 2, y: by + h / 2, xScale: w / 2, yScale: h / 2, borderColor: grey, borderWidth: 0.5 });
    else page.drawRectangle({ x, y: by, width: w, height: h, borderColor: grey, borderWidth: 0.5 });
  }
}

/**
 * The label PDF: the label is drawn once (Lato embedded, subset) and placed as a form XObject in every slot,
 * so a sheet of 30 stays small. Letter/A4 sheets use the computed rows × columns; 'roll' gives one label per
 * page. The viewer is asked not to scale when printing (PrintScaling None).
 */
export async function buildLabelPdf(input: LabelPdfInput): Promise<LabelPdf> {
  const single = await PDFDocument.create();
  const singleFonts = await embedLato(single);
  const lp = single.addPage([input.template.widthPt, input.template.heightPt]);
  drawLabel(lp, singleFonts, input.layout, input.lotUrl);
  const labelBytes = await single.save();

  const doc = await PDFDocument.create();
  doc.setTitle(input.title);
  doc.setProducer('Crumbtrail');
  doc.setCreator('Crumbtrail');
  doc.setCreationDate(input.now);
  doc.setModificationDate(input.now);
  doc.catalog.getOrCreateViewerPreferences().setPrintScaling(PrintScaling.None);
  const [label] = await doc.embedPdf(labelBytes, [0]);
  const sheet = sheetLayout(input.template, input.sheet);
  if (sheet.perPage === 0) throw new Error('The label does not fit on the sheet.');
  let pages = 0;
  if (input.proof) {
    drawProofPage(doc, await embedLato(doc), input, label!, sheet);
    pages++;
  }
  let left = input.count;
  while (left > 0) {
    const page = doc.addPage([sheet.pageWidthPt, sheet.pageHeightPt]);
    pages++;
    for (const slot of sheet.slots.slice(0, Math.min(left, sheet.perPage))) {
      page.drawPage(label!, { x: slot.x, y: slot.y, width: input.template.widthPt, height: input.template.heightPt });
    }
    left -= sheet.perPage;
  }
  return { bytes: await doc.save(), pages, sheet };
}
