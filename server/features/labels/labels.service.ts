import crypto from 'node:crypto';
import { and, desc, eq } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { batches, batchVersions } from '../../db/schema/batches';
import { businesses } from '../../db/schema/business';
import { recipeVersions } from '../../db/schema/recipes';
import { labelPrintRuns } from '../../db/schema/labels';
import { HttpError, badRequest, notFound } from '../../lib/http-error';
import type { Actor } from '../../lib/actor';
import { latoMeasure } from '../../lib/pdf-fonts';
import { appendRecordEvent } from '../records/record-events.service';
import { computeLabelText } from '../recipes/recipes.queries';
import { businessRuleProfile } from '../rule-profiles/rule-profiles.service';
import { hasUnresolvedHoldingViolation } from '../holding/holding.queries';
import { buildLabelPdf, qrMatrix } from './label-pdf';
import { checkLabel, formatLabelDate, type LabelCheckResult } from '../../../shared/domain/label-check';
import { printedText, type LabelBlockKey } from '../../../shared/domain/label-layout';
import { getLabelTemplate, sheetLayout, type LabelTemplate, type SheetSpec } from '../../../shared/domain/label-templates';
import type { LabelText } from '../../../shared/domain/label-text';
import { lotPageUrl } from '../../../shared/domain/lot-page-url';
import type { BatchState } from '../../../shared/domain/batch-states';
import type { LabelCheckQuery, LabelCheckView, ListPrintRunsQuery, PrintLabelsInput, PrintRun } from '../../../shared/contracts/labels';

/** What label work needs besides the actor: the clock and the public address for the QR. */
export interface LabelContext {
  now: Date;
  publicBaseUrl: string;
}

interface Prepared {
  batch: { id: string; lotCode: string; madeOn: string; bestBy: string | null; state: BatchState; productName: string };
  template: LabelTemplate;
  lotUrl: string;
  caution: string;
  check: LabelCheckResult;
}

function templateOf(id: string): LabelTemplate {
  const t = getLabelTemplate(id);
  if (!t) throw badRequest('Choose a label size from the list.', { templateId: ['Choose a label size from the list'] });
  return t;
}

/** Loads the batch's facts and runs the label check (no PDF yet). */
async function prepare(db: DbOrTx, actor: Actor, input: { batchId: string; templateId: string; confirmNeedsReview: boolean }, ctx: LabelContext): Promise<Prepared> {
  const template = templateOf(input.templateId);
  const [row] = await db
    .select({ b: batches, v: batchVersions, productName: recipeVersions.name })
    .from(batches)
    .innerJoin(batchVersions, and(eq(batchVersions.batchId, batches.id), eq(batchVersions.version, batches.currentVersion)))
    .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
    .where(and(eq(batches.id, input.batchId), eq(batches.businessId, actor.businessId)));
  if (!row) throw notFound('That batch');
  const [business] = await db.select().from(businesses).where(eq(businesses.id, actor.businessId));
  if (!business) throw notFound('That business');
  const profile = await businessRuleProfile(db, actor.businessId);
  const labelText = await computeLabelText(db, actor.businessId, row.b.recipeVersionId, profile);
  const violation = await hasUnresolvedHoldingViolation(db, actor.businessId, row.b.id, ctx.now);
  let lotUrl = '';
  try {
    lotUrl = lotPageUrl(ctx.publicBaseUrl, row.b.publicCode);
  } catch {
    // Checked below as a problem: a QR must never point at a plain-http address off this computer.
  }
  const batch = { id: row.b.id, lotCode: row.b.lotCode, madeOn: row.b.madeOn, bestBy: row.v.bestBy, state: row.b.state as BatchState, productName: row.productName };
  const check = checkLabel({
    productName: row.productName,
    labelText,
    snapshot: (row.v.labelSnapshot ?? null) as LabelText | null,
    profile,
    batch: { ...batch, hasUnresolvedHoldingViolation: violation },
    business,
    template,
    qrModules: qrMatrix(lotUrl || `https://${'x'.repeat(ctx.publicBaseUrl.length)}/lot/${row.b.publicCode}`).size,
    measure: latoMeasure(),
    confirmNeedsReview: input.confirmNeedsReview,
    actorRole: actor.role,
  });
  if (!lotUrl) {
    check.problems.push({ code: 'public_address_not_https', message: 'The app\u2019s public address (PUBLIC_BASE_URL) must use https:// so the QR code is safe to open. Ask whoever runs Crumbtrail to set it.' });
    check.ok = false;
  }
  return { batch, template, lotUrl, caution: profile.caution, check };
}

const BLOCK_ORDER: LabelBlockKey[] = ['productName', 'ingredients', 'contains', 'crossContact', 'homeKitchenStatement', 'safeHandlingStatement', 'business', 'dates', 'lot', 'netQuantity'];

function printedBlocks(check: LabelCheckResult) {
  const layout = check.layout;
  if (!layout) return [];
  return BLOCK_ORDER.filter((k) => layout.sizes[k] !== undefined).map((key) => ({ key, text: printedText(layout, key), sizePt: Math.round(layout.sizes[key]! * 100) / 100 }));
}

/** The label check for a batch and a label size, with what would print: every problem at once. */
export async function checkBatchLabel(db: DbOrTx, actor: Actor, query: LabelCheckQuery, ctx: LabelContext): Promise<LabelCheckView> {
  const p = await prepare(db, actor, query, ctx);
  return {
    ok: p.check.ok, problems: p.check.problems, warnings: p.check.warnings, needsOwnerConfirmation: p.check.needsOwnerConfirmation,
    batch: p.batch, printed: printedBlocks(p.check), minimums: p.check.minimums, lotUrl: p.lotUrl, caution: p.caution,
  };
}

/** 422 with every problem, keyed by problem code. */
function refuse(check: LabelCheckResult): never {
  const fieldErrors: Record<string, string[]> = {};
  for (const p of check.problems) (fieldErrors[p.code] ??= []).push(p.message);
  const n = check.problems.length;
  throw new HttpError(422, 'validation_failed', `These labels cannot be printed yet: ${n === 1 ? 'one problem needs' : `${n} problems need`} fixing.`, fieldErrors);
}

function sheetOf(input: PrintLabelsInput, template: LabelTemplate): SheetSpec {
  const sheet: SheetSpec = { ...input.sheet };
  if (sheetLayout(template, sheet).perPage === 0) {
    throw badRequest(`A ${template.name} label does not fit on this paper with these margins.`, { sheet: [`A ${template.name} label does not fit on this paper with these margins. Make the margins smaller or choose another paper.`] });
  }
  return sheet;
}

export interface LabelPdfAnswer {
  bytes: Uint8Array;
  filename: string;
  printRunId: string | null;
}

const fileName = (lotCode: string, kind: string) => `${kind}-${lotCode.replace(/[^A-Za-z0-9-]/g, '_')}.pdf`;

function proofOf(p: Prepared, sheet: SheetSpec, count: number) {
  const layout = sheetLayout(p.template, sheet);
  const paper = sheet.paper === 'roll' ? 'label printer (one label per page)' : `${sheet.paper === 'a4' ? 'A4' : 'US Letter'}, ${layout.columns} × ${layout.rows} per sheet`;
  return {
    title: `${p.batch.productName} \u2014 lot ${p.batch.lotCode}`,
    caution: p.caution,
    lines: [
      `${count} label${count === 1 ? '' : 's'}, ${p.template.name}, ${paper}.`,
      `Made on ${formatLabelDate(p.batch.madeOn, 'US')}${p.batch.bestBy ? `, best by ${formatLabelDate(p.batch.bestBy, 'US')}` : ''}.`,
      ...p.check.minimums.map((m) => `Smallest ${m.key === 'body' ? 'text' : 'net quantity'} allowed: ${Math.round(m.pt * 100) / 100} pt (${m.source}).`),
      ...p.check.warnings.map((w) => `Note: ${w.message}`),
      'This page is for checking only: do not put it on a package.',
    ],
  };
}

/** A preview PDF (proof page and one sheet); runs the check first, records nothing. */
export async function previewLabels(db: DbOrTx, actor: Actor, input: PrintLabelsInput, ctx: LabelContext): Promise<LabelPdfAnswer> {
  const p = await prepare(db, actor, input, ctx);
  if (!p.check.ok) refuse(p.check);
  const sheet = sheetOf(input, p.template);
  const perPage = sheetLayout(p.template, sheet).perPage;
  const pdf = await buildLabelPdf({
    layout: p.check.layout!, template: p.template, sheet, count: Math.min(input.count, perPage), lotUrl: p.lotUrl,
    title: `Label preview \u2014 ${p.batch.productName}, lot ${p.batch.lotCode}`, now: ctx.now, proof: proofOf(p, sheet, input.count),
  });
  return { bytes: pdf.bytes, filename: fileName(p.batch.lotCode, 'label-preview'), printRunId: null };
}

/** Prints labels: the check, then the PDF, then one append-only print-run row and its record event. */
export async function printLabels(db: DbOrTx, actor: Actor, input: PrintLabelsInput, ctx: LabelContext): Promise<LabelPdfAnswer> {
  const p = await prepare(db, actor, input, ctx);
  if (!p.check.ok) refuse(p.check);
  const sheet = sheetOf(input, p.template);
  const pdf = await buildLabelPdf({
    layout: p.check.layout!, template: p.template, sheet, count: input.count, lotUrl: p.lotUrl,
    title: `Labels \u2014 ${p.batch.productName}, lot ${p.batch.lotCode}`, now: ctx.now, proof: input.includeProofPage ? proofOf(p, sheet, input.count) : null,
  });
  const sha = crypto.createHash('sha256').update(pdf.bytes).digest('hex');
  const printed = printedBlocks(p.check);
  const confirmed = p.check.needsOwnerConfirmation && input.confirmNeedsReview;
  const id = await db.transaction(async (tx) => {
    const [run] = await tx
      .insert(labelPrintRuns)
      .values({
        businessId: actor.businessId, batchId: p.batch.id, templateId: p.template.id, count: input.count, pages: pdf.pages,
        sheet: { ...sheet, columns: pdf.sheet.columns, rows: pdf.sheet.rows }, includesProofPage: input.includeProofPage, confirmedNeedsReview: confirmed,
        printedText: printed, lotUrl: p.lotUrl, pdfSha256: sha, pdfBytes: pdf.bytes.length,
        printedByUserId: actor.userId, printedByName: actor.name, printedAt: ctx.now, createdAt: ctx.now, updatedAt: ctx.now,
      })
      .returning({ id: labelPrintRuns.id });
    await appendRecordEvent(tx, actor, {
      entityType: 'label_print_run', entityId: run!.id, action: 'print',
      payload: {
        batchId: p.batch.id, lotCode: p.batch.lotCode, templateId: p.template.id, count: input.count, pages: pdf.pages, paper: sheet.paper,
        pdfSha256: sha, confirmedNeedsReview: confirmed, warnings: p.check.warnings.map((w) => w.code),
      },
    }, ctx.now);
    return run!.id;
  });
  return { bytes: pdf.bytes, filename: fileName(p.batch.lotCode, 'labels'), printRunId: id };
}

/** Print history, newest first; optionally one batch's. */
export async function listPrintRuns(db: DbOrTx, actor: Actor, query: ListPrintRunsQuery): Promise<PrintRun[]> {
  const where = [eq(labelPrintRuns.businessId, actor.businessId)];
  if (query.batchId) where.push(eq(labelPrintRuns.batchId, query.batchId));
  const rows = await db
    .select({ r: labelPrintRuns, lotCode: batches.lotCode, productName: recipeVersions.name })
    .from(labelPrintRuns)
    .innerJoin(batches, eq(batches.id, labelPrintRuns.batchId))
    .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
    .where(and(...where))
    .orderBy(desc(labelPrintRuns.printedAt), desc(labelPrintRuns.createdAt))
    .limit(query.limit);
  return rows.map(({ r, lotCode, productName }) => ({
    id: r.id, batchId: r.batchId, lotCode, productName, templateId: r.templateId, templateName: getLabelTemplate(r.templateId)?.name ?? r.templateId,
    count: r.count, paper: String(r.sheet.paper ?? ''), pages: r.pages, printedByName: r.printedByName, printedAt: r.printedAt.toISOString(), pdfSha256: r.pdfSha256,
  }));
}
