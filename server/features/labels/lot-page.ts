import crypto from 'node:crypto';
import { and, eq } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { batches, batchVersions } from '../../db/schema/batches';
import { businesses } from '../../db/schema/business';
import { recipeVersions } from '../../db/schema/recipes';
import { computeLabelText } from '../recipes/recipes.queries';
import { formatLabelDate } from '../../../shared/domain/label-check';
import type { LabelText } from '../../../shared/domain/label-text';
import { PUBLIC_CODE_PATTERN } from '../../../shared/domain/lot-page-url';
import { diffLabelText, summariseLabelText, type LabelTextChange } from '../../../shared/domain/recipe-label';

/** The public notice of a recalled batch, from the recall feature; null when it has none. */
export type RecallNoticeProvider = (db: DbOrTx, businessId: string, batchId: string) => Promise<string | null>;
let recallNoticeProvider: RecallNoticeProvider | null = null;

/** The recall feature registers where a batch's public recall notice comes from. */
export function registerRecallNoticeProvider(provider: RecallNoticeProvider | null): void {
  recallNoticeProvider = provider;
}

export interface LotPageView {
  productName: string;
  lotCode: string;
  madeOn: string;
  bestBy: string | null;
  regime: 'US' | 'EU' | 'UK';
  ingredients: { text: string; isAllergen: boolean }[];
  allergenLine: string;
  isEmphasis: boolean;
  business: { name: string; town: string; phone: string; email: string };
  recall: { notice: string | null } | null;
  /** What changed in the label text since the lot was made (same recipe version, corrected declarations). */
  corrections: LabelTextChange[];
}

/** Fields compared for the correction notice: what a customer relies on. */
const CORRECTION_FIELDS = new Set(['ingredientStatement', 'containsLine', 'allergens']);

function allergenLine(t: LabelText): string {
  const a = t.allergenStatement;
  if (a.containsLine) return a.containsLine;
  if (a.allergens.length === 0) return a.regime.code === 'US' ? 'No major food allergens are declared in the ingredients.' : 'No allergens are declared in the ingredients.';
  const names = a.allergens.map((x) => (x.kinds.length ? `${x.name} (${x.kinds.join(', ')})` : x.isKindMissing ? `${x.name} (kind not stated)` : x.name));
  return `${a.isEmphasisRequired ? 'Allergens (in bold in the ingredients)' : 'Contains'}: ${names.join(', ')}`;
}

/** The public view of a lot by its public code, or null. Reads only what the lot page may show. */
export async function loadLotPage(db: DbOrTx, publicCode: string): Promise<LotPageView | null> {
  if (!PUBLIC_CODE_PATTERN.test(publicCode)) return null;
  const [row] = await db
    .select({ b: batches, v: batchVersions, business: businesses, productName: recipeVersions.name })
    .from(batches)
    .innerJoin(batchVersions, and(eq(batchVersions.batchId, batches.id), eq(batchVersions.version, batches.currentVersion)))
    .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
    .innerJoin(businesses, eq(businesses.id, batches.businessId))
    .where(eq(batches.publicCode, publicCode));
  if (!row) return null;
  const { b, v, business } = row;
  const text = await computeLabelText(db, b.businessId, b.recipeVersionId);
  const snapshot = (v.labelSnapshot ?? null) as LabelText | null;
  const corrections = snapshot
    ? diffLabelText(summariseLabelText(snapshot), summariseLabelText(text)).filter((c) => CORRECTION_FIELDS.has(c.field))
    : [];
  let recall: LotPageView['recall'] = null;
  if (b.state === 'recalled') {
    const notice = recallNoticeProvider ? await recallNoticeProvider(db, b.businessId, b.id) : null;
    recall = { notice };
  }
  return {
    productName: row.productName,
    lotCode: b.lotCode,
    madeOn: b.madeOn,
    bestBy: v.bestBy,
    regime: text.allergenStatement.regime.code,
    ingredients: text.ingredientStatement.segments,
    allergenLine: allergenLine(text),
    isEmphasis: text.allergenStatement.isEmphasisRequired,
    business: {
      name: business.name,
      town: [business.city, business.region].filter((s) => s.trim()).join(', '),
      phone: business.phone,
      email: business.email,
    },
    recall,
    corrections,
  };
}

const esc = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

// One column, ink on white, system fonts (nothing to download); large enough to read on a small phone.
const CSS = [
  'body{margin:0;font:17px/1.5 system-ui,-apple-system,"Segoe UI",Roboto,sans-serif;color:#111;background:#fff}',
  'main{max-width:34rem;margin:0 auto;padding:1rem}',
  'h1{font-size:1.6rem;line-height:1.2;margin:.25rem 0 1rem}',
  'h2{font-size:1.05rem;margin:1.25rem 0 .25rem}',
  'p{margin:.25rem 0}',
  '.box{border:4px solid #b3261e;padding:.5rem 1rem .75rem;margin:0 0 1.25rem}',
  '.box h2{margin:.25rem 0;color:#b3261e;font-size:1.3rem}',
  '.fix{border-color:#7a4f00}.fix h2{color:#7a4f00}',
  '.allergens{font-size:1.25rem;font-weight:700;border-left:6px solid #111;padding:.25rem .75rem;margin:1rem 0}',
  'dl{margin:.5rem 0}dt{font-weight:700;margin-top:.5rem}dd{margin:0}',
  'a{color:#2f4f7f}',
  '.note{border-top:1px solid #767676;margin-top:1.5rem;padding-top:.75rem}',
  'footer{font-size:.9rem;color:#444;margin-top:1.5rem}',
].join('');

/** sha256 of the inline style, for the page's own Content-Security-Policy (no 'unsafe-inline'). */
const CSS_HASH = crypto.createHash('sha256').update(CSS).digest('base64');

/** CSP of the lot page: nothing may load; only our one inline style block runs. */
export const LOT_PAGE_CSP = `default-src 'none'; style-src 'sha256-${CSS_HASH}'; base-uri 'none'; form-action 'none'; frame-ancestors 'none'`;

function page(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1"><meta name="robots" content="noindex,nofollow"><title>${esc(title)}</title><style>${CSS}</style></head><body><main>${body}</main></body></html>`;
}

const CROSS_CONTACT = 'Made in a home kitchen that may also handle other allergens: ask the baker.';

/**
 * An ingredient whose own sub-ingredients changed shows up as removed and added under the same name;
 * a customer reads that better as one change ("changed to Sprinkles (…)").
 */
function pairChanges(added: readonly string[], removed: readonly string[]): { changed: string[]; added: string[]; removed: string[] } {
  const name = (x: string) => x.split(' (')[0]!.trim().toLowerCase();
  const left = [...removed];
  const changed: string[] = [];
  const onlyAdded: string[] = [];
  for (const a of added) {
    const i = left.findIndex((r) => name(r) === name(a));
    if (i >= 0) { changed.push(a); left.splice(i, 1); } else onlyAdded.push(a);
  }
  return { changed, added: onlyAdded, removed: left };
}

/** The lot page HTML: recall or correction notice first, then the allergen line, ingredients, dates and contact. */
export function renderLotPage(v: LotPageView): string {
  const parts: string[] = [];
  const contact = [
    v.business.phone ? `phone <a href="tel:${esc(v.business.phone.replace(/[^0-9+]/g, ''))}">${esc(v.business.phone)}</a>` : '',
    v.business.email ? `e-mail <a href="mailto:${esc(v.business.email)}">${esc(v.business.email)}</a>` : '',
  ].filter(Boolean).join(' or ');
  if (v.recall) {
    parts.push(`<section class="box" role="alert"><h2>Recall: do not eat this product</h2>${v.recall.notice ? `<p>${esc(v.recall.notice)}</p>` : ''}<p>${esc(v.business.name)} has recalled lot ${esc(v.lotCode)}. Do not eat it; keep it or throw it away${contact ? `, and contact ${esc(v.business.name)} (${contact})` : ''}.</p></section>`);
  }
  if (v.corrections.length) {
    const items = v.corrections.map((c) => {
      const { changed, added, removed } = pairChanges(c.added, c.removed);
      const detail = changed.length || added.length || removed.length
        ? [
            ...changed.map((x) => `changed to ${esc(x)}`),
            added.length ? `added ${added.map(esc).join(', ')}` : '',
            removed.length ? `removed ${removed.map(esc).join(', ')}` : '',
          ].filter(Boolean).join('; ')
        : `now: ${esc(c.after)}`;
      return `<li>${esc(c.label)}: ${detail}</li>`;
    });
    parts.push(`<section class="box fix" role="alert"><h2>Corrected information</h2><p>The ingredient or allergen information for this product was corrected after this lot was made. The label on your package may be out of date: go by this page.</p><ul>${items.join('')}</ul></section>`);
  }
  parts.push(`<h1>${esc(v.productName)}</h1>`);
  parts.push(`<p class="allergens">${esc(v.allergenLine)}</p>`);
  const ingredients = v.ingredients.map((s) => (v.isEmphasis && s.isAllergen ? `<b>${esc(s.text)}</b>` : esc(s.text))).join('');
  if (ingredients) parts.push(`<h2>Ingredients</h2><p>${ingredients.replace(/^Ingredients:\s*/, '')}</p>`);
  parts.push(`<p class="note"><b>Allergy caution:</b> ${CROSS_CONTACT}</p>`);
  const dates = [`<dt>Made on</dt><dd>${esc(formatLabelDate(v.madeOn, v.regime))}</dd>`];
  if (v.bestBy) dates.push(`<dt>Best by</dt><dd>${esc(formatLabelDate(v.bestBy, v.regime))}</dd>`);
  dates.push(`<dt>Lot</dt><dd>${esc(v.lotCode)}</dd>`);
  parts.push(`<dl>${dates.join('')}</dl>`);
  parts.push(`<h2>Made by</h2><p>${esc(v.business.name)}${v.business.town ? `, ${esc(v.business.town)}` : ''}</p>${contact ? `<p>Questions: ${contact}.</p>` : ''}`);
  parts.push('<footer>This page shows what the baker recorded for this lot. If you have an allergy, ask the baker before eating.</footer>');
  return page(`${v.productName} \u2014 lot ${v.lotCode}`, parts.join(''));
}

/** The 404 page, in the same style. */
export function renderLotNotFound(): string {
  return page('Lot not found', '<h1>We could not find this lot</h1><p>Check the code on the label, or contact the business that sold the product.</p>');
}

/** The 429 page. */
export function renderLotTooMany(): string {
  return page('Please wait', '<h1>Too many requests</h1><p>Please wait a minute and try again.</p>');
}
