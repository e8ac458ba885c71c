import fs from 'node:fs';
import { createRequire } from 'node:module';
import fontkit from '@pdf-lib/fontkit';
import type { PDFDocument, PDFFont } from 'pdf-lib';
import type { TextMeasure } from '../../shared/domain/label-layout';

// Lato TTF (covers latin-ext). Web fonts (woff/woff2) draw blank or wrong glyphs in PDFs, so never use them here.
const require = createRequire(import.meta.url);
const FILES = {
  regular: '@expo-google-fonts/lato/400Regular/Lato_400Regular.ttf',
  bold: '@expo-google-fonts/lato/700Bold/Lato_700Bold.ttf',
} as const;
export type PdfFontWeight = keyof typeof FILES;

const cache = new Map<PdfFontWeight, Uint8Array>();

/** The TTF bytes of Lato Regular or Bold, read once per process. */
export function latoBytes(weight: PdfFontWeight): Uint8Array {
  let bytes = cache.get(weight);
  if (!bytes) {
    bytes = new Uint8Array(fs.readFileSync(require.resolve(FILES[weight])));
    cache.set(weight, bytes);
  }
  return bytes;
}

export interface PdfFonts {
  regular: PDFFont;
  bold: PDFFont;
}

/** Registers fontkit and embeds Lato 400/700 as subset TrueType fonts (FontFile2), for every PDF we make. */
export async function embedLato(doc: PDFDocument): Promise<PdfFonts> {
  doc.registerFontkit(fontkit);
  const [regular, bold] = await Promise.all([doc.embedFont(latoBytes('regular'), { subset: true }), doc.embedFont(latoBytes('bold'), { subset: true })]);
  return { regular, bold };
}

/** Lato's x-height per em (xHeight / unitsPerEm from the font's OS/2 table): 1013/2000 and 1026/2000. */
export const LATO_X_HEIGHT_PER_EM = { regular: 1013 / 2000, bold: 1026 / 2000 } as const;

interface FontkitFont {
  unitsPerEm: number;
  layout(text: string): { glyphs: { advanceWidth: number }[] };
}
let measure: TextMeasure | undefined;

/**
 * Text widths of Lato as pdf-lib draws it (sum of glyph advance widths, no kerning), for laying labels out
 * before a PDF exists. Widths at 1 pt are cached per string.
 */
export function latoMeasure(): TextMeasure {
  if (measure) return measure;
  const fonts = { regular: fontkit.create(latoBytes('regular')) as unknown as FontkitFont, bold: fontkit.create(latoBytes('bold')) as unknown as FontkitFont };
  const widths = new Map<string, number>();
  measure = {
    xHeightPerEm: LATO_X_HEIGHT_PER_EM,
    width(text, isBold, sizePt) {
      const key = `${isBold ? 'b' : 'r'}${text}`;
      let w = widths.get(key);
      if (w === undefined) {
        const f = isBold ? fonts.bold : fonts.regular;
        w = f.layout(text).glyphs.reduce((s, g) => s + g.advanceWidth, 0) / f.unitsPerEm;
        if (widths.size > 50_000) widths.clear();
        widths.set(key, w);
      }
      return w * sizePt;
    },
  };
  return measure;
}
