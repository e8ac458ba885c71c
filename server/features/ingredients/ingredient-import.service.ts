import { parse } from 'csv-parse/sync';
import type { Db } from '../../db/client';
import type { Actor } from '../../lib/actor';
import { HttpError } from '../../lib/http-error';
import { CreateIngredientInputSchema, type ImportPreview, type ImportPreviewRow, type ImportResult } from '../../../shared/contracts/ingredients';
import { INGREDIENT_CSV_COLUMNS, csvColumnFor, csvRowToIngredientFields, normaliseHeader } from '../../../shared/domain/ingredient-csv';
import { normaliseName } from '../../../shared/domain/allergens';
import { insertIngredient } from './ingredients.service';
import { currentIngredientVersions } from './ingredients.queries';

const MAX_ROWS = 1000;
const KNOWN = new Set<string>(INGREDIENT_CSV_COLUMNS.map((c) => c.column));

/** Reads a spreadsheet export row by row; nothing is written. Row numbers count the header as row 1. */
export async function previewImport(db: Db, actor: Actor, csv: string): Promise<ImportPreview> {
  let records: string[][];
  try {
    records = parse(csv, { bom: true, skip_empty_lines: true, relax_column_count: true, trim: false });
  } catch (err) {
    return { rows: [], validCount: 0, errorCount: 0, fileErrors: [`The file is not valid CSV: ${(err as Error).message.split('\n')[0]}`] };
  }
  const [header, ...body] = records;
  const fileErrors: string[] = [];
  const columns = (header ?? []).map(normaliseHeader);
  if (!columns.includes('label_name')) fileErrors.push('The first row must be a header with at least a "label_name" column.');
  const unknown = columns.filter((c) => c && !KNOWN.has(c));
  if (unknown.length) fileErrors.push(`Unknown column${unknown.length > 1 ? 's' : ''}: ${unknown.join(', ')}. Use: ${[...KNOWN].join(', ')}.`);
  if (body.length > MAX_ROWS) fileErrors.push(`At most ${MAX_ROWS} rows per import; this file has ${body.length}.`);
  if (fileErrors.length) return { rows: [], validCount: 0, errorCount: 0, fileErrors };

  const existing = new Set((await currentIngredientVersions(db, actor.businessId)).filter((v) => !v.isArchived).map((v) => normaliseName(v.labelName)));
  const seen = new Map<string, number>();
  const rows = body.map((cells, i): ImportPreviewRow => {
    const rowNumber = i + 2;
    const record = Object.fromEntries(columns.map((c, j) => [c, cells[j] ?? '']));
    const { values, errors: cellErrors } = csvRowToIngredientFields(record);
    const errors = cellErrors.map((e) => ({ rowNumber, ...e }));
    const parsed = CreateIngredientInputSchema.safeParse(values);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const [field, index, sub] = issue.path.map(String);
        const detail = field === 'allergens' && index !== undefined && sub ? ` (allergen ${Number(index) + 1})` : '';
        if (!errors.some((e) => e.field === csvColumnFor(field!))) errors.push({ rowNumber, field: csvColumnFor(field!), message: issue.message + detail });
      }
    }
    const name = normaliseName(String(values.labelName ?? ''));
    if (name && existing.has(name)) errors.push({ rowNumber, field: 'label_name', message: `"${values.labelName}" is already on your ingredient list.` });
    else if (name && seen.has(name)) errors.push({ rowNumber, field: 'label_name', message: `Same name as row ${seen.get(name)}.` });
    if (name && !seen.has(name)) seen.set(name, rowNumber);
    return { rowNumber, ingredient: errors.length === 0 && parsed.success ? parsed.data : null, errors };
  });
  const validCount = rows.filter((r) => r.ingredient).length;
  return { rows, validCount, errorCount: rows.length - validCount, fileErrors: [] };
}

/** Re-reads the same CSV and writes every valid row in one transaction, one record event per ingredient. */
export async function confirmImport(db: Db, actor: Actor, csv: string, now: Date): Promise<ImportResult> {
  const preview = await previewImport(db, actor, csv);
  if (preview.fileErrors.length) throw new HttpError(400, 'validation_failed', preview.fileErrors.join(' '), { file: preview.fileErrors });
  if (preview.validCount === 0) throw new HttpError(400, 'validation_failed', 'No row can be imported: fix the rows marked with errors and try again.', { file: ['No valid rows.'] });
  const valid = preview.rows.filter((r) => r.ingredient);
  const created = await db.transaction(async (tx) => {
    const out: ImportResult['created'] = [];
    for (const row of valid) {
      const id = await insertIngredient(tx, actor, row.ingredient!, now, { importedFromRow: row.rowNumber });
      out.push({ rowNumber: row.rowNumber, id, labelName: row.ingredient!.labelName });
    }
    return out;
  });
  return { created, skipped: preview.rows.filter((r) => !r.ingredient) };
}
