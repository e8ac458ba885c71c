import { describe, expect, test } from 'vitest';
import { assertTransition, BATCH_STATES, bestByDate, canTransition, type BatchState } from '../../../../shared/domain/batch-states';

// Our documented batch life-cycle (the allowed moves are a product rule, not a regulation).
const ALLOWED: Array<[BatchState, BatchState]> = [
  ['in_progress', 'released'], ['in_progress', 'held'], ['in_progress', 'discarded'],
  ['released', 'sold_out'], ['released', 'held'], ['released', 'recalled'], ['released', 'discarded'],
  ['held', 'released'], ['held', 'discarded'], ['held', 'recalled'],
  ['sold_out', 'recalled'],
  ['recalled', 'discarded'],
];

describe('canTransition', () => {
  const all = BATCH_STATES.flatMap((from) => BATCH_STATES.map((to) => [from, to] as [BatchState, BatchState]));
  test.each(all)('%s → %s', (from, to) => {
    const expected = ALLOWED.some(([f, t]) => f === from && t === to);
    expect(canTransition(from, to)).toBe(expected);
    expect(assertTransition(from, to).ok).toBe(expected);
  });
});

describe('assertTransition', () => {
  test.each([
    ['sold_out', 'released', 'A batch that is sold out cannot be released; it can only be recalled.'],
    ['in_progress', 'recalled', 'A batch that is in progress cannot be recalled; it can only be released, on hold or discarded.'],
    ['discarded', 'released', 'A discarded batch cannot be changed.'],
    ['held', 'held', 'This batch is already on hold.'],
  ] as Array<[BatchState, BatchState, string]>)('%s → %s is refused: %s', (from, to, message) => {
    expect(assertTransition(from, to)).toEqual({ ok: false, message });
  });

  test.each([
    ['in_progress', 'released', false],
    ['released', 'held', true],
    ['sold_out', 'recalled', true],
    ['recalled', 'discarded', true],
  ] as Array<[BatchState, BatchState, boolean]>)('%s → %s is allowed; reason needed: %s', (from, to, needsReason) => {
    expect(assertTransition(from, to)).toEqual({ ok: true, needsReason });
  });
});

describe('bestByDate', () => {
  test.each([
    // Gregorian calendar arithmetic (2024 is a leap year, 2025 and 2026 are not).
    ['2026-01-29', 3, '2026-02-01'], // month end
    ['2024-02-27', 3, '2024-03-01'], // across 29 Feb 2024
    ['2025-02-27', 3, '2025-03-02'], // no 29 Feb in 2025
    ['2024-02-29', 365, '2025-02-28'],
    ['2026-12-30', 5, '2027-01-04'], // year end
    ['2026-12-01', 0, '2026-12-01'], // eat the same day
    // Daylight-saving days do not move calendar dates (US 2026-03-08 / 2026-11-01; UK 2026-03-29 / 2026-10-25, IANA tz).
    ['2026-03-07', 2, '2026-03-09'],
    ['2026-10-31', 1, '2026-11-01'],
    ['2026-03-28', 2, '2026-03-30'],
    ['2026-10-24', 7, '2026-10-31'],
  ])('made %s with %i days shelf life is best by %s', (madeOn, days, expected) => {
    expect(bestByDate(madeOn, days)).toBe(expected);
  });

  test.each([[-1], [1.5], [3651], [Number.NaN]])('refuses shelf life %s', (days) => {
    expect(() => bestByDate('2026-12-01', days)).toThrow(/Shelf life/);
  });

  test('refuses a made-on date that does not exist', () => {
    expect(() => bestByDate('2026-02-29', 1)).toThrow(RangeError);
  });
});
