import { PNG } from 'pngjs';
import { PDFDocument, StandardFonts, rgb } from 'pdf-lib';

/**
 * A small picture that looks like a package label: a coloured name band, grey bars for the ingredient
 * lines and a bold "contains" bar. Real PNG bytes, so the upload checks treat it like a phone photo.
 */
export function drawLabelPng(seed: string, width = 240, height = 160): Buffer {
  const png = new PNG({ width, height });
  let h = 0;
  for (const ch of seed) h = (h * 31 + ch.charCodeAt(0)) >>> 0;
  const band = [60 + (h % 150), 60 + ((h >> 8) % 150), 60 + ((h >> 16) % 150)];
  const lines = 3 + (h % 4);
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const i = (width * y + x) << 2;
      let c = [250, 247, 240];
      const border = x < 4 || y < 4 || x >= width - 4 || y >= height - 4;
      const inBand = y >= 10 && y < 40 && x >= 10 && x < width - 10;
      const line = Math.floor((y - 52) / 16);
      const inLine = y >= 52 && line < lines && (y - 52) % 16 < 8 && x >= 14 && x < width - 14 - ((line * 37 + h) % 60);
      const inContains = y >= height - 30 && y < height - 18 && x >= 14 && x < width / 2 + (h % 40);
      if (border) c = band;
      else if (inBand) c = band;
      else if (inLine) c = [150, 150, 150];
      else if (inContains) c = [40, 40, 40];
      png.data[i] = c[0]!; png.data[i + 1] = c[1]!; png.data[i + 2] = c[2]!; png.data[i + 3] = 255;
    }
  }
  return PNG.sync.write(png);
}

/** A one-page PDF spec sheet with the ingredient's declared text, as a supplier would send. */
export async function drawSpecSheetPdf(title: string, lines: string[]): Promise<Buffer> {
  const doc = await PDFDocument.create();
  const page = doc.addPage([420, 300]);
  const font = await doc.embedFont(StandardFonts.Helvetica);
  const bold = await doc.embedFont(StandardFonts.HelveticaBold);
  page.drawText(title, { x: 24, y: 260, size: 16, font: bold, color: rgb(0.1, 0.1, 0.1) });
  lines.forEach((l, i) => page.drawText(l, { x: 24, y: 230 - i * 18, size: 10, font, maxWidth: 372 }));
  return Buffer.from(await doc.save());
}
