import { describe, expect, test } from 'vitest';
import { formatCents, salesCapStatus } from '../../../../shared/domain/sales-cap';

const CAP = 5_000_000; // $50,000.00, an invented cap for the tests
const NY = 'America/New_York';
const now = '2026-06-10T12:00:00Z';

describe('salesCapStatus thresholds (our warning points: 75 %, 90 %, over 100 %)', () => {
  test.each([
    [0, 'ok', 0],
    [3_749_999, 'ok', 749], // 74.99999 %
    [3_750_000, 'warn_75', 750], // exactly 75 %
    [4_499_999, 'warn_75', 899],
    [4_500_000, 'warn_90', 900], // exactly 90 %
    [5_000_000, 'warn_90', 1000], // at the cap is not over it
    [5_000_001, 'over', 1000],
    [7_500_000, 'over', 1500],
  ])('%i cents → %s (%i ‰)', (total, level, permille) => {
    const r = salesCapStatus([{ soldAt: now, amountCents: total }], CAP, NY, now);
    expect(r).toMatchObject({ totalCents: total, level, permille, remainingCents: CAP - total });
  });

  test('refunds reduce the total', () => {
    const r = salesCapStatus([{ soldAt: now, amountCents: 4_000_000 }, { soldAt: now, amountCents: -500_000 }], CAP, NY, now);
    expect(r).toMatchObject({ totalCents: 3_500_000, level: 'ok' });
  });
});

describe('the period is the calendar year in the business zone', () => {
  // IANA tz: New York is UTC−5 on 1 January, so 04:30Z on 1 Jan 2026 is still 31 Dec 2025 there.
  const sales = [
    { soldAt: '2026-01-01T04:30:00Z', amountCents: 1_000 }, // 2025 locally
    { soldAt: '2026-01-01T05:00:00Z', amountCents: 2_000 }, // 2026 locally (midnight)
    { soldAt: '2026-12-31T23:59:00-05:00', amountCents: 4_000 }, // 2026
    { soldAt: '2027-01-01T05:00:00Z', amountCents: 8_000 }, // 2027
  ];
  test.each([
    ['2026-01-01T04:59:59Z', 2025, 1_000],
    ['2026-01-01T05:00:00Z', 2026, 6_000],
    ['2026-12-31T23:00:00Z', 2026, 6_000],
    ['2027-01-01T05:00:00Z', 2027, 8_000],
  ])('at %s the period is %i with %i cents', (at, year, total) => {
    expect(salesCapStatus(sales, CAP, NY, at)).toMatchObject({ periodYear: year, totalCents: total, periodStartDate: `${year}-01-01`, periodEndDate: `${year}-12-31` });
  });
});

describe('money is integer cents only', () => {
  test.each([
    [[{ soldAt: now, amountCents: 10.5 }], CAP],
    [[], 100.25],
    [[], 0],
  ])('refuses %j with cap %s', (sales, cap) => {
    expect(() => salesCapStatus(sales, cap, NY, now)).toThrow(RangeError);
  });
});

describe('formatCents', () => {
  test.each([[0, '$0.00'], [5, '$0.05'], [123_456, '$1,234.56'], [5_000_000, '$50,000.00'], [-500, '\u2212$5.00']])('%i → %s', (c, text) => {
    expect(formatCents(c)).toBe(text);
  });
});
