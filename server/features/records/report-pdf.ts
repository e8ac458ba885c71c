import { PDFDocument, rgb, type PDFFont, type PDFPage, type RGB } from 'pdf-lib';
import { embedLato, type PdfFonts } from '../../lib/pdf-fonts';

const INK = rgb(0.1, 0.1, 0.1);
const MUTED = rgb(0.33, 0.33, 0.33);
const RULE = rgb(0.75, 0.75, 0.75);
const CAUTION_FILL = rgb(1, 0.96, 0.85);
const CAUTION_EDGE = rgb(0.6, 0.42, 0);
const BAD = rgb(0.62, 0.07, 0.07);

/** US Letter and A4 in points (1 pt = 1/72 in). */
export const PAGE_SIZES = { letter: [612, 792], a4: [595.28, 841.89] } as const;
const MARGIN = 48;
const FOOTER_SPACE = 36;

export interface ReportPart {
  name: string;
  bytes: Uint8Array;
}

export interface ReportPdfOptions {
  /** File name stem: parts are `<stem>.pdf`, then `<stem>-part-2.pdf` … */
  stem: string;
  title: string;
  /** Printed at the foot of every page (export time, range, chain head). */
  footer: string[];
  paper: keyof typeof PAGE_SIZES;
  /** A part is closed and handed over once it has this many pages, so a long section never sits whole in memory. */
  maxPagesPerPart: number;
  onPart: (part: ReportPart) => Promise<void>;
  createdAt: Date;
}

export interface TableColumn {
  header: string;
  /** Share of the text width. */
  width: number;
}

// Lato covers Latin, Latin-1 and Latin Extended; control characters would draw as boxes.
// eslint-disable-next-line no-control-regex -- stripping control characters is the point
const printable = (s: string) => s.replace(/[\u0000-\u0008\u000b-\u001f\u007f]/g, ' ').replace(/\t/g, '  ');

/**
 * A plain report written page by page with pdf-lib and embedded Lato (every font embedded, as
 * PDF/A asks: veraPDF clause 6.2.11.4), split into parts of at most `maxPagesPerPart` pages.
 */
export class ReportPdf {
  private doc: PDFDocument | null = null;
  private fonts!: PdfFonts;
  private page!: PDFPage;
  private y = 0;
  private part = 0;
  private pageInPart = 0;
  private tableState: { columns: TableColumn[] } | null = null;
  readonly parts: string[] = [];

  constructor(private readonly opts: ReportPdfOptions) {}

  private get size() {
    return PAGE_SIZES[this.opts.paper];
  }
  private get textWidth() {
    return this.size[0] - 2 * MARGIN;
  }

  private async newPage(): Promise<void> {
    if (this.doc && this.pageInPart >= this.opts.maxPagesPerPart) await this.flushPart();
    if (!this.doc) {
      this.doc = await PDFDocument.create();
      this.doc.setTitle(this.part === 0 ? this.opts.title : `${this.opts.title} (part ${this.part + 1})`);
      this.doc.setProducer('Crumbtrail');
      this.doc.setCreator('Crumbtrail audit packet');
      this.doc.setCreationDate(this.opts.createdAt);
      this.doc.setModificationDate(this.opts.createdAt);
      this.fonts = await embedLato(this.doc);
      this.pageInPart = 0;
    }
    this.page = this.doc.addPage([this.size[0], this.size[1]]);
    this.pageInPart += 1;
    this.y = this.size[1] - MARGIN;
    this.drawFooter();
    if (this.tableState) this.drawTableHeader(this.tableState.columns);
  }

  private drawFooter(): void {
    const lines = [...this.opts.footer, `${this.opts.title}${this.part ? `, part ${this.part + 1}` : ''} \u00b7 page ${this.pageInPart}`];
    let y = MARGIN - 12;
    this.page.drawLine({ start: { x: MARGIN, y: MARGIN - 4 }, end: { x: this.size[0] - MARGIN, y: MARGIN - 4 }, thickness: 0.5, color: RULE });
    for (const line of lines) {
      this.page.drawText(this.fit(printable(line), this.fonts.regular, 7), { x: MARGIN, y, size: 7, font: this.fonts.regular, color: MUTED });
      y -= 9;
    }
  }

  private fit(text: string, font: PDFFont, size: number, width = this.textWidth): string {
    if (font.widthOfTextAtSize(text, size) <= width) return text;
    let t = text;
    while (t.length > 1 && font.widthOfTextAtSize(`${t}\u2026`, size) > width) t = t.slice(0, -1);
    return `${t}\u2026`;
  }

  /** Splits text into lines that fit `width` (words broken only when a word alone is too wide). */
  wrap(text: string, font: PDFFont, size: number, width: number): string[] {
    const out: string[] = [];
    for (const para of printable(text).split(/\r\n|\r|\n/)) {
      let line = '';
      for (const word of para.split(' ')) {
        const next = line ? `${line} ${word}` : word;
        if (font.widthOfTextAtSize(next, size) <= width) {
          line = next;
          continue;
        }
        if (line) out.push(line);
        let rest = word;
        while (font.widthOfTextAtSize(rest, size) > width && rest.length > 1) {
          let n = rest.length - 1;
          while (n > 1 && font.widthOfTextAtSize(rest.slice(0, n), size) > width) n--;
          out.push(rest.slice(0, n));
          rest = rest.slice(n);
        }
        line = rest;
      }
      out.push(line);
    }
    return out;
  }

  private async room(height: number): Promise<void> {
    if (!this.doc) await this.newPage();
    if (this.y - height < MARGIN + FOOTER_SPACE) await this.newPage();
  }

  /** Starts the report (or a section) on a fresh page. */
  async section(title: string): Promise<void> {
    this.tableState = null;
    if (!this.doc || this.y < this.size[1] - MARGIN) await this.newPage();
    await this.heading(title, 16);
  }

  async heading(text: string, size = 12): Promise<void> {
    this.tableState = null;
    const lines = this.wrap(text, (await this.ensureFonts()).bold, size, this.textWidth);
    await this.room(lines.length * size * 1.3 + 8);
    this.y -= 4;
    for (const l of lines) {
      this.y -= size * 1.25;
      this.page.drawText(l, { x: MARGIN, y: this.y, size, font: this.fonts.bold, color: INK });
    }
    this.y -= 6;
  }

  private async ensureFonts(): Promise<PdfFonts> {
    if (!this.doc) await this.newPage();
    return this.fonts;
  }

  async text(text: string, opts: { size?: number; bold?: boolean; color?: 'ink' | 'muted' | 'bad'; indent?: number } = {}): Promise<void> {
    const size = opts.size ?? 9.5;
    const fonts = await this.ensureFonts();
    const font = opts.bold ? fonts.bold : fonts.regular;
    const indent = opts.indent ?? 0;
    const color: RGB = opts.color === 'muted' ? MUTED : opts.color === 'bad' ? BAD : INK;
    for (const l of this.wrap(text, font, size, this.textWidth - indent)) {
      await this.room(size * 1.35);
      this.y -= size * 1.35;
      this.page.drawText(l, { x: MARGIN + indent, y: this.y, size, font, color });
    }
  }

  /** "Label: value" lines with the labels in bold. */
  async fields(pairs: ReadonlyArray<readonly [string, string]>): Promise<void> {
    const size = 9.5;
    const fonts = await this.ensureFonts();
    const labelWidth = Math.min(170, Math.max(...pairs.map(([k]) => fonts.bold.widthOfTextAtSize(`${k}:`, size))) + 8);
    for (const [k, v] of pairs) {
      const lines = this.wrap(v || '\u2014', fonts.regular, size, this.textWidth - labelWidth);
      await this.room(lines.length * size * 1.35);
      this.y -= size * 1.35;
      this.page.drawText(this.fit(`${k}:`, fonts.bold, size, labelWidth - 4), { x: MARGIN, y: this.y, size, font: fonts.bold, color: INK });
      lines.forEach((l, i) => {
        if (i > 0) this.y -= size * 1.35;
        this.page.drawText(l, { x: MARGIN + labelWidth, y: this.y, size, font: fonts.regular, color: INK });
      });
    }
    this.y -= 4;
  }

  /** A boxed caution (local rules win over anything in this report). */
  async caution(title: string, body: string): Promise<void> {
    const fonts = await this.ensureFonts();
    const size = 9;
    const lines = this.wrap(body, fonts.regular, size, this.textWidth - 20);
    const height = (lines.length + 1) * size * 1.4 + 16;
    await this.room(height + 6);
    this.y -= 6;
    this.page.drawRectangle({ x: MARGIN, y: this.y - height, width: this.textWidth, height, color: CAUTION_FILL, borderColor: CAUTION_EDGE, borderWidth: 1 });
    let y = this.y - 8 - size * 1.2;
    this.page.drawText(this.fit(title, fonts.bold, size + 0.5, this.textWidth - 20), { x: MARGIN + 10, y, size: size + 0.5, font: fonts.bold, color: INK });
    for (const l of lines) {
      y -= size * 1.4;
      this.page.drawText(l, { x: MARGIN + 10, y, size, font: fonts.regular, color: INK });
    }
    this.y -= height + 6;
  }

  private drawTableHeader(columns: TableColumn[]): void {
    const size = 8;
    this.y -= size * 1.5;
    let x = MARGIN;
    for (const c of columns) {
      const w = c.width * this.textWidth;
      this.page.drawText(this.fit(c.header, this.fonts.bold, size, w - 4), { x, y: this.y, size, font: this.fonts.bold, color: INK });
      x += w;
    }
    this.y -= 4;
    this.page.drawLine({ start: { x: MARGIN, y: this.y }, end: { x: MARGIN + this.textWidth, y: this.y }, thickness: 0.6, color: INK });
  }

  /** Starts a table; its header repeats on every page it runs onto. */
  async table(columns: TableColumn[]): Promise<void> {
    await this.ensureFonts();
    await this.room(40);
    this.tableState = { columns };
    this.drawTableHeader(columns);
  }

  async row(cells: ReadonlyArray<string | null>, opts: { color?: 'ink' | 'bad' } = {}): Promise<void> {
    const columns = this.tableState?.columns;
    if (!columns) throw new Error('row() outside a table');
    const size = 8;
    const wrapped = columns.map((c, i) => this.wrap(cells[i] ?? '', this.fonts.regular, size, c.width * this.textWidth - 6).slice(0, 8));
    const lines = Math.max(1, ...wrapped.map((w) => w.length));
    await this.room(lines * size * 1.3 + 4);
    const top = this.y;
    let x = MARGIN;
    wrapped.forEach((cellLines, i) => {
      cellLines.forEach((l, j) => this.page.drawText(l, { x, y: top - (j + 1) * size * 1.3, size, font: this.fonts.regular, color: opts.color === 'bad' ? BAD : INK }));
      x += columns[i]!.width * this.textWidth;
    });
    this.y = top - lines * size * 1.3 - 3;
    this.page.drawLine({ start: { x: MARGIN, y: this.y }, end: { x: MARGIN + this.textWidth, y: this.y }, thickness: 0.3, color: RULE });
  }

  endTable(): void {
    this.tableState = null;
    this.y -= 6;
  }

  private async flushPart(): Promise<void> {
    if (!this.doc) return;
    const name = this.part === 0 ? `${this.opts.stem}.pdf` : `${this.opts.stem}-part-${this.part + 1}.pdf`;
    const bytes = await this.doc.save({ useObjectStreams: true });
    this.doc = null;
    this.part += 1;
    this.parts.push(name);
    await this.opts.onPart({ name, bytes });
  }

  /** Closes the last part. */
  async finish(): Promise<void> {
    if (!this.doc && this.parts.length === 0) await this.newPage();
    this.tableState = null;
    await this.flushPart();
  }
}
