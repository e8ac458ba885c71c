import { describe, expect, test } from 'vitest';
import {
  businessLocalDate,
  DEFAULT_LOT_CODE_TEMPLATE,
  formatLotCode,
  isoWeekDate,
  ordinalDay,
  validateLotCodeTemplate,
} from '../../../../shared/domain/lot-codes';

// Check values computed with Python datetime (date.timetuple().tm_yday, date.isocalendar()) and
// spot-checked with date-fns 4 and luxon 3; definitions per ISO 8601-1:2019 ordinal and week dates.
const ISO_8601_CHECKS: Array<[string, number, string]> = [
  ['2024-03-01', 61, '2024-W09-5'], // leap year: Feb has 29 days
  ['2025-03-01', 60, '2025-W09-6'],
  ['2020-12-31', 366, '2020-W53-4'],
  ['2021-01-03', 3, '2020-W53-7'], // belongs to the previous week-year
  ['2024-12-30', 365, '2025-W01-1'], // belongs to the next week-year
  ['2024-12-31', 366, '2025-W01-2'],
  ['2025-12-31', 365, '2026-W01-3'],
  ['2026-01-01', 1, '2026-W01-4'],
  ['2027-01-01', 1, '2026-W53-5'],
];

describe('ordinalDay and isoWeekDate', () => {
  test.each(ISO_8601_CHECKS)('%s is ordinal day %i and ISO week date %s', (date, ordinal, week) => {
    expect(ordinalDay(date)).toBe(ordinal);
    expect(isoWeekDate(date).text).toBe(week);
  });

  test('the ordinal day counts every day of a leap year once, 1 to 366', () => {
    // Gregorian rule: 2024 is divisible by 4 and not by 100, so it has 366 days.
    const seen: number[] = [];
    for (let t = Date.UTC(2024, 0, 1); t < Date.UTC(2025, 0, 1); t += 86_400_000) {
      seen.push(ordinalDay(new Date(t).toISOString().slice(0, 10)));
    }
    expect(seen).toEqual(Array.from({ length: 366 }, (_, i) => i + 1));
  });

  test.each(['2025-02-29', '2026-13-01', '26-01-01', '2026-1-1', ''])('refuses %j', (bad) => {
    expect(() => ordinalDay(bad)).toThrow(RangeError);
  });
});

describe('formatLotCode', () => {
  test.each([
    // Ordinal "Julian" codes are industry practice: YYDDD (99001 = 1999-01-01), YDDD (4061 = 2024-03-01).
    [DEFAULT_LOT_CODE_TEMPLATE, '2026-12-01', 1, 'JL-26335-01'],
    ['{YY}{DDD}-{SEQ}', '1999-01-01', 3, '99001-03'],
    ['{Y}{DDD}{SEQ}', '2024-03-01', 12, '406112'],
    ['{PREFIX}{YYYY}{MM}{DD}-{SEQ}', '2024-02-29', 2, 'JL20240229-02'],
    // ISO week-year differs from the calendar year at 2024-12-30 (2025-W01-1) and 2027-01-01 (2026-W53-5).
    ['{PREFIX}-{GG}W{WW}{D}-{SEQ}', '2024-12-30', 1, 'JL-25W011-01'],
    ['{GGGG}-{WW}-{D}.{SEQ}', '2027-01-01', 7, '2026-53-5.07'],
    ['{PREFIX}-{YY}{DDD}-{SEQ}', '2020-12-31', 100, 'JL-20366-100'], // SEQ grows past two digits
  ])('%s for %s batch %i gives %s', (template, madeOn, seq, code) => {
    expect(formatLotCode(template, { prefix: 'JL', madeOn, seq })).toBe(code);
  });

  test.each([
    [{ prefix: 'jl', madeOn: '2026-12-01', seq: 1 }, /prefix/],
    [{ prefix: 'JUNIPERLANE', madeOn: '2026-12-01', seq: 1 }, /prefix/],
    [{ prefix: 'JL', madeOn: '2026-12-01', seq: 0 }, /batch number/],
    [{ prefix: 'JL', madeOn: '2026-12-01', seq: 1.5 }, /batch number/],
    [{ prefix: 'JL', madeOn: '2026-02-29', seq: 1 }, /calendar date/],
  ])('refuses %j', (input, message) => {
    expect(() => formatLotCode(DEFAULT_LOT_CODE_TEMPLATE, input)).toThrow(message);
  });

  test('refuses a code longer than GS1 AI (10) allows (X..20, GS1 General Specifications)', () => {
    expect(() => formatLotCode('{PREFIX}-{YYYY}{MM}{DD}-{DDD}-{SEQ}', { prefix: 'JUNIPER', madeOn: '2026-12-01', seq: 1 })).toThrow(/20 characters/);
  });

  test('refuses an invalid template with its messages', () => {
    expect(() => formatLotCode('{PREFIX}-{SEQ}', { prefix: 'JL', madeOn: '2026-12-01', seq: 1 })).toThrow(/full date/);
  });
});

describe('validateLotCodeTemplate', () => {
  test.each([
    DEFAULT_LOT_CODE_TEMPLATE,
    '{YYYY}{MM}{DD}{SEQ}',
    '{Y}{DDD}-{SEQ}',
    '{PREFIX}/{GGGG}W{WW}{D}/{SEQ}',
  ])('%s is usable', (template) => {
    expect(validateLotCodeTemplate(template)).toEqual([]);
  });

  test.each([
    ['{PREFIX}-{SEQ}', /full date/],
    ['{PREFIX}-{YY}{DDD}', /\{SEQ\}/],
    ['{YY}{MM}-{SEQ}', /full date/], // month without day repeats all month
    ['{DDD}-{SEQ}', /full date/], // ordinal day without year repeats every year
    ['{YY}W{WW}{D}-{SEQ}', /ISO week-year/], // 2024-12-30 is 2025-W01-1, which would read as 24W01 (Jan 2024)
    ['{YY}{DDD}-{SEQ}{MM}', /separator/],
    ['{YY}{DDD}-{SEQ}-{LOT}', /not a lot-code token/],
    ['{YY}{DDD}-{SEQ}-{SEQ}', /more than once/],
    ['{YY}{DDD} {SEQ}', /letters, digits/],
    ['{YY}{DDD}-{SEQ', /unmatched/],
  ])('%s is refused', (template, message) => {
    const messages = validateLotCodeTemplate(template);
    expect(messages.some((m) => message.test(m))).toBe(true);
  });
});

describe('businessLocalDate', () => {
  test.each([
    // IANA tz database: New York is UTC−5 in winter, so 03:30Z on 1 Dec is still 30 Nov locally.
    ['2026-12-01T03:30:00Z', 'America/New_York', '2026-11-30'],
    ['2026-12-01T05:00:00Z', 'America/New_York', '2026-12-01'],
    // London is UTC+1 (BST) in summer: 23:30Z on 30 June is 1 July locally.
    ['2026-06-30T23:30:00Z', 'Europe/London', '2026-07-01'],
    ['2026-12-31T23:59:59Z', 'Europe/London', '2026-12-31'],
  ])('%s in %s is %s', (instant, zone, date) => {
    expect(businessLocalDate(new Date(instant), zone)).toBe(date);
  });

  test('refuses an unknown zone', () => {
    expect(() => businessLocalDate(new Date(), 'Millbrook/Nowhere')).toThrow(RangeError);
  });
});
