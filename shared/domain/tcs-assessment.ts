/**
 * Whether a food needs time/temperature control for safety, from its pH and water activity, by the FDA
 * Food Code 1-201.10(B) "TCS food" interaction tables. A "product assessment required" cell is returned as
 * 'needs_review' and must never be shown as safe.
 */
export type TcsResult = 'non_tcs' | 'needs_review' | 'unknown';

export interface TcsInput {
  ph?: number | null;
  /** Water activity, 0–1. */
  aw?: number | null;
  /** Heat-treated to destroy vegetative cells (e.g. baked). */
  isHeatTreated: boolean;
  /** Packaged after the heat treatment (prevents recontamination). */
  isPackaged: boolean;
}

export interface TcsAssessment {
  result: TcsResult;
  table: 'A' | 'B';
  reason: string;
}

const has = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);

/**
 * Food Code 1-201.10(B) Table A (heat-treated and packaged) or Table B (otherwise). When one value alone
 * decides (e.g. aw ≤ 0.92 in Table A), the other may be missing; otherwise missing values give 'unknown'.
 */
export function assessTcs(input: TcsInput): TcsAssessment {
  const table = input.isHeatTreated && input.isPackaged ? 'A' : 'B';
  const ph = has(input.ph) ? input.ph : null;
  const aw = has(input.aw) ? input.aw : null;
  if (ph !== null && (ph < 0 || ph > 14)) return { result: 'unknown', table, reason: 'pH must be between 0 and 14.' };
  if (aw !== null && (aw < 0 || aw > 1)) return { result: 'unknown', table, reason: 'Water activity must be between 0 and 1.' };
  const cell = table === 'A' ? tableA(ph, aw) : tableB(ph, aw);
  const reason =
    cell === 'non_tcs' ? `Not TCS under Food Code 1-201.10(B) Table ${table}.`
    : cell === 'needs_review' ? `Food Code 1-201.10(B) Table ${table}: product assessment required. Treat as needing time/temperature control until assessed.`
    : 'Enter the pH and water activity of the finished product to assess it.';
  return { result: cell, table, reason };
}

// Table A — heat-treated and packaged: aw ≤ 0.92 | > 0.92–0.95 | > 0.95 by pH ≤ 4.6 | > 4.6–5.6 | > 5.6.
function tableA(ph: number | null, aw: number | null): TcsResult {
  if (aw !== null && aw <= 0.92) return 'non_tcs';
  if (ph !== null && ph <= 4.6) return 'non_tcs';
  if (aw === null || ph === null) return 'unknown';
  if (aw <= 0.95) return ph <= 5.6 ? 'non_tcs' : 'needs_review';
  return 'needs_review';
}

// Table B — not heat-treated, or not packaged: aw < 0.88 | 0.88–0.90 | > 0.90–0.92 | > 0.92
// by pH < 4.2 | 4.2–4.6 | > 4.6–5.0 | > 5.0.
function tableB(ph: number | null, aw: number | null): TcsResult {
  if (aw !== null && aw < 0.88) return 'non_tcs';
  if (ph !== null && ph < 4.2) return 'non_tcs';
  if (aw === null || ph === null) return 'unknown';
  if (aw <= 0.9) return ph <= 5.0 ? 'non_tcs' : 'needs_review';
  if (aw <= 0.92) return ph <= 4.6 ? 'non_tcs' : 'needs_review';
  return 'needs_review';
}
