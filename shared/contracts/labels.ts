import { z } from 'zod';
import { LABEL_TEMPLATE_IDS } from '../domain/label-templates';

const UuidSchema = z.string().uuid('That id is not valid');
const Mm = (what: string) => z.coerce.number(`Enter the ${what} in mm`).min(0, 'Cannot be negative').max(60, 'At most 60 mm');

export const LabelTemplateIdSchema = z.enum(LABEL_TEMPLATE_IDS, 'Choose a label size');

/** Sheets of labels (Letter or A4) with margins and gutters, or one label per page for a label printer. */
export const SheetInputSchema = z.object({
  paper: z.enum(['letter', 'a4', 'roll'], 'Choose Letter, A4 or a label printer'),
  marginTopMm: Mm('top margin').default(12.7),
  marginLeftMm: Mm('left margin').default(12.7),
  marginRightMm: Mm('right margin').default(12.7),
  marginBottomMm: Mm('bottom margin').default(12.7),
  gutterXMm: Mm('gap between columns').default(3),
  gutterYMm: Mm('gap between rows').default(3),
});
export type SheetInput = z.infer<typeof SheetInputSchema>;

/** POST /api/labels/print-runs (owner, baker): answers the PDF and records the run. */
export const PrintLabelsInputSchema = z
  .object({
    batchId: UuidSchema,
    templateId: LabelTemplateIdSchema,
    count: z.coerce.number('Enter how many labels').int('Enter a whole number').min(1, 'Print at least one label').max(1000, 'Print at most 1000 labels at a time'),
    sheet: SheetInputSchema,
    /** A first page with the caution, the check results and a size ruler; never on the label stock itself. */
    includeProofPage: z.boolean().default(false),
    /** Owner only: printing a batch made while the product assessment said "needs review". */
    confirmNeedsReview: z.boolean().default(false),
  })
  .strict();
export type PrintLabelsInput = z.infer<typeof PrintLabelsInputSchema>;
export type PrintLabelsFormInput = z.input<typeof PrintLabelsInputSchema>;

/** GET /api/labels/check and /api/labels/preview query. */
export const LabelCheckQuerySchema = z.object({
  batchId: UuidSchema,
  templateId: LabelTemplateIdSchema,
  confirmNeedsReview: z.enum(['true', 'false']).default('false').transform((v) => v === 'true'),
});
export type LabelCheckQuery = z.infer<typeof LabelCheckQuerySchema>;

export const LabelProblemSchema = z.object({ code: z.string(), message: z.string() });
export type LabelProblem = z.infer<typeof LabelProblemSchema>;

/** GET /api/labels/check: the label check for a batch and a label size, with what would print. */
export const LabelCheckViewSchema = z.object({
  ok: z.boolean(),
  problems: z.array(LabelProblemSchema),
  warnings: z.array(LabelProblemSchema),
  needsOwnerConfirmation: z.boolean(),
  batch: z.object({ id: z.string(), lotCode: z.string(), productName: z.string(), madeOn: z.string(), bestBy: z.string().nullable(), state: z.string() }),
  /** The text blocks as they would print, with their sizes in points; empty when it does not fit. */
  printed: z.array(z.object({ key: z.string(), text: z.string(), sizePt: z.number() })),
  minimums: z.array(z.object({ key: z.string(), pt: z.number(), source: z.string() })),
  lotUrl: z.string(),
  caution: z.string(),
});
export type LabelCheckView = z.infer<typeof LabelCheckViewSchema>;

export const ListPrintRunsQuerySchema = z.object({ batchId: UuidSchema.optional(), limit: z.coerce.number().int().min(1).max(200).default(50) });
export type ListPrintRunsQuery = z.infer<typeof ListPrintRunsQuerySchema>;

export const PrintRunSchema = z.object({
  id: z.string(),
  batchId: z.string(),
  lotCode: z.string(),
  productName: z.string(),
  templateId: z.string(),
  templateName: z.string(),
  count: z.number().int(),
  paper: z.string(),
  pages: z.number().int(),
  printedByName: z.string(),
  printedAt: z.string(),
  pdfSha256: z.string(),
});
export type PrintRun = z.infer<typeof PrintRunSchema>;
