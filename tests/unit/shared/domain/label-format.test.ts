import { describe, expect, test } from 'vitest';
import {
  euMinXHeightMm, fontSizeForGlyphHeightPt, inToMm, isContainsTypeSizeOk, minNetQuantityTypeHeight, mmToIn, mmToPt, principalDisplayPanelAreaIn2, ptToIn, ptToMm,
} from '../../../../shared/domain/label-format';

describe('principal display panel and net-quantity type height', () => {
  // 21 CFR 101.1 area; 21 CFR 101.105(i) tiers (above 25 in² the tiers are values from memory).
  test.each([
    [{ shape: 'rectangle' as const, heightIn: 2, widthIn: 2 }, 4, 1 / 16, true],
    [{ shape: 'rectangle' as const, heightIn: 3, widthIn: 2 }, 6, 1 / 8, true],
    [{ shape: 'cylinder' as const, heightIn: 3, circumferenceIn: 9 }, 10.8, 1 / 8, true],
    [{ shape: 'rectangle' as const, heightIn: 5, widthIn: 5 }, 25, 1 / 8, true],
    [{ shape: 'rectangle' as const, heightIn: 5, widthIn: 6 }, 30, 3 / 16, false], // value from memory
    [{ shape: 'other' as const, totalSurfaceIn2: 500 }, 200, 1 / 4, false], // value from memory
    [{ shape: 'rectangle' as const, heightIn: 25, widthIn: 20 }, 500, 1 / 2, false], // value from memory
  ])('%j → %s in² → %s in', (panel, area, height, verified) => {
    const a = principalDisplayPanelAreaIn2(panel);
    expect(a).toBe(area);
    expect(minNetQuantityTypeHeight(a)).toMatchObject({ minHeightIn: height, isVerified: verified });
  });
  test('1/16 in is 1.5875 mm exactly (1 in = 25.4 mm, 16 CFR 500.19)', () => {
    expect(minNetQuantityTypeHeight(5).minHeightMm).toBe(1.5875);
    expect(() => minNetQuantityTypeHeight(0)).toThrow();
  });
});

describe('type size rules', () => {
  // 21 U.S.C. 343(w)(1)(B): Contains line no smaller than the ingredient list.
  test.each([[8, 8, true], [9, 8, true], [7.5, 8, false]])('Contains %s pt vs list %s pt → %s', (c, l, ok) => expect(isContainsTypeSizeOk(c, l)).toBe(ok));
  // EU 1169/2011 Art. 13(2)-(3): 1.2 mm, or 0.9 mm below 80 cm² largest surface.
  test.each([[79.9, 0.9], [80, 1.2], [200, 1.2]])('largest surface %s cm² → x-height %s mm', (cm2, mm) => expect(euMinXHeightMm(cm2)).toBe(mm));
  test.each([
    [() => ptToMm(72), 25.4], [() => mmToPt(25.4), 72], [() => ptToIn(12), 1 / 6], [() => inToMm(1 / 16), 1.5875], [() => mmToIn(12.7), 0.5],
    [() => fontSizeForGlyphHeightPt(1.2, 0.5), 6.803149606299213],
  ])('unit conversion %#', (f, v) => expect(f()).toBeCloseTo(v, 12));
});
