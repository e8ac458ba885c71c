import { PDFDocument, rgb, type PDFFont, type PDFPage } from 'pdf-lib';
import { embedLato } from '../../lib/pdf-fonts';
import { formatCents } from '../../../shared/domain/sales-cap';
import type { TraceResult } from '../../../shared/contracts/trace';

const A4 = { w: 595.28, h: 841.89 };
const MARGIN = 48;

/** Printable trace report (A4, Lato embedded): start, batches as an indented tree, supplier lots, customers. */
export async function renderTraceReportPdf(result: TraceResult, businessName: string, timeZone: string): Promise<Uint8Array> {
  const doc = await PDFDocument.create();
  doc.setTitle(`Trace report: ${result.start.label}`);
  doc.setProducer('Crumbtrail');
  const fonts = await embedLato(doc);
  const supported = new Set(fonts.regular.getCharacterSet());
  // User-typed names may hold characters Lato lacks; those print as '?' rather than failing the report.
  const clean = (s: string) => [...s].map((ch) => (supported.has(ch.codePointAt(0)!) ? ch : '?')).join('');
  let page: PDFPage = doc.addPage([A4.w, A4.h]);
  let y = A4.h - MARGIN;
  const line = (text: string, opts: { size?: number; bold?: boolean; indent?: number } = {}) => {
    const size = opts.size ?? 10;
    const font: PDFFont = opts.bold ? fonts.bold : fonts.regular;
    const x = MARGIN + (opts.indent ?? 0);
    const max = A4.w - MARGIN - x;
    const words = clean(text).split(/\s+/);
    let current = '';
    const rows: string[] = [];
    for (const w of words) {
      const next = current ? `${current} ${w}` : w;
      if (font.widthOfTextAtSize(next, size) > max && current) {
        rows.push(current);
        current = w;
      } else current = next;
    }
    rows.push(current);
    for (const row of rows) {
      if (y < MARGIN + size) {
        page = doc.addPage([A4.w, A4.h]);
        y = A4.h - MARGIN;
      }
      page.drawText(row, { x, y: y - size, size, font, color: rgb(0, 0, 0) });
      y -= size * 1.4;
    }
  };
  const gap = () => { y -= 6; };
  const when = new Date(result.generatedAt).toLocaleString('en-US', { timeZone, dateStyle: 'long', timeStyle: 'short' });
  line(`Trace report — ${businessName}`, { size: 16, bold: true });
  line(`${result.direction === 'forward' ? 'Forward' : 'Backward'} from ${result.start.label}. Made ${when} (${timeZone}).`);
  line(`${result.batches.length} batches found.`);
  gap();
  if (result.direction === 'backward') {
    line('Supplier lots that went in', { size: 12, bold: true });
    if (result.supplierLots.length === 0) line('None recorded.');
    for (const l of result.supplierLots) line(`${l.ingredientName}, lot ${l.lotCode} (received ${l.receivedOn})`, { indent: 12 });
    for (const u of result.unrecordedIngredients) line(`No lot noted for ${u.ingredientName}.`, { indent: 12 });
    gap();
  }
  line('Batches', { size: 12, bold: true });
  const printed = new Set<string>();
  const walk = (id: string, depth: number) => {
    const b = result.batches.find((x) => x.id === id);
    if (!b || printed.has(id)) return;
    printed.add(id);
    const sales = b.sales.count ? `${b.sales.count} sales, ${formatCents(b.sales.amountCents)}, ${b.sales.customerCount} customers` : 'no sales';
    line(`${depth ? 'made with the above: ' : ''}${b.lotCode} — ${b.productName}, made ${b.madeOn}, ${b.state.replace('_', ' ')}; ${sales}${b.lotNotRecorded ? '; lot not recorded' : ''}`, { indent: 12 + depth * 14 });
    for (const c of result.batches.filter((x) => x.madeFromBatchIds.includes(id))) walk(c.id, depth + 1);
  };
  for (const b of result.batches.filter((x) => x.madeFromBatchIds.length === 0)) walk(b.id, 0);
  for (const b of result.batches) walk(b.id, 0);
  if (result.direction === 'forward') {
    gap();
    line(`Customers (${result.customers.length}; ${result.consentingCustomerCount} agreed to recall notices)`, { size: 12, bold: true });
    const lot = (id: string) => result.batches.find((b) => b.id === id)?.lotCode ?? '';
    result.customers.forEach((c, i) => {
      const who = c.contact === undefined ? `Customer ${i + 1}` : c.contact ? [c.contact.name, c.contact.email, c.contact.phone].filter(Boolean).join(', ') : 'Erased on request';
      const consent = c.contact ? (c.contact.recallConsent ? 'agreed to notices' : 'no consent to notices') : '';
      line(`${who}${consent ? ` (${consent})` : ''}: ${c.batchIds.map(lot).join(', ')}`, { indent: 12 });
    });
  }
  return doc.save();
}
