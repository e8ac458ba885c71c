import { describe, expect, test } from 'vitest';
import { RuleProfileSchema, type RuleSource } from '../../../../shared/contracts/rule-profiles';
import { copyRuleProfile, getRuleProfile, pickProfileForDate, SHIPPED_RULE_PROFILES } from '../../../../shared/domain/rule-profiles';

const sourcesOf = (value: unknown, path = ''): Array<[string, RuleSource]> => {
  if (!value || typeof value !== 'object') return [];
  const o = value as Record<string, unknown>;
  if ('citation' in o && 'verified' in o) return [[path, o as unknown as RuleSource]];
  return Object.entries(o).flatMap(([k, v]) => sourcesOf(v, `${path}.${k}`));
};

describe('shipped rule profiles', () => {
  test('the seven profiles ship and each validates against RuleProfileSchema', () => {
    expect(SHIPPED_RULE_PROFILES.map((p) => p.id)).toEqual(['us-federal-2025-01', 'us-ca-2022', 'us-tx-2013', 'us-tx-2025-09', 'us-mn-2025', 'eu-1169-2011', 'uk-ppds-2021']);
    for (const p of SHIPPED_RULE_PROFILES) expect(RuleProfileSchema.safeParse(p).success).toBe(true);
  });
  test('every sourced value has a citation', () => {
    for (const p of SHIPPED_RULE_PROFILES) {
      const sources = sourcesOf(p);
      expect(sources.length).toBeGreaterThan(10);
      for (const [, s] of sources) expect(s.citation.length).toBeGreaterThan(5);
      for (const el of [...p.requiredLabelElements, ...p.tcsRequiredLabelElements]) expect(el.source.citation).toBeTruthy();
    }
  });
  // Verbatim statements: CA "Made in a Home Kitchen" 12 pt (CDPH via county forms); TX 25 TAC 229.661(d)(1) before
  // 1 Sep 2025 and HSC 437.0193(b),(e) from then; MN Stat. 28A.152 (2025).
  test.each([
    ['us-ca-2022', 'Made in a Home Kitchen', 12],
    ['us-tx-2013', 'This food is made in a home kitchen and is not inspected by the Department of State Health Services or a local health department.', null],
    ['us-tx-2025-09', 'THIS PRODUCT WAS PRODUCED IN A PRIVATE RESIDENCE THAT IS NOT SUBJECT TO GOVERNMENTAL LICENSING OR INSPECTION.', null],
    ['us-mn-2025', 'These products are homemade and not subject to state inspection.', null],
  ])('%s home-kitchen statement is verbatim', (id, text, minPoints) => {
    expect(getRuleProfile(id)!.homeKitchenStatement.value).toEqual({ text, minPoints });
  });
  test('Texas 2025 TCS safe-handling statement, 12 pt, with date made', () => {
    const tx = getRuleProfile('us-tx-2025-09')!;
    expect(tx.tcsStatement.value).toEqual({
      text: 'SAFE HANDLING INSTRUCTIONS: To prevent illness from bacteria, keep this food refrigerated or frozen until the food is prepared for consumption.',
      minPoints: 12,
    });
    expect(tx.tcsRequiredLabelElements.map((e) => e.key)).toEqual(['madeOnDate', 'safeHandlingStatement']);
  });
  // Sales caps: CA HSC 113758(a) $75,000 Class A (2022 base); TX 25 TAC 229.661(b)(3)(B) $50,000; TX after S.B. 541 and MN $78,000 not verified.
  test.each([
    ['us-ca-2022', 75000, true], ['us-tx-2013', 50000, true], ['us-tx-2025-09', 100000, false], ['us-mn-2025', 78000, false],
  ])('%s sales cap %i, verified %s', (id, amount, verified) => {
    const p = getRuleProfile(id)!;
    expect(p.salesCap.value?.amount).toBe(amount);
    expect(p.salesCap.source.verified).toBe(verified);
  });
  test('values that could not be verified are marked so', () => {
    expect(getRuleProfile('us-mn-2025')!.salesCap.source.verified).toBe(false);
    expect(getRuleProfile('us-tx-2013')!.effectiveSource.verified).toBe(false);
    expect(getRuleProfile('us-federal-2025-01')!.requiredLabelElements.find((e) => e.key === 'businessNameAddress')!.source.verified).toBe(false);
  });
  // FDA Food Code 4-501.114 chlorine rows; 4-703.11(C) 7 s at 50 mg/L.
  test('US sanitiser rules carry the Food Code chlorine table', () => {
    const rows = getRuleProfile('us-federal-2025-01')!.sanitisers.value.filter((r) => r.chemical === 'chlorine');
    expect(rows.map((r) => r.chemical === 'chlorine' && [r.minMgL, r.minTempCAtPhUpTo10, r.minTempCAtPhUpTo8, r.minContactSeconds])).toEqual([
      [25, 49, 49, 10], [50, 38, 24, 7], [100, 13, 13, 10],
    ]);
  });
  test('allergen regimes and rule-set dates', () => {
    expect(SHIPPED_RULE_PROFILES.map((p) => `${p.id}:${p.allergenRegime.value.regime}`)).toContain('uk-ppds-2021:UK');
    expect(getRuleProfile('eu-1169-2011')!.allergenRegime.value).toEqual({ regime: 'EU', ruleSetDate: '2011-10-25' });
    expect(getRuleProfile('us-ca-2022')!.allergenRegime.value).toEqual({ regime: 'US', ruleSetDate: '2025-01-06' });
  });
});

describe('pickProfileForDate', () => {
  // Texas changed its cottage-food law on 1 Sep 2025 (S.B. 541).
  test.each([
    ['us-tx', '2025-08-31', 'us-tx-2013'],
    ['us-tx', '2025-09-01', 'us-tx-2025-09'],
    ['us-tx', '2013-08-31', null],
    ['us-ca', '2026-03-01', 'us-ca-2022'],
    ['uk', '2021-09-30', null],
    ['uk', '2021-10-01', 'uk-ppds-2021'],
    ['nowhere', '2025-01-01', null],
  ])('%s on %s → %s', (key, date, id) => {
    expect(pickProfileForDate(key, date)?.id ?? null).toBe(id);
  });
  test('a malformed date is refused', () => expect(() => pickProfileForDate('us-tx', '1/9/2025')).toThrow('2025-09-01'));
});

describe('custom profiles', () => {
  test('a copy validates with the same schema and links to its original', () => {
    const copy = copyRuleProfile(getRuleProfile('us-tx-2025-09')!, 'juniper-lane-tx', 'Juniper Lane — Texas with county notes');
    expect(copy).toMatchObject({ id: 'juniper-lane-tx', isCustom: true, basedOnId: 'us-tx-2025-09' });
    copy.salesCap = { value: { amount: 150000, currency: 'USD', year: 2026, period: 'calendar-year' }, source: { citation: 'Checked with the county, owner note', verified: false } };
    expect(RuleProfileSchema.safeParse(copy).success).toBe(true);
    expect(getRuleProfile('us-tx-2025-09')!.salesCap.value?.amount).toBe(100000);
  });
  test.each([
    ['an end date before the start', { effectiveTo: '2000-01-01' }, 'effectiveTo'],
    ['a custom holding policy without minutes', { holdingPolicy: { value: { kind: 'custom', customLimitMinutes: null }, source: { citation: 'Owner', verified: false } } }, 'holdingPolicy.value.customLimitMinutes'],
    ['no sales channel', { salesChannels: { value: [], source: { citation: 'Owner', verified: false } } }, 'salesChannels.value'],
    ['an empty statement', { homeKitchenStatement: { value: { text: ' ', minPoints: 12 }, source: { citation: 'Owner', verified: false } } }, 'homeKitchenStatement.value.text'],
  ])('an edit with %s is refused, naming the field', (_n, patch, path) => {
    const r = RuleProfileSchema.safeParse({ ...getRuleProfile('us-ca-2022')!, ...patch });
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => i.path.join('.'))).toContain(path);
  });
});
