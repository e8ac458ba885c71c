import { describe, expect, test } from 'vitest';
import { buildLabelText } from '../../../../shared/domain/label-text';
import { getRuleProfile } from '../../../../shared/domain/rule-profiles';
import { toLookup } from '../../../../shared/domain/recipe-flatten';
import { businessLine, checkLabel, formatLabelDate, type LabelCheckInput } from '../../../../shared/domain/label-check';
import { minBodyPt, minNetQuantityPt, printedText } from '../../../../shared/domain/label-layout';
import { getLabelTemplate, labelAreaIn2, sheetLayout, DEFAULT_SHEET } from '../../../../shared/domain/label-templates';
import { lotPageUrl } from '../../../../shared/domain/lot-page-url';
import { mmToPt } from '../../../../shared/domain/label-format';
import { latoMeasure } from '../../../../server/lib/pdf-fonts';
import { ingredient, recipe } from '../../../support/label-fixtures';

const measure = latoMeasure();
const ings = [
  ingredient('f', 'Wheat flour', { allergens: [{ source: 'wheat' }], subIngredients: ['wheat flour', 'niacin'] }),
  ingredient('s', 'Sugar'),
  ingredient('b', 'Butter', { allergens: [{ source: 'milk' }], subIngredients: ['cream', 'salt'] }),
  ingredient('e', 'Eggs', { allergens: [{ source: 'egg' }] }),
];
const r = recipe('r', 'Lemon Pops', [['f', 300], ['s', 250], ['b', 200], ['e', 100]]);
const BUSINESS = { name: 'Juniper Lane Cake Pops', addressLine: '14 Juniper Lane', city: 'Millbrook', region: 'TX', postalCode: '78999', registrationNumber: 'CF-DEMO-0427', registrationAuthority: '' };

function input(profileId: string, over: Partial<LabelCheckInput> = {}, netGrams: string | null = '113.4'): LabelCheckInput {
  const profile = getRuleProfile(profileId)!;
  const labelText = buildLabelText({ recipe: r, recipes: toLookup([r]), ingredients: toLookup(ings), profile, options: { netQuantity: netGrams ? { grams: netGrams, count: 4 } : null } });
  return {
    productName: 'Lemon Pops', labelText, snapshot: labelText, profile,
    batch: { lotCode: 'JL-26334-1', madeOn: '2026-11-30', bestBy: '2026-12-05', state: 'released', hasUnresolvedHoldingViolation: false },
    business: BUSINESS, template: getLabelTemplate('rect-3x2in')!, qrModules: 33, measure, confirmNeedsReview: false, actorRole: 'owner', ...over,
  };
}
const codes = (res: ReturnType<typeof checkLabel>) => res.problems.map((p) => p.code);

describe('label templates and sheets', () => {
  test('2 × 2 in labels on Letter with 12.7 mm margins and 3 mm gutters: 3 columns × 4 rows', () => {
    // Usable 7.5 × 10 in; (540 + 8.5) / (144 + 8.5) = 3.6 → 3, (720 + 8.5) / 152.5 = 4.78 → 4.
    const s = sheetLayout(getLabelTemplate('square-2in')!, DEFAULT_SHEET);
    expect([s.columns, s.rows, s.perPage]).toEqual([3, 4, 12]);
    expect(s.slots[0]).toEqual({ x: 36, y: 792 - 36 - 144 });
  });
  test('A4 is 210 × 297 mm; 50 × 30 mm labels with 10 mm margins and no gutter: 3 × 9', () => {
    const s = sheetLayout(getLabelTemplate('rect-50x30mm')!, { paper: 'a4', marginTopMm: 10, marginLeftMm: 10, marginRightMm: 10, marginBottomMm: 10, gutterXMm: 0, gutterYMm: 0 });
    expect(s.pageWidthPt).toBeCloseTo((210 / 25.4) * 72, 6);
    expect([s.columns, s.rows]).toEqual([3, 9]);
  });
  test('a label bigger than the usable page gives zero slots', () => {
    expect(sheetLayout(getLabelTemplate('rect-4x3in')!, { ...DEFAULT_SHEET, marginLeftMm: 60, marginRightMm: 60 }).perPage).toBe(0);
  });
  test('round label area is π r²', () => {
    expect(labelAreaIn2(getLabelTemplate('round-2in')!)).toBeCloseTo(Math.PI, 10);
  });
});

describe('legal minimum sizes', () => {
  test('net quantity height by panel area, 21 CFR 101.105(i): 2 × 2 in (4 in²) → 1/16 in; 3 × 2 in (6 in²) → 1/8 in', () => {
    const x = measure.xHeightPerEm.bold;
    expect(minNetQuantityPt(getLabelTemplate('square-2in')!, x).pt * x).toBeCloseTo(72 / 16, 6);
    expect(minNetQuantityPt(getLabelTemplate('rect-3x2in')!, x).pt * x).toBeCloseTo(72 / 8, 6);
  });
  test('EU x-height 0.9 mm under 80 cm² and 1.2 mm from 80 cm² (Reg. 1169/2011 Art. 13(2))', () => {
    const x = measure.xHeightPerEm.regular;
    expect(minBodyPt(getLabelTemplate('rect-60x40mm')!, 'EU', x).pt * x).toBeCloseTo((0.9 / 25.4) * 72, 6); // 24 cm²
    expect(minBodyPt(getLabelTemplate('rect-4x3in')!, 'EU', x).pt * x).toBeCloseTo((0.9 / 25.4) * 72, 6); // 77.4 cm² < 80
    const big = { ...getLabelTemplate('rect-60x40mm')!, width: 100, height: 100, widthPt: mmToPt(100), heightPt: mmToPt(100) }; // 100 cm²
    expect(minBodyPt(big, 'EU', x).pt * x).toBeCloseTo((1.2 / 25.4) * 72, 6);
  });
});

describe('lot page URL', () => {
  test('https, or http on loopback only; never javascript: or data:', () => {
    const code = 'AbCdEfGhIjKlMnOpQrStUvWx';
    expect(lotPageUrl('https://crumbs.example.com/', code)).toBe(`https://crumbs.example.com/lot/${code}`);
    expect(lotPageUrl('http://127.0.0.1:5180', code)).toBe(`http://127.0.0.1:5180/lot/${code}`);
    expect(() => lotPageUrl('http://crumbs.example.com', code)).toThrow(/https/);
    expect(() => lotPageUrl('javascript:alert(1)', code)).toThrow();
    expect(() => lotPageUrl('https://crumbs.example.com', 'short')).toThrow();
  });
});

describe('checkLabel', () => {
  test('a complete Texas 2025 label passes; the statement is printed word for word and the Contains line at the list size', () => {
    const res = checkLabel(input('us-tx-2025-09'));
    expect(res.problems).toEqual([]);
    const l = res.layout!;
    expect(printedText(l, 'homeKitchenStatement')).toBe('THIS PRODUCT WAS PRODUCED IN A PRIVATE RESIDENCE THAT IS NOT SUBJECT TO GOVERNMENTAL LICENSING OR INSPECTION.');
    expect(printedText(l, 'contains')).toBe('Contains: Milk, Egg, Wheat');
    expect(l.sizes.contains).toBeGreaterThanOrEqual(l.sizes.ingredients!); // 21 U.S.C. 343(w)(1)(B)
    expect(printedText(l, 'netQuantity')).toBe('4 pieces, Net wt 4 oz (113 g)');
    expect(printedText(l, 'dates')).toBe('Made on Nov 30, 2026 · Best by Dec 5, 2026');
    expect(printedText(l, 'business')).toBe('Juniper Lane Cake Pops, Reg. no. CF-DEMO-0427');
  });

  test('California: "Made in a Home Kitchen" at 12 pt or more (CDPH label requirements)', () => {
    const res = checkLabel(input('us-ca-2022', { template: getLabelTemplate('rect-4x3in')! }));
    expect(res.problems).toEqual([]);
    expect(res.layout!.sizes.homeKitchenStatement).toBeGreaterThanOrEqual(12);
    expect(printedText(res.layout!, 'homeKitchenStatement')).toBe('Made in a Home Kitchen');
  });

  test('EU: allergens in bold inside the list, no Contains line (Art. 21(1)(b))', () => {
    const res = checkLabel(input('eu-1169-2011'));
    expect(res.problems).toEqual([]);
    const bold = res.layout!.lines.filter((l) => l.block === 'ingredients').flatMap((l) => l.pieces.filter((p) => p.isBold).map((p) => p.text));
    expect(bold.join(' ').toLowerCase()).toMatch(/wheat/);
    expect(bold.join(' ').toLowerCase()).toMatch(/butter|milk|cream/);
    expect(res.layout!.sizes.contains).toBeUndefined();
  });

  test('refuses each missing element the profile requires', () => {
    expect(codes(checkLabel(input('us-federal-2025-01', { business: { ...BUSINESS, addressLine: '' } })))).toContain('missing_businessNameAddress');
    expect(codes(checkLabel(input('us-ca-2022', { business: { ...BUSINESS, registrationNumber: '' }, template: getLabelTemplate('rect-4x3in')! })))).toContain('missing_registrationNumber');
    expect(codes(checkLabel(input('us-tx-2025-09', { business: { ...BUSINESS, registrationNumber: '', addressLine: '' } })))).toContain('missing_businessNameRegistration');
    const eu = input('eu-1169-2011');
    expect(codes(checkLabel({ ...eu, batch: { ...eu.batch, bestBy: null } }))).toContain('missing_bestByDate');
    expect(codes(checkLabel(input('us-federal-2025-01', {}, null)))).toContain('missing_netQuantity');
  });

  test('refuses held, discarded and recalled batches and an unresolved holding violation', () => {
    const base = input('us-tx-2025-09');
    for (const state of ['held', 'discarded', 'recalled'] as const) {
      expect(codes(checkLabel({ ...base, batch: { ...base.batch, state } }))).toContain(`batch_${state}`);
    }
    expect(codes(checkLabel({ ...base, batch: { ...base.batch, hasUnresolvedHoldingViolation: true } }))).toEqual(['holding_violation']);
  });

  test('"needs review" at making: a baker cannot confirm, the owner must', () => {
    const base = input('us-tx-2025-09');
    const snapshot = { ...base.snapshot!, tcs: { result: 'needs_review' as const, table: 'A' as const, reason: 'x' } };
    expect(codes(checkLabel({ ...base, snapshot, actorRole: 'baker', confirmNeedsReview: true }))).toContain('needs_review_owner');
    expect(codes(checkLabel({ ...base, snapshot }))).toContain('needs_review_unconfirmed');
    const ok = checkLabel({ ...base, snapshot, confirmNeedsReview: true });
    expect(ok.needsOwnerConfirmation).toBe(true);
    expect(codes(ok)).not.toContain('needs_review_unconfirmed');
  });

  test('text that cannot fit at the legal minimum is refused with the sizes named', () => {
    const res = checkLabel(input('us-ca-2022', { template: getLabelTemplate('rect-50x30mm')! }));
    const p = res.problems.find((x) => x.code === 'text_does_not_fit')!;
    expect(p.message).toMatch(/12 pt/);
    expect(p.message).toMatch(/21 CFR 101\.2\(c\)/);
    expect(res.layout).toBeNull();
  });

  test('every problem is reported at once', () => {
    const base = input('us-federal-2025-01', { business: { ...BUSINESS, addressLine: '' } }, null);
    const res = checkLabel({ ...base, batch: { ...base.batch, state: 'held', hasUnresolvedHoldingViolation: true } });
    expect(codes(res)).toEqual(expect.arrayContaining(['batch_held', 'holding_violation', 'missing_businessNameAddress', 'missing_netQuantity']));
  });

  test('a label text changed since the batch was made is a warning (the lot page shows the correction)', () => {
    const base = input('us-tx-2025-09');
    const snapshot = { ...base.snapshot!, allergenStatement: { ...base.snapshot!.allergenStatement, containsLine: 'Contains: Egg, Wheat' } };
    const res = checkLabel({ ...base, snapshot });
    expect(res.warnings.map((w) => w.code)).toContain('label_changed_since_made');
    expect(res.changesSinceMade.map((c) => c.field)).toContain('containsLine');
  });
});

describe('formatting', () => {
  test('dates name the month', () => {
    expect(formatLabelDate('2026-03-08', 'US')).toBe('Mar 8, 2026');
    expect(formatLabelDate('2026-03-08', 'UK')).toBe('8 Mar 2026');
  });
  test('business line: registration replaces the address where the rule allows it (Tex. HSC 437.0193(b-1))', () => {
    expect(businessLine(BUSINESS, ['businessNameRegistration'])).toBe('Juniper Lane Cake Pops, Reg. no. CF-DEMO-0427');
    expect(businessLine(BUSINESS, ['businessNameAddress'])).toBe('Juniper Lane Cake Pops, 14 Juniper Lane, Millbrook, TX 78999');
  });
});
