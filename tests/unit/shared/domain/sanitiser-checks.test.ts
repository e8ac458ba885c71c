import { describe, expect, test } from 'vitest';
import { checkSanitiser, SANITISER_CAUTIONS, type SanitiserCheckInput, type SanitiserField } from '../../../../shared/domain/sanitiser-checks';

const F = (value: number) => ({ value, unit: 'F' as const });
const C = (value: number) => ({ value, unit: 'C' as const });
const QUAT_LABEL = { minPpm: 200, maxPpm: 400 }; // an invented product label range
const quat = (over: Partial<SanitiserCheckInput>): SanitiserCheckInput => ({
  sanitiser: 'quaternary_ammonium', concentrationPpm: 300, waterTemperature: F(75), hardnessPpm: 300, contactSeconds: 30, label: QUAT_LABEL, ...over,
});
const fields = (input: SanitiserCheckInput) => checkSanitiser(input).problems.map((p) => p.field);

describe('chlorine — FDA Food Code 2022 4-501.114(A) and 4-703.11(C)', () => {
  test.each([
    // The published example: 50 ppm, 80 °F, pH 7.5, 8 s passes (50–99 mg/L at pH ≤ 8 needs 75 °F; 7 s contact).
    [{ concentrationPpm: 50, waterTemperature: F(80), ph: 7.5, contactSeconds: 8 }, []],
    // 50 ppm, 80 °F, pH 9 fails: at pH ≤ 10 that row needs 100 °F (38 °C).
    [{ concentrationPpm: 50, waterTemperature: F(80), ph: 9, contactSeconds: 10 }, ['waterTemperature']],
    [{ concentrationPpm: 50, waterTemperature: F(100), ph: 9, contactSeconds: 7 }, []],
    [{ concentrationPpm: 50, waterTemperature: C(38), ph: 10, contactSeconds: 7 }, []],
    [{ concentrationPpm: 50, waterTemperature: F(75), ph: 8, contactSeconds: 7 }, []],
    [{ concentrationPpm: 50, waterTemperature: F(74), ph: 8, contactSeconds: 10 }, ['waterTemperature']],
    [{ concentrationPpm: 50, waterTemperature: F(80), ph: 7.5, contactSeconds: 6 }, ['contactSeconds']],
    // 25–49 mg/L needs 120 °F (49 °C) at either pH.
    [{ concentrationPpm: 25, waterTemperature: F(120), ph: 7, contactSeconds: 10 }, []],
    [{ concentrationPpm: 49, waterTemperature: F(119), ph: 7, contactSeconds: 10 }, ['waterTemperature']],
    // The 7-s time is only for the 50 mg/L row; 25–49 and 100 mg/L need 10 s.
    [{ concentrationPpm: 30, waterTemperature: F(125), ph: 7, contactSeconds: 8 }, ['contactSeconds']],
    [{ concentrationPpm: 100, waterTemperature: F(55), ph: 10, contactSeconds: 10 }, []],
    [{ concentrationPpm: 100, waterTemperature: F(55), ph: 10, contactSeconds: 9 }, ['contactSeconds']],
    [{ concentrationPpm: 100, waterTemperature: F(54), ph: 7, contactSeconds: 10 }, ['waterTemperature']],
    // Too weak, too strong (200 ppm: EPA no-rinse limit, value from memory), pH over 10.
    [{ concentrationPpm: 24, waterTemperature: F(130), ph: 7, contactSeconds: 10 }, ['concentrationPpm']],
    [{ concentrationPpm: 200, waterTemperature: F(70), ph: 7, contactSeconds: 10 }, []],
    [{ concentrationPpm: 201, waterTemperature: F(70), ph: 7, contactSeconds: 10 }, ['concentrationPpm']],
    [{ concentrationPpm: 100, waterTemperature: F(70), ph: 10.1, contactSeconds: 10 }, ['ph']],
    [{ concentrationPpm: 100, waterTemperature: F(70), contactSeconds: 10 }, ['ph']],
    [{}, ['concentrationPpm', 'ph', 'contactSeconds']],
  ] as Array<[Partial<SanitiserCheckInput>, SanitiserField[]]>)('%j → problems %j', (over, expected) => {
    const input: SanitiserCheckInput = { sanitiser: 'chlorine', ...over };
    expect(fields(input)).toEqual(expected);
    expect(checkSanitiser(input).passed).toBe(expected.length === 0);
  });

  test('a label maximum replaces the default maximum', () => {
    expect(fields({ sanitiser: 'chlorine', concentrationPpm: 150, waterTemperature: F(70), ph: 7, contactSeconds: 10, label: { minPpm: 50, maxPpm: 100 } })).toEqual(['concentrationPpm']);
  });

  test('the pH 9 failure says what temperature is needed', () => {
    const r = checkSanitiser({ sanitiser: 'chlorine', concentrationPpm: 50, waterTemperature: F(80), ph: 9, contactSeconds: 10 });
    expect(r.problems[0]!.message).toBe('80 °F (26.7 °C) is too cool: chlorine at 50–99 mg/L and pH 10 or lower needs at least 100 °F (38 °C).');
  });
});

describe('iodine — FDA Food Code 2022 4-501.114(B)', () => {
  const iodine = (over: Partial<SanitiserCheckInput>): SanitiserCheckInput => ({
    sanitiser: 'iodine', concentrationPpm: 20, waterTemperature: F(68), ph: 5, contactSeconds: 30, ...over,
  });
  test.each([
    [{}, []], // 12.5–25 mg/L, ≥ 20 °C (68 °F), pH ≤ 5.0, 30 s (4-703.11(C))
    [{ concentrationPpm: 12.5 }, []],
    [{ concentrationPpm: 25 }, []],
    [{ concentrationPpm: 30 }, ['concentrationPpm']], // the published example: 30 ppm is over the range
    [{ concentrationPpm: 12.4 }, ['concentrationPpm']],
    [{ waterTemperature: F(67) }, ['waterTemperature']],
    [{ waterTemperature: C(20) }, []],
    [{ ph: 5.1 }, ['ph']],
    [{ contactSeconds: 29 }, ['contactSeconds']],
    [{ contactSeconds: 30, label: { minPpm: 12.5, maxPpm: 25, contactSeconds: 60 } }, ['contactSeconds']], // the longer of code and label
  ] as Array<[Partial<SanitiserCheckInput>, SanitiserField[]]>)('%j → problems %j', (over, expected) => {
    expect(fields(iodine(over))).toEqual(expected);
  });
});

describe('quaternary ammonium — FDA Food Code 2022 4-501.114(C)', () => {
  test.each([
    [{}, []], // label range, ≥ 24 °C (75 °F), hardness ≤ 500 mg/L, 30 s
    [{ waterTemperature: F(70) }, ['waterTemperature']], // the published example: quat at 70 °F fails
    [{ waterTemperature: C(24) }, []],
    [{ waterTemperature: C(23.9) }, ['waterTemperature']],
    [{ hardnessPpm: 500 }, []],
    [{ hardnessPpm: 501 }, ['hardnessPpm']],
    [{ concentrationPpm: 199 }, ['concentrationPpm']],
    [{ concentrationPpm: 401 }, ['concentrationPpm']],
    [{ label: null }, ['label']],
    [{ label: { ...QUAT_LABEL, contactSeconds: 60 }, contactSeconds: 45 }, ['contactSeconds']],
    [{ label: { ...QUAT_LABEL, minTempC: 30 }, waterTemperature: C(28) }, ['waterTemperature']],
    [{ hardnessPpm: null }, ['hardnessPpm']],
  ] as Array<[Partial<SanitiserCheckInput>, SanitiserField[]]>)('%j → problems %j', (over, expected) => {
    expect(fields(quat(over))).toEqual(expected);
  });
});

describe('hot water — FDA Food Code 2022 4-501.111 and 4-703.11(A)', () => {
  test.each([
    [F(171), 30, []], // ≥ 171 °F (77 °C) for ≥ 30 s
    [C(77), 30, []],
    [F(170), 30, ['waterTemperature']],
    [C(76.9), 30, ['waterTemperature']],
    [F(180), 29, ['contactSeconds']],
  ] as Array<[{ value: number; unit: 'F' | 'C' }, number, SanitiserField[]]>)('%j for %i s → problems %j', (waterTemperature, contactSeconds, expected) => {
    expect(fields({ sanitiser: 'hot_water', waterTemperature, contactSeconds })).toEqual(expected);
  });
  test('hot water adds the scald caution', () => {
    expect(checkSanitiser({ sanitiser: 'hot_water', waterTemperature: F(171), contactSeconds: 30 }).cautions.some((c) => /scald/.test(c))).toBe(true);
  });
});

describe('label products', () => {
  const label = { minPpm: 150, maxPpm: 400, minTempC: 10, contactSeconds: 60 }; // invented label
  test.each([
    [{ concentrationPpm: 200, waterTemperature: C(15), contactSeconds: 60 }, []],
    [{ concentrationPpm: 100, waterTemperature: C(15), contactSeconds: 60 }, ['concentrationPpm']],
    [{ concentrationPpm: 500, waterTemperature: C(15), contactSeconds: 60 }, ['concentrationPpm']],
    [{ concentrationPpm: 200, waterTemperature: C(9), contactSeconds: 60 }, ['waterTemperature']],
    [{ concentrationPpm: 200, waterTemperature: C(15), contactSeconds: 59 }, ['contactSeconds']],
  ] as Array<[Partial<SanitiserCheckInput>, SanitiserField[]]>)('%j → problems %j', (over, expected) => {
    expect(fields({ sanitiser: 'label_product', label, ...over })).toEqual(expected);
  });
  test('without a label range it cannot be checked', () => {
    expect(fields({ sanitiser: 'label_product', concentrationPpm: 200, contactSeconds: 60 })).toEqual(['label']);
  });
});

describe('cautions', () => {
  test.each(['chlorine', 'iodine', 'quaternary_ammonium', 'hot_water', 'label_product'] as const)('%s always shows the standing cautions', (sanitiser) => {
    const { cautions } = checkSanitiser({ sanitiser });
    for (const c of SANITISER_CAUTIONS) expect(cautions).toContain(c);
    expect(cautions.join(' ')).toMatch(/ammonia/);
    expect(cautions.join(' ')).toMatch(/test strips/);
    expect(cautions.join(' ')).toMatch(/label/);
  });
});
