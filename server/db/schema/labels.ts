import { pgTable, text, uuid, integer, jsonb, boolean, timestamp, index } from 'drizzle-orm/pg-core';
import { timestamps } from './columns';
import { businesses } from './business';
import { users } from './auth';
import { batches } from './batches';

/**
 * Append-only: one row per printed run of labels (who, when, which batch, how many, which size and sheet),
 * with the printed text and the PDF's SHA-256 so the record shows exactly what went on the packages.
 */
export const labelPrintRuns = pgTable(
  'label_print_runs',
  {
    id: uuid().primaryKey().defaultRandom(),
    businessId: uuid().notNull().references(() => businesses.id),
    batchId: uuid().notNull().references(() => batches.id),
    templateId: text().notNull(),
    count: integer().notNull(),
    pages: integer().notNull(),
    /** Paper, margins and gutters as requested, plus the computed rows × columns. */
    sheet: jsonb().$type<Record<string, unknown>>().notNull(),
    includesProofPage: boolean().notNull().default(false),
    /** The owner confirmed a batch made while the product assessment said "needs review". */
    confirmedNeedsReview: boolean().notNull().default(false),
    /** The printed blocks: [{ key, text, sizePt }]. */
    printedText: jsonb().$type<{ key: string; text: string; sizePt: number }[]>().notNull(),
    lotUrl: text().notNull(),
    pdfSha256: text().notNull(),
    pdfBytes: integer().notNull(),
    printedByUserId: uuid().references(() => users.id),
    printedByName: text().notNull(),
    printedAt: timestamp({ withTimezone: true }).notNull(),
    ...timestamps,
  },
  (t) => [index('label_print_runs_business_id_printed_at_idx').on(t.businessId, t.printedAt), index('label_print_runs_batch_id_idx').on(t.batchId)],
);
export type LabelPrintRunRow = typeof labelPrintRuns.$inferSelect;
