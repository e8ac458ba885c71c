import { celsiusToFahrenheit, formatTemperatureBoth, isAtOrAbove, type Temperature, type TemperatureLimit } from './temperature';

/** The sanitising methods we check. 'label_product' is any product checked only against its own label. */
export const SANITISERS = ['chlorine', 'iodine', 'quaternary_ammonium', 'hot_water', 'label_product'] as const;

/** One of SANITISERS. */
export type Sanitiser = (typeof SANITISERS)[number];

/** The ranges printed on an EPA-registered product label (ppm = mg/L). */
export interface SanitiserLabel {
  minPpm: number;
  maxPpm: number;
  minTempC?: number | null;
  contactSeconds?: number | null;
  maxHardnessPpm?: number | null;
}

/** One logged sanitising step; missing measurements are reported as problems. */
export interface SanitiserCheckInput {
  sanitiser: Sanitiser;
  concentrationPpm?: number | null;
  waterTemperature?: Temperature | null;
  ph?: number | null;
  contactSeconds?: number | null;
  hardnessPpm?: number | null;
  /** Required for 'quaternary_ammonium' and 'label_product'. */
  label?: SanitiserLabel | null;
}

/** Form field a problem belongs to (equal to the input's key). */
export type SanitiserField = 'concentrationPpm' | 'waterTemperature' | 'ph' | 'contactSeconds' | 'hardnessPpm' | 'label';

/** The verdict: passed only when there are no problems; cautions are always shown. */
export interface SanitiserCheckResult {
  passed: boolean;
  problems: Array<{ field: SanitiserField; message: string }>;
  cautions: string[];
}

/**
 * Chlorine has no maximum in the Food Code table (its top row is 100 mg/L); 200 ppm is the EPA
 * limit for no-rinse food-contact use of hypochlorite (40 CFR 180.940, value from memory). A label's
 * own maximum replaces it.
 */
export const CHLORINE_MAX_PPM = 200;

// FDA Food Code 2022 4-501.114(A) table: minimum temperature by concentration band and pH.
// Bands are read as 25 ≤ c < 50, 50 ≤ c < 100 and c ≥ 100 mg/L.
const CHLORINE_BANDS: Array<{ from: number; label: string; atPh10: TemperatureLimit; atPh8: TemperatureLimit }> = [
  { from: 100, label: '100 mg/L', atPh10: { celsius: 13, fahrenheit: 55 }, atPh8: { celsius: 13, fahrenheit: 55 } },
  { from: 50, label: '50–99 mg/L', atPh10: { celsius: 38, fahrenheit: 100 }, atPh8: { celsius: 24, fahrenheit: 75 } },
  { from: 25, label: '25–49 mg/L', atPh10: { celsius: 49, fahrenheit: 120 }, atPh8: { celsius: 49, fahrenheit: 120 } },
];
const IODINE = { minPpm: 12.5, maxPpm: 25, minTemp: { celsius: 20, fahrenheit: 68 }, maxPh: 5 }; // 4-501.114(B)
const QUAT = { minTemp: { celsius: 24, fahrenheit: 75 }, maxHardnessPpm: 500 }; // 4-501.114(C)
const HOT_WATER = { minTemp: { celsius: 77, fahrenheit: 171 }, contactSeconds: 30 }; // 4-501.111, 4-703.11(A)
// 4-703.11(C): chlorine 10 s, or 7 s at 50 mg/L under the 50 mg/L row's temperature and pH; others 30 s.
const CONTACT = { chlorine: 10, chlorine50: 7, otherChemical: 30 };

/** Shown with every check. */
export const SANITISER_CAUTIONS: readonly string[] = [
  'Never mix sanitisers or cleaners: chlorine bleach with ammonia or with acids releases toxic gases.',
  'Measure every fresh solution with the test strips or kit made for that sanitiser.',
  'Follow the product label for concentration, temperature and contact time; the label is the legal use instruction.',
  'Your local health authority\u2019s rules take precedence over these defaults.',
];
const SCALD_CAUTION = 'Water at 171 °F (77 °C) scalds in about a second: use heat-proof gloves and baskets, never bare hands.';

const tempText = (limit: TemperatureLimit) => `${limit.fahrenheit} °F (${limit.celsius} °C)`;
const labelLimit = (celsius: number): TemperatureLimit => ({ celsius, fahrenheit: celsiusToFahrenheit(celsius).toNumber() });

/**
 * Checks a sanitising step against FDA Food Code 2022 4-501.114 (chemicals), 4-501.111 (hot water)
 * and 4-703.11 (contact times), and against the product label. Both too weak and too strong fail.
 */
export function checkSanitiser(input: SanitiserCheckInput): SanitiserCheckResult {
  const problems: SanitiserCheckResult['problems'] = [];
  const add = (field: SanitiserField, message: string) => problems.push({ field, message });
  const { concentrationPpm: ppm, waterTemperature: temp, ph, contactSeconds: seconds, label } = input;

  const needTemp = (min: TemperatureLimit, why: string) => {
    if (!temp) add('waterTemperature', 'Enter the water temperature.');
    else if (!isAtOrAbove(temp, min)) add('waterTemperature', `${formatTemperatureBoth(temp)} is too cool: ${why} needs at least ${tempText(min)}.`);
  };
  const needContact = (min: number) => {
    if (seconds == null) add('contactSeconds', 'Enter the contact time in seconds.');
    else if (seconds < min) add('contactSeconds', `${seconds} s is too short: leave it in contact for at least ${min} s.`);
  };
  const needRange = (min: number, max: number, what: string) => {
    if (ppm == null) add('concentrationPpm', 'Enter the measured concentration in ppm (mg/L).');
    else if (ppm < min) add('concentrationPpm', `${ppm} ppm is too weak: ${what} needs ${min}–${max} ppm.`);
    else if (ppm > max) add('concentrationPpm', `${ppm} ppm is too strong: ${what} must not exceed ${max} ppm; dilute it and test again.`);
  };
  const needLabel = (): SanitiserLabel | null => {
    if (!label || !(label.minPpm > 0) || !(label.maxPpm >= label.minPpm)) {
      add('label', 'Enter the concentration range from the product label.');
      return null;
    }
    return label;
  };
  const labelContact = (l: SanitiserLabel | null) => Math.max(CONTACT.otherChemical, l?.contactSeconds ?? 0);

  switch (input.sanitiser) {
    case 'chlorine': {
      const max = label?.maxPpm ?? CHLORINE_MAX_PPM;
      needRange(25, max, 'chlorine');
      if (ph == null) add('ph', 'Enter the pH: chlorine\u2019s minimum temperature depends on it.');
      else if (ph > 10) add('ph', `pH ${ph} is too high: chlorine needs pH 10 or lower.`);
      const band = ppm != null && ppm >= 25 && ppm <= max ? CHLORINE_BANDS.find((b) => ppm >= b.from) : undefined;
      if (band && ph != null && ph <= 10) {
        const min = ph <= 8 ? band.atPh8 : band.atPh10;
        needTemp(min, `chlorine at ${band.label} and pH ${ph <= 8 ? '8' : '10'} or lower`);
        const isFiftyRow = band.from === 50 && temp != null && isAtOrAbove(temp, min);
        needContact(isFiftyRow ? CONTACT.chlorine50 : CONTACT.chlorine);
      } else if (seconds == null) {
        add('contactSeconds', 'Enter the contact time in seconds.');
      }
      break;
    }
    case 'iodine':
      needRange(IODINE.minPpm, IODINE.maxPpm, 'iodine');
      needTemp(IODINE.minTemp, 'iodine');
      if (ph == null) add('ph', 'Enter the pH.');
      else if (ph > IODINE.maxPh) add('ph', `pH ${ph} is too high: iodine needs pH 5.0 or lower (or the label\u2019s limit).`);
      needContact(labelContact(label ?? null));
      break;
    case 'quaternary_ammonium': {
      const l = needLabel();
      if (l) needRange(l.minPpm, l.maxPpm, 'this product\u2019s label');
      const labelMin = l?.minTempC != null && l.minTempC > QUAT.minTemp.celsius ? labelLimit(l.minTempC) : QUAT.minTemp;
      needTemp(labelMin, 'quaternary ammonium');
      const maxHardness = l?.maxHardnessPpm ?? QUAT.maxHardnessPpm;
      if (input.hardnessPpm == null) add('hardnessPpm', 'Enter the water hardness in ppm (mg/L).');
      else if (input.hardnessPpm > maxHardness) add('hardnessPpm', `Water hardness of ${input.hardnessPpm} ppm is too high: quaternary ammonium needs ${maxHardness} ppm or less.`);
      needContact(labelContact(l));
      break;
    }
    case 'hot_water':
      needTemp(HOT_WATER.minTemp, 'hot-water sanitising');
      needContact(HOT_WATER.contactSeconds);
      break;
    case 'label_product': {
      const l = needLabel();
      if (l) needRange(l.minPpm, l.maxPpm, 'this product\u2019s label');
      if (l?.minTempC != null) needTemp(labelLimit(l.minTempC), 'this product\u2019s label');
      needContact(labelContact(l));
      break;
    }
  }

  const cautions = [...SANITISER_CAUTIONS];
  if (input.sanitiser === 'hot_water') cautions.push(SCALD_CAUTION);
  return { passed: problems.length === 0, problems, cautions };
}
