import { describe, expect, test } from 'vitest';
import { assessTcs } from '../../../../shared/domain/tcs-assessment';

const A = { isHeatTreated: true, isPackaged: true };
const B = { isHeatTreated: false, isPackaged: false };

describe('assessTcs (FDA Food Code 1-201.10(B), TCS food pH/aw interaction tables)', () => {
  // Table B — not heat-treated, or heat-treated but not packaged (boundary values as adopted, e.g. 25 TAC, NV, GA).
  test.each([
    [0.88, 5.1, 'needs_review'], [0.879, 6.5, 'non_tcs'], [0.95, 4.19, 'non_tcs'], [0.93, 4.2, 'needs_review'],
    [0.9, 5.0, 'non_tcs'], [0.9, 5.01, 'needs_review'], [0.92, 4.6, 'non_tcs'], [0.92, 4.61, 'needs_review'], [0.99, 7, 'needs_review'],
  ] as const)('Table B: aw %s, pH %s → %s', (aw, ph, result) => {
    expect(assessTcs({ ...B, aw, ph })).toMatchObject({ result, table: 'B' });
  });
  // Table A — heat-treated and subsequently packaged.
  test.each([
    [0.92, 7, 'non_tcs'], [0.95, 5.6, 'non_tcs'], [0.951, 4.7, 'needs_review'], [0.951, 4.6, 'non_tcs'], [0.93, 5.61, 'needs_review'],
  ] as const)('Table A: aw %s, pH %s → %s', (aw, ph, result) => {
    expect(assessTcs({ ...A, aw, ph })).toMatchObject({ result, table: 'A' });
  });
  test('heat-treated but not packaged uses Table B', () => {
    expect(assessTcs({ isHeatTreated: true, isPackaged: false, aw: 0.93, ph: 5.0 })).toMatchObject({ result: 'needs_review', table: 'B' });
  });
  test.each([
    [{ ...A, aw: 0.85 }, 'non_tcs'], [{ ...A, ph: 4.0 }, 'non_tcs'], [{ ...B, aw: 0.87 }, 'non_tcs'], [{ ...B, ph: 4.1 }, 'non_tcs'],
    [{ ...A, aw: 0.96 }, 'unknown'], [{ ...B, ph: 5 }, 'unknown'], [{ ...B }, 'unknown'], [{ ...B, aw: 1.2, ph: 4 }, 'unknown'], [{ ...B, ph: 15 }, 'unknown'],
  ] as const)('one value decides alone, otherwise unknown: %j → %s', (input, result) => {
    expect(assessTcs(input).result).toBe(result);
  });
  test('"needs review" is never worded as safe', () => {
    expect(assessTcs({ ...B, aw: 0.99, ph: 6 }).reason).toMatch(/product assessment required/);
  });
});
