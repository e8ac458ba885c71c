import { SHIPPED_RULE_PROFILES } from '../../shared/domain/rule-profiles';
import type { RuleProfile, RuleSource } from '../../shared/contracts/rule-profiles';

// Writes docs/rule-profiles.md from the shipped profiles, so the page cannot drift from the data:
//   npx tsx server/scripts/rule-profiles-doc.ts > docs/rule-profiles.md

const pipe = (s: string) => s.replace(/\|/g, '\\|');
const dateOf = (s: RuleSource) => {
  if (s.checkedOn) return `checked ${s.checkedOn}`;
  const m = s.citation.match(/\b(\d{1,2} [A-Z][a-z]{2} \d{4}|(?:19|20)\d{2})\b/g);
  return m ? [...new Set(m)].join(', ') : 'not stated';
};
const srcCells = (s: RuleSource) => {
  const cite = pipe(s.citation) + (s.url ? ` (<${s.url}>)` : '') + (s.note ? ` — ${pipe(s.note)}` : '');
  return `${cite} | ${dateOf(s)} | ${s.verified ? 'yes' : '**not verified**'}`;
};
const row = (what: string, value: string, s: RuleSource) => `| ${what} | ${pipe(value)} | ${srcCells(s)} |`;
const stmt = (v: { text: string; minPoints: number | null } | null) =>
  v ? `“${v.text}” — minimum ${v.minPoints === null ? 'size: none set' : `${v.minPoints} pt`}` : 'none';
const chem = (r: RuleProfile['sanitisers']['value'][number]) => {
  switch (r.chemical) {
    case 'chlorine': return `chlorine ${r.minMgL}–${r.maxMgL ?? 'label maximum'} mg/L, ≥ ${r.minTempCAtPhUpTo10} °C at pH ≤ 10 / ≥ ${r.minTempCAtPhUpTo8} °C at pH ≤ 8, ≥ ${r.minContactSeconds} s`;
    case 'iodine': return `iodine ${r.minMgL}–${r.maxMgL} mg/L, ≥ ${r.minTempC} °C, pH ≤ ${r.maxPh}, ≥ ${r.minContactSeconds} s`;
    case 'quaternary_ammonium': return `quaternary ammonium (label concentration), ≥ ${r.minTempC} °C, hardness ≤ ${r.maxWaterHardnessMgL} mg/L, ≥ ${r.minContactSeconds} s`;
    case 'hot_water': return `hot water ≥ ${r.minTempC} °C, ≥ ${r.minContactSeconds} s`;
    case 'label_product': return r.note;
  }
};
const holding = (h: RuleProfile['holdingPolicy']['value']) =>
  h.kind === 'tphc_4h' ? 'time as a public health control, 4 h (tphc_4h)'
  : h.kind === 'none' ? 'timer only, no limit (none)'
  : h.kind === 'custom' ? `own limit of ${h.customLimitMinutes} min (custom)` : h.kind;

const sanitiserSets = new Map<string, { name: string; rules: RuleProfile['sanitisers']['value'] }>();
for (const p of SHIPPED_RULE_PROFILES) {
  const k = JSON.stringify(p.sanitisers.value);
  if (!sanitiserSets.has(k)) sanitiserSets.set(k, { name: p.sanitisers.value.some((r) => r.chemical === 'label_product') ? 'product label' : 'Food Code set', rules: p.sanitisers.value });
}

const out: string[] = [
  '# Rule profiles shipped with Crumbtrail',
  '',
  '> **Caution.** These profiles are starting points, not legal advice. Local rules and your local health authority',
  '> decide what your labels must say, what you may sell and how you must hold and clean. Rules differ by country,',
  '> state and county, and they change. Check every value before you rely on it. An owner can copy a profile and edit',
  '> it on the **Rule profiles** screen; the copy is then the one your business uses.',
  '',
  '<!-- Generated from shared/domain/rule-profiles.ts by server/scripts/rule-profiles-doc.ts; edit the data, then re-run. -->',
  '',
  'Every value carries the source it was taken from. **not verified** marks a value that could not be checked in a',
  'published text: a value from memory, a secondary source only, or a figure that changes each year. "Source date" lists',
  'the dates the citation itself names (the year of a statute or regulation, an edition date); "not stated" means the',
  'citation names none. The profile in force on a date is the one whose start date is on or before it and whose end',
  'date is after it (Texas: 31 Aug 2025 uses the earlier profile, 1 Sep 2025 the later).',
  '',
  'Label element names: productName (name of the food), ingredients, allergens (allergen statement), netQuantity,',
  'businessNameAddress, businessNameRegistration (business name and registration or permit), registrationNumber,',
  'homeKitchenStatement, madeOnDate, bestByDate, lotCode, safeHandlingStatement.',
  '',
];
for (const p of SHIPPED_RULE_PROFILES) {
  out.push(`## ${p.name}`, '', `Profile id \`${p.id}\`; in force from ${p.effectiveFrom}${p.effectiveTo ? ` until the day before ${p.effectiveTo}` : ' (no end date)'}.`, '');
  out.push('| value | shipped | source | source date | verified |', '|---|---|---|---|---|');
  out.push(row('In force', `${p.effectiveFrom} – ${p.effectiveTo ?? 'open'}`, p.effectiveSource));
  out.push(row('Allergen regime and rule-set date', `${p.allergenRegime.value.regime}, ${p.allergenRegime.value.ruleSetDate}`, p.allergenRegime.source));
  out.push(row('Home-kitchen statement', stmt(p.homeKitchenStatement.value), p.homeKitchenStatement.source));
  out.push(row('Safe-handling statement (TCS products)', stmt(p.tcsStatement.value), p.tcsStatement.source));
  const grouped = (what: string, els: RuleProfile['requiredLabelElements']) => {
    const bySource = new Map<string, { keys: string[]; source: RuleSource }>();
    for (const e of els) {
      const k = JSON.stringify(e.source);
      bySource.set(k, { keys: [...(bySource.get(k)?.keys ?? []), e.key], source: e.source });
    }
    for (const g of bySource.values()) out.push(row(what, g.keys.join(', '), g.source));
  };
  grouped('Required label elements', p.requiredLabelElements);
  grouped('Required label elements (TCS products only)', p.tcsRequiredLabelElements);
  const n = p.netQuantity.value;
  out.push(row('Net quantity', `${n.units === 'us-dual' ? 'US customary and metric' : 'metric'}, ${n.rounding === 'round-down' ? 'rounded down' : 'rounded to nearest'}`, p.netQuantity.source));
  const c = p.salesCap.value;
  out.push(row('Sales cap', c ? `${c.currency} ${c.amount.toLocaleString('en-US')} per ${c.period === 'calendar-year' ? 'calendar year' : 'rolling 12 months'}; ${c.year === null ? 'no year stated' : `figure for ${c.year}`}` : 'none', p.salesCap.source));
  out.push(row('Allowed sales channels', p.salesChannels.value.join(', '), p.salesChannels.source));
  out.push(row('Foods needing time/temperature control allowed', p.allowsTcsFoods.value ? 'yes' : 'no', p.allowsTcsFoods.source));
  out.push(row('Default holding policy', holding(p.holdingPolicy.value), p.holdingPolicy.source));
  const set = sanitiserSets.get(JSON.stringify(p.sanitisers.value));
  out.push(row('Sanitiser rules', set ? `${set.name} (see “Sanitiser rule sets”)` : p.sanitisers.value.map(chem).join('; '), p.sanitisers.source));
  out.push('');
}
out.push('## Sanitiser rule sets', '');
for (const { name, rules } of sanitiserSets.values()) {
  out.push(`**${name}**`, '', ...rules.map((r) => `- ${chem(r)}`), '');
}
out.push('Always follow the EPA-registered (or, outside the US, the product) label of the sanitiser as well; where the two differ, ask your health authority.', '');
console.log(out.join('\n').trimEnd());
