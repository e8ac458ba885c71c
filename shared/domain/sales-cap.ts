import { businessLocalDate, parseInstant } from './zoned-time';

/** 'ok' below 75 %, 'warn_75' from 75 %, 'warn_90' from 90 % up to the cap, 'over' above 100 %. */
export type SalesCapLevel = 'ok' | 'warn_75' | 'warn_90' | 'over';

/** One sale (or a refund, as a negative amount) in integer cents at an ISO 8601 instant. */
export interface SaleEntry {
  soldAt: string;
  amountCents: number;
}

/** Where the business stands against its cap for the current period. */
export interface SalesCapStatus {
  /** The calendar year in the business zone that contains `now`. */
  periodYear: number;
  periodStartDate: string;
  periodEndDate: string;
  totalCents: number;
  capCents: number;
  /** Cap minus total; negative when over. */
  remainingCents: number;
  /** Share of the cap in tenths of a percent, rounded down, never below 0 (753 = 75.3 %). */
  permille: number;
  level: SalesCapLevel;
}

function assertCents(n: number, what: string): void {
  if (!Number.isSafeInteger(n)) throw new RangeError(`${what} must be a whole number of cents`);
}

/**
 * Totals the sales of the calendar year (in `timeZone`) that contains `now` against `capCents`.
 * Money is integer cents throughout; sales dated in other years are left out. Thresholds are our
 * warning points: 75 % and 90 % of the cap; 'over' only once the total exceeds the cap.
 */
export function salesCapStatus(sales: readonly SaleEntry[], capCents: number, timeZone: string, now: string): SalesCapStatus {
  assertCents(capCents, 'The cap');
  if (capCents <= 0) throw new RangeError('The cap must be more than zero');
  const year = businessLocalDate(parseInstant(now), timeZone).slice(0, 4);
  let totalCents = 0;
  for (const s of sales) {
    assertCents(s.amountCents, 'A sale amount');
    if (businessLocalDate(parseInstant(s.soldAt), timeZone).startsWith(year)) totalCents += s.amountCents;
  }
  assertCents(totalCents, 'The total');
  // Integer comparisons: total/cap ≥ 3/4 ⇔ 4·total ≥ 3·cap, and so on.
  const level: SalesCapLevel =
    totalCents > capCents ? 'over' : 10 * totalCents >= 9 * capCents ? 'warn_90' : 4 * totalCents >= 3 * capCents ? 'warn_75' : 'ok';
  // BigInt keeps the division exact; max(0, …) because a refund-only year is simply 0 %.
  const permille = Math.max(0, Number((BigInt(totalCents) * 1000n) / BigInt(capCents)));
  return {
    periodYear: Number(year),
    periodStartDate: `${year}-01-01`,
    periodEndDate: `${year}-12-31`,
    totalCents,
    capCents,
    remainingCents: capCents - totalCents,
    permille,
    level,
  };
}

/** '$1,234.56' from integer cents (US dollars); negative as '−$5.00'. */
export function formatCents(cents: number): string {
  assertCents(cents, 'The amount');
  const abs = Math.abs(cents);
  const dollars = Math.floor(abs / 100).toLocaleString('en-US');
  return `${cents < 0 ? '\u2212' : ''}$${dollars}.${String(abs % 100).padStart(2, '0')}`;
}
