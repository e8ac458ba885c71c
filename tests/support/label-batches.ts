import { eq } from 'drizzle-orm';
import { execFile } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import jsQR from 'jsqr';
import { PNG } from 'pngjs';
import type { TestApp } from './app';
import { createIngredient, createSupplierLot, createBatch } from './factories';
import { businesses } from '../../server/db/schema/business';
import { createRecipe } from '../../server/features/recipes/recipes.service';
import { changeBatchState } from '../../server/features/batches/batches.service';
import { RecipeVersionInputSchema } from '../../shared/contracts/recipes';
import type { Actor } from '../../server/lib/actor';

const run = promisify(execFile);

/** An invented business address and registration (Millbrook is invented). */
export async function setBusinessContact(t: TestApp, businessId: string, patch: Partial<typeof businesses.$inferInsert> = {}) {
  await t.db.update(businesses).set({
    name: 'Juniper Test Bakes', addressLine: '9 Alder Row', city: 'Millbrook', region: 'TX', postalCode: '78999', phone: '(555) 010-2211',
    email: 'bakes@juniper.test', registrationNumber: 'CF-TEST-0001', registrationAuthority: 'Millbrook County (invented)', ...patch,
  }).where(eq(businesses.id, businessId));
}

/**
 * A released batch of an invented product with milk, egg, wheat and pecan (US majors), 4 pieces of 28.35 g
 * per package and a 5-day shelf life, made through the recipes and batches services.
 */
export async function labelledBatch(t: TestApp, businessId: string, actor: Actor, opts: { state?: 'released' | 'in_progress'; shelfLifeDays?: number | null; waterActivity?: number } = {}) {
  const flour = await createIngredient(t, businessId, { labelName: 'Wheat flour', subIngredients: ['wheat flour', 'niacin', 'reduced iron'], allergens: [{ source: 'wheat' }] });
  const sugar = await createIngredient(t, businessId, { labelName: 'Sugar' });
  const butter = await createIngredient(t, businessId, { labelName: 'Butter', subIngredients: ['cream', 'salt'], allergens: [{ source: 'milk' }] });
  const eggs = await createIngredient(t, businessId, { labelName: 'Eggs', allergens: [{ source: 'egg' }] });
  const pecans = await createIngredient(t, businessId, { labelName: 'Pecans', allergens: [{ source: 'tree_nut', kind: 'pecan' }] });
  const all = [flour, sugar, butter, eggs, pecans];
  for (const i of all) await createSupplierLot(t, businessId, { ingredientId: i.id });
  const grams = [300, 250, 200, 100, 50];
  const input = RecipeVersionInputSchema.parse({
    name: 'Pecan Praline Pops', isSellable: true,
    components: all.map((i, n) => ({ kind: 'ingredient', ingredientId: i.id, amount: String(grams[n]), unit: 'g' })),
    pieceWeight: { amount: '28.35', unit: 'g' }, piecesPerPackage: 4, shelfLifeDays: opts.shelfLifeDays === undefined ? 5 : opts.shelfLifeDays,
    ph: 6.5, waterActivity: opts.waterActivity ?? 0.8,
  });
  const recipe = await createRecipe(t.db, actor, input, t.clock.now);
  const batch = await createBatch(t, businessId, { recipeVersionId: recipe.current.id, quantityPieces: 40, quantityPackages: 10 }, actor);
  if ((opts.state ?? 'released') === 'released') await changeBatchState(t.db, actor, batch.id, { toState: 'released', reason: 'Cooled and packed' }, t.clock.now);
  return { batch, recipe, ingredients: { flour, sugar, butter, eggs, pecans } };
}

/** Page text read back with pdfjs (legacy build): items joined with a space where they do not touch. */
export async function pdfText(bytes: Uint8Array): Promise<string[]> {
  const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
  const doc = await pdfjs.getDocument({ data: new Uint8Array(bytes), verbosity: 0 }).promise;
  const pages: string[] = [];
  for (let i = 1; i <= doc.numPages; i++) {
    const content = await (await doc.getPage(i)).getTextContent();
    let out = '';
    let prev: { x: number; y: number; w: number } | null = null;
    for (const item of content.items as { str: string; transform: number[]; width: number }[]) {
      const [x, y] = [item.transform[4]!, item.transform[5]!];
      const touches = prev && Math.abs(prev.y - y) < 0.5 && Math.abs(prev.x + prev.w - x) < 0.3;
      out += (prev && !touches ? ' ' : '') + item.str;
      prev = { x, y, w: item.width };
    }
    pages.push(out.replace(/\s+/g, ' ').trim());
  }
  await doc.destroy();
  return pages;
}

/** Renders page `page` of a PDF to PNG at `dpi` with poppler's pdftoppm (optionally a crop, in inches); answers the PNG path. */
export async function renderPdfPage(bytes: Uint8Array, page = 1, dpi = 300, crop?: { x: number; y: number; w: number; h: number }): Promise<string> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'crumbtrail-pdf-'));
  const file = path.join(dir, 'in.pdf');
  fs.writeFileSync(file, bytes);
  const area = crop ? ['-x', crop.x, '-y', crop.y, '-W', crop.w, '-H', crop.h].map((v) => (typeof v === 'number' ? String(Math.round(v * dpi)) : v)) : [];
  await run('pdftoppm', ['-r', String(dpi), '-png', '-f', String(page), '-l', String(page), ...area, '-singlefile', file, path.join(dir, 'page')]);
  return path.join(dir, 'page.png');
}

/** Decodes the QR code in a PNG with jsQR; null when none is found. */
export function decodeQr(pngPath: string): string | null {
  const png = PNG.sync.read(fs.readFileSync(pngPath));
  return jsQR(new Uint8ClampedArray(png.data.buffer, png.data.byteOffset, png.data.length), png.width, png.height)?.data ?? null;
}

/** `pdffonts` output rows: name, type, and whether each font is embedded. */
export async function pdfFonts(bytes: Uint8Array): Promise<{ name: string; type: string; embedded: boolean }[]> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'crumbtrail-pdf-'));
  const file = path.join(dir, 'in.pdf');
  fs.writeFileSync(file, bytes);
  const { stdout } = await run('pdffonts', [file]);
  return stdout.split('\n').slice(2).filter((l) => l.trim()).map((l) => {
    const m = /^(\S+)\s+(.+?)\s+(Identity-H|WinAnsi|Custom|Builtin|\S+)\s+(yes|no)\s+(yes|no)\s+(yes|no)/.exec(l);
    return { name: m?.[1] ?? l, type: m?.[2] ?? '', embedded: m?.[4] === 'yes' };
  });
}
