import { RuleProfileSchema, type LabelElementKey, type RuleProfile, type RuleSource, type SanitiserRule } from '../contracts/rule-profiles';

/**
 * Rule profiles shipped with the app. Every value carries its source; `verified: false` marks what could
 * not be checked in a published text (values from memory, or figures that change yearly). Local rules and
 * the local health authority decide: owners copy a profile and edit it.
 */

const CAUTION =
  'Rules differ by country, state and county, and they change. These defaults name their sources; your local rules and your local health authority decide. Check them before you label or sell.';

const src = (citation: string, verified: boolean, extra: Omit<RuleSource, 'citation' | 'verified'> = {}): RuleSource => ({ citation, verified, ...extra });
const el = (source: RuleSource, ...keys: LabelElementKey[]) => keys.map((key) => ({ key, source }));

const FDA_ALLERGEN_URL = 'https://www.fda.gov/food/food-labeling-nutrition/food-allergies';
const US_ALLERGENS = {
  value: { regime: 'US' as const, ruleSetDate: '2025-01-06' },
  source: src('21 U.S.C. 321(qq) and 343(w); FDA Questions and Answers Regarding Food Allergens, Edition 5 (6 Jan 2025)', true, { url: FDA_ALLERGEN_URL }),
};

// FDA Food Code 4-501.114 (as adopted verbatim in WA WAC 246-215-04565 and WI DHS 4-501.114), contact times
// 4-703.11(C) (DC 25-A2002), hot water 4-501.111 (WA WAC 246-215-04550) and 4-703.11(A).
const FOOD_CODE_SANITISERS: SanitiserRule[] = [
  { chemical: 'chlorine', minMgL: 25, maxMgL: 49, minTempCAtPhUpTo10: 49, minTempCAtPhUpTo8: 49, minContactSeconds: 10 },
  { chemical: 'chlorine', minMgL: 50, maxMgL: 99, minTempCAtPhUpTo10: 38, minTempCAtPhUpTo8: 24, minContactSeconds: 7 },
  { chemical: 'chlorine', minMgL: 100, maxMgL: null, minTempCAtPhUpTo10: 13, minTempCAtPhUpTo8: 13, minContactSeconds: 10 },
  { chemical: 'iodine', minMgL: 12.5, maxMgL: 25, minTempC: 20, maxPh: 5.0, minContactSeconds: 30 },
  { chemical: 'quaternary_ammonium', minTempC: 24, maxWaterHardnessMgL: 500, minContactSeconds: 30 },
  { chemical: 'hot_water', minTempC: 77, minContactSeconds: 30 },
];
const US_SANITISERS = {
  value: FOOD_CODE_SANITISERS,
  source: src('FDA Food Code 4-501.114, 4-703.11, 4-501.111 (as adopted by WA, WI and DC); always also the EPA-registered label', true, {
    note: 'Hot-water contact time of 30 s is from a secondary source.',
  }),
};
const LABEL_ONLY_SANITISERS = {
  value: [{ chemical: 'label_product' as const, note: 'Use the concentration, temperature and contact time on the product label.' }],
  source: src('No numeric sanitiser values in Reg. (EC) 852/2004; follow the product label (common practice)', false),
};

const US_NET = {
  value: { units: 'us-dual' as const, rounding: 'round-down' as const },
  source: src('FPLA as amended 1992 (both units); NIST Handbook 130 UPLR: rounded declarations never overstate', true),
};
const NO_CAP = (citation: string) => ({ value: null, source: src(citation, false) });
const NO_STATEMENT = (citation: string) => ({ value: null, source: src(citation, false) });
const NON_TCS_HOLDING = (citation: string, verified: boolean) => ({ value: { kind: 'none' as const, customLimitMinutes: null }, source: src(citation, verified) });

const CA_FORMS = src('CDPH cottage-food label requirements (HSC 114365 et seq.), as printed on Placer and San Joaquin county forms', true);
const TX_2013_RULE = src('25 TAC 229.661(d)(1) (rule text quoted by secondary sources)', true);
const TX_2025_LAW = src('Tex. Health & Safety Code 437.0193, as amended by S.B. 541 (89th Leg., 2025)', true);
const MN_LAW = src('Minn. Stat. 28A.152 (2025)', true, { url: 'https://www.revisor.mn.gov/statutes/cite/28A.152' });
const EU_REG_URL = 'https://eur-lex.europa.eu/eli/reg/2011/1169/oj';
const eu = (article: string, verified: boolean) => src(`Reg. (EU) No 1169/2011 ${article}${verified ? '' : ' (value from memory)'}`, verified, { url: EU_REG_URL });
const UK_PPDS = src('Food Information (Amendment) (England) Regulations 2019, SI 2019/1218; FSA PPDS guidance', true, {
  url: 'https://www.legislation.gov.uk/uksi/2019/1218',
});

const base: Pick<RuleProfile, 'isCustom' | 'basedOnId' | 'caution' | 'tcsRequiredLabelElements'> = {
  isCustom: false,
  basedOnId: null,
  caution: CAUTION,
  tcsRequiredLabelElements: [],
};

const PROFILES: RuleProfile[] = [
  {
    ...base,
    id: 'us-federal-2025-01',
    name: 'United States — federal baseline (FDA allergen guidance, Jan 2025)',
    jurisdiction: { key: 'us', country: 'US', region: null },
    effectiveFrom: '2025-01-06',
    effectiveTo: null,
    effectiveSource: src('FDA Q&A on Food Allergens, Edition 5, final 6 Jan 2025', true, { url: FDA_ALLERGEN_URL }),
    allergenRegime: US_ALLERGENS,
    homeKitchenStatement: NO_STATEMENT('No federal home-kitchen statement; state cottage-food laws set their own'),
    tcsStatement: NO_STATEMENT('No federal safe-handling statement for baked goods'),
    requiredLabelElements: [
      ...el(src('21 CFR 101.3 statement of identity (value from memory)', false), 'productName'),
      ...el(src('21 CFR 101.4', true), 'ingredients'),
      ...el(src('21 U.S.C. 343(w)', true), 'allergens'),
      ...el(src('21 CFR 101.105', true), 'netQuantity'),
      ...el(src('21 CFR 101.5 (value from memory)', false), 'businessNameAddress'),
    ],
    netQuantity: US_NET,
    salesCap: NO_CAP('No federal cottage-food sales cap; state law sets one'),
    salesChannels: { value: ['direct', 'event', 'online', 'wholesale'], source: src('No federal cottage-food channel limits (common practice)', false) },
    allowsTcsFoods: { value: true, source: src('No federal cottage-food product limits; licensed kitchens follow the Food Code (common practice)', false) },
    holdingPolicy: { value: { kind: 'tphc_4h', customLimitMinutes: null }, source: src('FDA Food Code 3-501.19(B) (as adopted, MN 4626.0408)', true) },
    sanitisers: US_SANITISERS,
  },
  {
    ...base,
    id: 'us-ca-2022',
    name: 'California — Homemade Food Act, Class A (from 2022)',
    jurisdiction: { key: 'us-ca', country: 'US', region: 'CA' },
    effectiveFrom: '2022-01-01',
    effectiveTo: null,
    effectiveSource: src('AB 1144 (2021): base sales figures effective 1 Jan 2022 (university extension summary)', true),
    allergenRegime: US_ALLERGENS,
    homeKitchenStatement: { value: { text: 'Made in a Home Kitchen', minPoints: 12 }, source: CA_FORMS },
    tcsStatement: NO_STATEMENT('California cottage foods must be non-potentially-hazardous; no TCS statement'),
    requiredLabelElements: el(CA_FORMS, 'productName', 'homeKitchenStatement', 'businessNameAddress', 'registrationNumber', 'ingredients', 'netQuantity', 'allergens'),
    netQuantity: { value: US_NET.value, source: CA_FORMS },
    salesCap: {
      value: { amount: 75000, currency: 'USD', year: 2022, period: 'calendar-year' },
      source: src('Cal. Health & Safety Code 113758(a): Class A $75,000 (Class B $150,000), adjusted yearly for the California CPI', true, {
        url: 'https://leginfo.legislature.ca.gov/faces/codes_displaySection.xhtml?lawCode=HSC&sectionNum=113758',
        note: 'This is the 2022 base figure. The CPI-adjusted figure for later years is not verified: read it from CDPH or the county each year.',
      }),
    },
    salesChannels: {
      value: ['direct', 'event'],
      source: src('Cal. Health & Safety Code 113758: Class A is direct sales only (Class B adds indirect sales with a county permit)', true),
    },
    allowsTcsFoods: { value: false, source: src('Cal. Health & Safety Code 114365.5: approved non-potentially-hazardous foods only', true) },
    holdingPolicy: NON_TCS_HOLDING('Non-TCS foods only (HSC 114365.5), so no holding limit applies', true),
    sanitisers: US_SANITISERS,
  },
  {
    ...base,
    id: 'us-tx-2013',
    name: 'Texas — cottage food (before 1 Sep 2025)',
    jurisdiction: { key: 'us-tx', country: 'US', region: 'TX' },
    effectiveFrom: '2013-09-01',
    effectiveTo: '2025-09-01',
    effectiveSource: src('H.B. 970 (83rd Leg.) start date is a value from memory; replaced on 1 Sep 2025 by S.B. 541', false),
    allergenRegime: US_ALLERGENS,
    homeKitchenStatement: {
      value: { text: 'This food is made in a home kitchen and is not inspected by the Department of State Health Services or a local health department.', minPoints: null },
      source: TX_2013_RULE,
    },
    tcsStatement: NO_STATEMENT('TCS foods not allowed before 1 Sep 2025'),
    requiredLabelElements: el(TX_2013_RULE, 'productName', 'businessNameAddress', 'allergens', 'homeKitchenStatement'),
    netQuantity: { value: US_NET.value, source: src('Federal rule (FPLA, NIST HB 130); Texas cottage rule sets none (value from memory)', false) },
    salesCap: {
      value: { amount: 50000, currency: 'USD', year: null, period: 'calendar-year' },
      source: src('25 TAC 229.661(b)(3)(B): $50,000 annual gross income', true),
    },
    salesChannels: { value: ['direct', 'event', 'online'], source: src('Direct, event and online orders delivered in person (value from memory)', false) },
    allowsTcsFoods: { value: false, source: src('25 TAC 229.661(b)(3)(A): non-TCS foods only', true) },
    holdingPolicy: NON_TCS_HOLDING('Non-TCS foods only (25 TAC 229.661(b)(3)(A)), so no holding limit applies', true),
    sanitisers: US_SANITISERS,
  },
  {
    ...base,
    id: 'us-tx-2025-09',
    name: 'Texas — cottage food (from 1 Sep 2025, S.B. 541)',
    jurisdiction: { key: 'us-tx', country: 'US', region: 'TX' },
    effectiveFrom: '2025-09-01',
    effectiveTo: null,
    effectiveSource: TX_2025_LAW,
    allergenRegime: US_ALLERGENS,
    homeKitchenStatement: {
      value: { text: 'THIS PRODUCT WAS PRODUCED IN A PRIVATE RESIDENCE THAT IS NOT SUBJECT TO GOVERNMENTAL LICENSING OR INSPECTION.', minPoints: null },
      source: TX_2025_LAW,
    },
    tcsStatement: {
      value: {
        text: 'SAFE HANDLING INSTRUCTIONS: To prevent illness from bacteria, keep this food refrigerated or frozen until the food is prepared for consumption.',
        minPoints: 12,
      },
      source: src('Tex. Health & Safety Code 437.0193(e)', true, { note: 'The end of the sentence was checked in a news summary only.' }),
    },
    requiredLabelElements: [
      ...el(TX_2025_LAW, 'businessNameRegistration', 'homeKitchenStatement'),
      ...el(src('Kept from the earlier Texas rule; not in the 437.0193(b) text checked', false), 'productName', 'allergens'),
    ],
    tcsRequiredLabelElements: el(src('Tex. Health & Safety Code 437.0193(e): date made and safe-handling statement for TCS baked goods', true), 'madeOnDate', 'safeHandlingStatement'),
    netQuantity: { value: US_NET.value, source: src('Federal rule (FPLA, NIST HB 130); Texas cottage law sets none (value from memory)', false) },
    salesCap: {
      value: { amount: 100000, currency: 'USD', year: null, period: 'calendar-year' },
      source: src('S.B. 541 (2025) sales cap: not verified', false, {
        note: 'Filed bill versions say $100,000; news reports of the enacted law say $150,000 indexed to inflation. The lower figure is shipped; check with DSHS.',
      }),
    },
    salesChannels: { value: ['direct', 'event', 'online'], source: src('Direct, event and online orders delivered in person (value from memory)', false) },
    allowsTcsFoods: { value: true, source: src('Tex. Health & Safety Code 437.0193(e): TCS baked goods allowed with extra labelling', true) },
    holdingPolicy: {
      value: { kind: 'tphc_4h', customLimitMinutes: null },
      source: src('Texas cottage law sets no holding limit; FDA Food Code 3-501.19(B) used as the default', false),
    },
    sanitisers: US_SANITISERS,
  },
  {
    ...base,
    id: 'us-mn-2025',
    name: 'Minnesota — cottage food (Minn. Stat. 28A.152, 2025)',
    jurisdiction: { key: 'us-mn', country: 'US', region: 'MN' },
    effectiveFrom: '2021-08-01',
    effectiveTo: null,
    effectiveSource: src('S.F. 958 changes from 1 Aug 2021 (secondary source); statute text as of 2025', false),
    allergenRegime: US_ALLERGENS,
    homeKitchenStatement: { value: { text: 'These products are homemade and not subject to state inspection.', minPoints: null }, source: MN_LAW },
    tcsStatement: NO_STATEMENT('Minnesota cottage foods are non-potentially-hazardous; no TCS statement'),
    requiredLabelElements: el(MN_LAW, 'businessNameRegistration', 'madeOnDate', 'ingredients', 'allergens', 'homeKitchenStatement'),
    netQuantity: { value: US_NET.value, source: src('Federal rule (FPLA, NIST HB 130); Minnesota cottage law sets none (value from memory)', false) },
    salesCap: {
      value: { amount: 78000, currency: 'USD', year: null, period: 'calendar-year' },
      source: src('Minn. Stat. 28A.152: $78,000 from 1 Aug 2021 (S.F. 958); secondary source only', false),
    },
    salesChannels: { value: ['direct', 'event', 'online'], source: src('Direct, event and online sales delivered in person (value from memory)', false) },
    allowsTcsFoods: { value: false, source: src('Minn. Stat. 28A.152: non-potentially-hazardous foods and acidified home-canned products (value from memory)', false) },
    holdingPolicy: NON_TCS_HOLDING('Non-TCS foods only, so no holding limit applies (value from memory)', false),
    sanitisers: US_SANITISERS,
  },
  {
    ...base,
    id: 'eu-1169-2011',
    name: 'European Union — food information to consumers (Reg. 1169/2011)',
    jurisdiction: { key: 'eu', country: 'EU', region: null },
    effectiveFrom: '2014-12-13',
    effectiveTo: null,
    effectiveSource: eu('Art. 55 date of application', false),
    allergenRegime: { value: { regime: 'EU', ruleSetDate: '2011-10-25' }, source: eu('Annex II and Art. 21', true) },
    homeKitchenStatement: NO_STATEMENT('No home-kitchen statement in Reg. (EU) 1169/2011'),
    tcsStatement: NO_STATEMENT('No safe-handling statement in Reg. (EU) 1169/2011 (storage conditions: Art. 9(1)(g), value from memory)'),
    requiredLabelElements: [
      ...el(eu('Art. 9(1)(a)', false), 'productName'),
      ...el(eu('Art. 9(1)(b) and Art. 18', true), 'ingredients'),
      ...el(eu('Art. 9(1)(c) and Art. 21', true), 'allergens'),
      ...el(eu('Art. 9(1)(e)', false), 'netQuantity'),
      ...el(eu('Art. 9(1)(f)', false), 'bestByDate'),
      ...el(eu('Art. 9(1)(h)', false), 'businessNameAddress'),
      ...el(src('Directive 2011/91/EU lot marking (value from memory)', false), 'lotCode'),
    ],
    netQuantity: { value: { units: 'metric', rounding: 'round-down' }, source: eu('Art. 9(1)(e) and Art. 23 metric units; rounding down is our conservative choice', false) },
    salesCap: NO_CAP('No sales cap in Reg. (EU) 1169/2011; national registration rules apply'),
    salesChannels: { value: ['direct', 'event', 'online', 'wholesale'], source: src('No channel limits in Reg. (EU) 1169/2011 (distance selling: Art. 14)', false) },
    allowsTcsFoods: { value: true, source: src('No cottage-food product list in EU law; hygiene rules of Reg. (EC) 852/2004 apply', false) },
    holdingPolicy: NON_TCS_HOLDING('No EU-wide room-temperature holding limit; national rules apply', false),
    sanitisers: LABEL_ONLY_SANITISERS,
  },
  {
    ...base,
    id: 'uk-ppds-2021',
    name: 'United Kingdom — prepacked for direct sale (from 1 Oct 2021)',
    jurisdiction: { key: 'uk', country: 'GB', region: null },
    effectiveFrom: '2021-10-01',
    effectiveTo: null,
    effectiveSource: UK_PPDS,
    allergenRegime: { value: { regime: 'UK', ruleSetDate: '2021-10-01' }, source: src('Food Information Regulations 2014 (SI 2014/1855) with the 14 allergens of retained Reg. 1169/2011 Annex II', true) },
    homeKitchenStatement: NO_STATEMENT('No home-kitchen statement in the UK PPDS rules'),
    tcsStatement: NO_STATEMENT('No safe-handling statement in the UK PPDS rules'),
    requiredLabelElements: el(UK_PPDS, 'productName', 'ingredients', 'allergens'),
    netQuantity: { value: { units: 'metric', rounding: 'round-down' }, source: src('Weights and Measures (Packaged Goods) Regulations 2006 (value from memory)', false) },
    salesCap: NO_CAP('No sales cap for UK home food businesses; register with the local authority'),
    salesChannels: {
      value: ['direct', 'event'],
      source: src('PPDS covers food packed where it is sold, including the same operator\u2019s market stall; distance selling is outside PPDS', true),
    },
    allowsTcsFoods: { value: true, source: src('No cottage-food product list in UK law (common practice)', false) },
    holdingPolicy: {
      value: { kind: 'custom', customLimitMinutes: 240 },
      source: src('Food Safety and Hygiene (England) Regulations 2013 Sch. 4: chilled food may be held above 8 °C once for up to 4 h (value from memory)', false),
    },
    sanitisers: LABEL_ONLY_SANITISERS,
  },
];

/** The profiles that ship with the app, each validated by RuleProfileSchema at load. */
export const SHIPPED_RULE_PROFILES: readonly RuleProfile[] = Object.freeze(PROFILES.map((p) => RuleProfileSchema.parse(p)));

/** A shipped profile by id, or undefined. */
export function getRuleProfile(id: string): RuleProfile | undefined {
  return SHIPPED_RULE_PROFILES.find((p) => p.id === id);
}

/** Whether `profile` applies on `isoDate` (effectiveFrom inclusive, effectiveTo exclusive). */
export function isProfileInForce(profile: RuleProfile, isoDate: string): boolean {
  return profile.effectiveFrom <= isoDate && (profile.effectiveTo === null || isoDate < profile.effectiveTo);
}

/**
 * The profile of a jurisdiction ('us', 'us-ca', 'us-tx', 'us-mn', 'eu', 'uk') in force on an ISO date, or null.
 * E.g. Texas 2025-08-31 → 'us-tx-2013', 2025-09-01 → 'us-tx-2025-09'. Pass `profiles` to include custom ones.
 */
export function pickProfileForDate(jurisdictionKey: string, isoDate: string, profiles: readonly RuleProfile[] = SHIPPED_RULE_PROFILES): RuleProfile | null {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(isoDate)) throw new Error('Use a date like 2025-09-01.');
  const hits = profiles.filter((p) => p.jurisdiction.key === jurisdictionKey && isProfileInForce(p, isoDate));
  return hits.sort((a, b) => (a.effectiveFrom < b.effectiveFrom ? 1 : -1))[0] ?? null;
}

/** An owner's editable copy of a profile: same schema, marked custom and linked to the original. */
export function copyRuleProfile(profile: RuleProfile, id: string, name: string): RuleProfile {
  return RuleProfileSchema.parse({ ...structuredClone(profile), id, name, isCustom: true, basedOnId: profile.id });
}
