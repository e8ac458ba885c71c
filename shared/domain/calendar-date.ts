const CALENDAR_DATE = /^(\d{4})-(\d{2})-(\d{2})$/;
const DAY_MS = 86_400_000;

/** A calendar date with no time and no zone, e.g. the day a batch was made. */
export interface CalendarDate {
  year: number;
  month: number;
  day: number;
}

/** True for a real proleptic-Gregorian date written 'YYYY-MM-DD' ('2025-02-29' is false). */
export function isCalendarDate(text: string): boolean {
  const m = CALENDAR_DATE.exec(text);
  if (!m) return false;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  const check = new Date(Date.UTC(y, mo - 1, d));
  return check.getUTCFullYear() === y && check.getUTCMonth() === mo - 1 && check.getUTCDate() === d;
}

/** Splits 'YYYY-MM-DD' into numbers; throws RangeError for anything that is not a real date. */
export function parseCalendarDate(text: string): CalendarDate {
  if (!isCalendarDate(text)) throw new RangeError(`Not a calendar date 'YYYY-MM-DD': ${text}`);
  const [y, m, d] = text.split('-').map(Number) as [number, number, number];
  return { year: y, month: m, day: d };
}

/**
 * Adds whole days to a calendar date. Calendar days are counted on the calendar itself (UTC is used
 * only as a day counter), so a daylight-saving change in the business zone never shifts the result.
 */
export function addCalendarDays(date: string, days: number): string {
  if (!Number.isSafeInteger(days)) throw new RangeError('Days must be a whole number');
  const { year, month, day } = parseCalendarDate(date);
  const t = new Date(Date.UTC(year, month - 1, day) + days * DAY_MS);
  return t.toISOString().slice(0, 10);
}
