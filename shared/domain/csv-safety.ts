/**
 * Characters that make a spreadsheet treat a cell as a formula: = + - @, TAB (0x09), CR (0x0D)
 * (OWASP "CSV Injection"), plus NUL. LF is left to the CSV writer's quoting (RFC 4180).
 */
const FORMULA_START = /^[=+\-@\t\r\0]/;

/**
 * Makes one CSV cell safe to open in a spreadsheet: a value starting with a formula character gets a
 * leading apostrophe (OWASP CSV Injection guidance), so "=HYPERLINK(…)" shows as text. This applies
 * to negative numbers too ("-18" becomes "'-18"), because the check cannot know the column's meaning.
 * Quoting of commas, quotes and line breaks is the CSV writer's job (RFC 4180). null/undefined → ''.
 * Every CSV export passes every cell through this.
 */
export function escapeFormulaCell(value: string | number | boolean | null | undefined): string {
  if (value === null || value === undefined) return '';
  const text = String(value);
  return FORMULA_START.test(text) ? `'${text}` : text;
}
