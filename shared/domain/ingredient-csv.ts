import { ALLERGEN_SOURCES, normaliseName, treeNutKey, type AllergenDecl, type AllergenSource } from './allergens';

/** The columns of an ingredient spreadsheet, in the order we document them. Only label_name is required. */
export const INGREDIENT_CSV_COLUMNS = [
  { column: 'label_name', field: 'labelName', help: 'Name as printed on the package (required)' },
  { column: 'sub_ingredients', field: 'subIngredients', help: 'Ingredients of a compound ingredient in package order, separated by ";"' },
  { column: 'allergens', field: 'allergens', help: 'Separated by ";", e.g. "milk; soy; tree_nut:almond; fish:salmon"' },
  { column: 'allergens_confirmed', field: 'allergensConfirmed', help: 'yes/no: allergens checked against the package' },
  { column: 'sulphites_mg_per_kg', field: 'sulphitesMgPerKg', help: 'Total sulphur dioxide in mg/kg, blank if unknown' },
  { column: 'needs_tcs', field: 'needsTimeTemperatureControl', help: 'yes/no: needs time/temperature control for safety' },
  { column: 'supplier', field: 'supplierName', help: 'Where you buy it' },
  { column: 'supplier_item_code', field: 'supplierItemCode', help: 'The supplier\'s item or SKU code' },
  { column: 'notes', field: 'notes', help: 'Anything else' },
] as const;

export type IngredientCsvField = (typeof INGREDIENT_CSV_COLUMNS)[number]['field'];

export interface CsvCellError { field: string; message: string }

// Everyday spellings people type in a spreadsheet; the keys of ALLERGEN_SOURCES are accepted as they are.
const SOURCE_ALIASES: Record<string, AllergenSource> = {
  eggs: 'egg', dairy: 'milk', 'tree nut': 'tree_nut', 'tree nuts': 'tree_nut', tree_nuts: 'tree_nut', nut: 'tree_nut', nuts: 'tree_nut',
  peanuts: 'peanut', soya: 'soy', soybean: 'soy', soybeans: 'soy', shellfish: 'crustacean_shellfish', crustacean: 'crustacean_shellfish',
  crustaceans: 'crustacean_shellfish', molluscs: 'mollusc', mollusk: 'mollusc', sulfites: 'sulphites', sulphite: 'sulphites', sulfite: 'sulphites',
  oat: 'oats', 'sesame seeds': 'sesame',
};

/**
 * Reads an allergen cell such as "milk; tree_nut:almond; Pecans". A bare tree-nut name counts as that tree nut.
 * Returns the declarations and a message per token it could not read.
 */
export function parseAllergenCell(cell: string): { allergens: AllergenDecl[]; errors: string[] } {
  const allergens: AllergenDecl[] = [];
  const errors: string[] = [];
  for (const raw of cell.split(/[;,]/)) {
    const token = raw.trim();
    if (!token) continue;
    const [head, ...rest] = token.split(':');
    const name = normaliseName(head!).replace(/-/g, '_');
    const kind = rest.join(':').trim() || null;
    const source = (ALLERGEN_SOURCES as readonly string[]).includes(name.replace(/ /g, '_')) ? (name.replace(/ /g, '_') as AllergenSource) : SOURCE_ALIASES[name.replace(/_/g, ' ')];
    if (source) {
      allergens.push(kind ? { source, kind } : { source });
    } else if (!kind && treeNutKey(head!)) {
      allergens.push({ source: 'tree_nut', kind: normaliseName(head!) });
    } else {
      errors.push(`"${token}" is not an allergen we know. Use names like milk, egg, wheat, soy, peanut, sesame, tree_nut:almond, fish:salmon, crustacean_shellfish:shrimp.`);
    }
  }
  return { allergens, errors };
}

/** yes/no, y/n, true/false, 1/0 (blank = no). Null when the cell is something else. */
export function parseYesNo(cell: string): boolean | null {
  const v = cell.trim().toLowerCase();
  if (['', 'no', 'n', 'false', '0'].includes(v)) return false;
  if (['yes', 'y', 'true', '1'].includes(v)) return true;
  return null;
}

/** Header cells normalised: "Label Name" → "label_name". */
export function normaliseHeader(cell: string): string {
  return cell.replace(/^\uFEFF/, '').trim().toLowerCase().replace(/[\s-]+/g, '_');
}

/**
 * Turns one spreadsheet row (already keyed by normalised header) into ingredient fields. The result is not yet
 * validated against the contract (lengths, required kinds); `errors` holds what could not be read at all.
 */
export function csvRowToIngredientFields(row: Readonly<Record<string, string | undefined>>): { values: Record<IngredientCsvField, unknown>; errors: CsvCellError[] } {
  const errors: CsvCellError[] = [];
  const cell = (c: string) => (row[c] ?? '').trim();
  const allergenCell = parseAllergenCell(cell('allergens'));
  for (const message of allergenCell.errors) errors.push({ field: 'allergens', message });
  const yesNo = (column: string) => {
    const v = parseYesNo(cell(column));
    if (v === null) errors.push({ field: column, message: `Write yes or no (found "${cell(column)}").` });
    return v ?? false;
  };
  const sulphiteText = cell('sulphites_mg_per_kg').replace(',', '.');
  let sulphites: number | null = null;
  if (sulphiteText) {
    if (/^\d+(\.\d+)?$/.test(sulphiteText)) sulphites = Number(sulphiteText);
    else errors.push({ field: 'sulphites_mg_per_kg', message: `Write a number of mg/kg, or leave it blank (found "${sulphiteText}").` });
  }
  const values: Record<IngredientCsvField, unknown> = {
    labelName: cell('label_name'),
    subIngredients: cell('sub_ingredients').split(';').map((s) => s.trim()).filter(Boolean),
    allergens: allergenCell.allergens,
    allergensConfirmed: yesNo('allergens_confirmed'),
    sulphitesMgPerKg: sulphites,
    needsTimeTemperatureControl: yesNo('needs_tcs'),
    supplierName: cell('supplier'),
    supplierItemCode: cell('supplier_item_code'),
    notes: cell('notes'),
  };
  return { values, errors };
}

/** The spreadsheet column a contract field came from (for error messages that name the column). */
export function csvColumnFor(field: string): string {
  return INGREDIENT_CSV_COLUMNS.find((c) => c.field === field)?.column ?? field;
}
