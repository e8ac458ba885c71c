import { TZDate } from '@date-fns/tz';
import { getDayOfYear, getISODay, getISOWeek, getISOWeekYear } from 'date-fns';
import { parseCalendarDate } from './calendar-date';

export { businessLocalDate } from './zoned-time';

/**
 * Lot-code scheme. A template is literal text plus tokens in braces:
 *
 * | token    | meaning                                             | 2026-12-01, seq 1 |
 * |----------|-----------------------------------------------------|-------------------|
 * | {PREFIX} | the business's lot prefix (A–Z, 0–9, 1–8 chars)     | JL                |
 * | {YYYY}   | calendar year                                       | 2026              |
 * | {YY}     | calendar year, last two digits                      | 26                |
 * | {Y}      | calendar year, last digit (repeats every 10 years)  | 6                 |
 * | {DDD}    | ordinal day of the year, 001–366 (ISO 8601 ordinal) | 335               |
 * | {MM}     | month 01–12                                         | 12                |
 * | {DD}     | day of month 01–31                                  | 01                |
 * | {GGGG}   | ISO 8601 week-numbering year                        | 2026              |
 * | {GG}     | ISO week-numbering year, last two digits            | 26                |
 * | {WW}     | ISO 8601 week 01–53                                 | 49                |
 * | {D}      | ISO 8601 weekday, Monday 1 … Sunday 7               | 2                 |
 * | {SEQ}    | batch number within the day, at least 2 digits      | 01                |
 *
 * "Julian" codes such as YYDDD are industry practice with no governing standard; the ordinal day
 * is the ISO 8601 ordinal date, not the astronomical Julian Day Number.
 */
export const LOT_CODE_TOKENS = ['PREFIX', 'YYYY', 'YY', 'Y', 'DDD', 'MM', 'DD', 'GGGG', 'GG', 'WW', 'D', 'SEQ'] as const;

/** One of the tokens a template may use, without braces. */
export type LotCodeToken = (typeof LOT_CODE_TOKENS)[number];

/** Gives e.g. 'JL-26335-01' for prefix JL, 1 Dec 2026, first batch of the day. */
export const DEFAULT_LOT_CODE_TEMPLATE = '{PREFIX}-{YY}{DDD}-{SEQ}';

/**
 * GS1 AI (10) batch/lot is X..20, so codes stay within 20 characters and within the characters
 * that survive printing, scanning and spreadsheets.
 */
export const LOT_CODE_MAX_LENGTH = 20;

const PREFIX_PATTERN = /^[A-Z0-9]{1,8}$/;
const LITERAL_PATTERN = /^[A-Za-z0-9\-./_]*$/;
const PIECE = /\{([^{}]*)\}|([^{}]+)|([{}])/g;

/** An ISO 8601 week date: 2024-12-30 is 2025-W01-1. */
export interface IsoWeekDate {
  weekYear: number;
  week: number;
  weekday: number;
  /** 'YYYY-Www-D' */
  text: string;
}

/** What formatLotCode needs: madeOn is the calendar date in the business zone (see businessLocalDate). */
export interface LotCodeInput {
  prefix: string;
  madeOn: string;
  seq: number;
}

function asUtcDay(date: string): TZDate {
  const { year, month, day } = parseCalendarDate(date);
  return new TZDate(year, month - 1, day, 'UTC');
}

/** Ordinal day of the year for 'YYYY-MM-DD': 1 for 1 January, 366 for 31 December of a leap year. */
export function ordinalDay(date: string): number {
  return getDayOfYear(asUtcDay(date));
}

/** ISO 8601 week date (Monday-first weeks; week 1 contains the year's first Thursday) of 'YYYY-MM-DD'. */
export function isoWeekDate(date: string): IsoWeekDate {
  const d = asUtcDay(date);
  const weekYear = getISOWeekYear(d);
  const week = getISOWeek(d);
  const weekday = getISODay(d);
  return { weekYear, week, weekday, text: `${weekYear}-W${String(week).padStart(2, '0')}-${weekday}` };
}

type Piece = { token: string } | { literal: string } | { stray: string };

function pieces(template: string): Piece[] {
  return [...template.matchAll(PIECE)].map((m) =>
    m[1] !== undefined ? { token: m[1] } : m[2] !== undefined ? { literal: m[2] } : { stray: m[3]! },
  );
}

const isToken = (t: string): t is LotCodeToken => (LOT_CODE_TOKENS as readonly string[]).includes(t);

/**
 * Checks a lot-code template. Returns messages for the user; an empty list means the template is usable.
 * A usable template names one day exactly (a year with {DDD}, a year with {MM} and {DD}, or an ISO
 * week-year with {WW} and {D}) and includes {SEQ}, so that no two batches ever share a code.
 * {Y} is accepted (common practice) although its codes repeat every ten years.
 */
export function validateLotCodeTemplate(template: string): string[] {
  const messages: string[] = [];
  const used = new Set<string>();
  for (const p of pieces(template)) {
    if ('stray' in p) messages.push(`The template has an unmatched "${p.stray}".`);
    else if ('literal' in p && !LITERAL_PATTERN.test(p.literal)) {
      messages.push(`Use only letters, digits and - . / _ between tokens (found "${p.literal}").`);
    } else if ('token' in p) {
      if (!isToken(p.token)) messages.push(`{${p.token}} is not a lot-code token. Use ${LOT_CODE_TOKENS.map((t) => `{${t}}`).join(' ')}.`);
      else if (used.has(p.token)) messages.push(`{${p.token}} appears more than once.`);
      used.add(p.token);
    }
  }
  const has = (...t: LotCodeToken[]) => t.some((x) => used.has(x));
  const calendarYear = has('YYYY', 'YY', 'Y');
  const namesDay =
    (calendarYear && used.has('DDD')) ||
    (calendarYear && used.has('MM') && used.has('DD')) ||
    (has('GGGG', 'GG') && used.has('WW') && used.has('D'));
  if (!namesDay) {
    messages.push('Include a full date so codes are unique per day: {YY}{DDD}, {YYYY}{MM}{DD}, or {GGGG}{WW}{D}.');
  }
  if (has('WW') && calendarYear && !has('GGGG', 'GG')) {
    messages.push('With {WW} use the ISO week-year {GGGG} or {GG}: around New Year the week belongs to the other year.');
  }
  if (!used.has('SEQ')) messages.push('Include {SEQ} so two batches made on the same day get different codes.');
  if (template.includes('{SEQ}') && !/\{SEQ\}$|\{SEQ\}[^{]/.test(template)) {
    messages.push('Put a separator or the end of the code right after {SEQ}, so batch 1 and batch 10 cannot run into the next token.');
  }
  return messages;
}

/**
 * Fills a lot-code template. Throws RangeError with a user-facing message when the template is not
 * valid (see validateLotCodeTemplate), the prefix is not 1–8 capital letters or digits, madeOn is not
 * a real 'YYYY-MM-DD' date, seq is not a whole number from 1, or the code would exceed 20 characters.
 */
export function formatLotCode(template: string, input: LotCodeInput): string {
  const problems = validateLotCodeTemplate(template);
  if (problems.length > 0) throw new RangeError(problems.join(' '));
  if (template.includes('{PREFIX}') && !PREFIX_PATTERN.test(input.prefix)) {
    throw new RangeError('The lot prefix must be 1 to 8 capital letters or digits.');
  }
  if (!Number.isSafeInteger(input.seq) || input.seq < 1) throw new RangeError('The batch number must be a whole number from 1.');
  const { year, month, day } = parseCalendarDate(input.madeOn);
  const week = isoWeekDate(input.madeOn);
  const p = (n: number, w: number) => String(n).padStart(w, '0');
  const values: Record<LotCodeToken, string> = {
    PREFIX: input.prefix,
    YYYY: p(year, 4),
    YY: p(year % 100, 2),
    Y: String(year % 10),
    DDD: p(ordinalDay(input.madeOn), 3),
    MM: p(month, 2),
    DD: p(day, 2),
    GGGG: p(week.weekYear, 4),
    GG: p(week.weekYear % 100, 2),
    WW: p(week.week, 2),
    D: String(week.weekday),
    SEQ: p(input.seq, 2),
  };
  const code = pieces(template)
    .map((x) => ('token' in x ? values[x.token as LotCodeToken] : 'literal' in x ? x.literal : ''))
    .join('');
  if (code.length > LOT_CODE_MAX_LENGTH) {
    throw new RangeError(`The lot code ${code} is longer than ${LOT_CODE_MAX_LENGTH} characters; shorten the template or prefix.`);
  }
  return code;
}
