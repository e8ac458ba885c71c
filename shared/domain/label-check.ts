import type { LabelElementKey, RuleProfile } from '../contracts/rule-profiles';
import { checkContainsLine } from './allergens';
import type { BatchState } from './batch-states';
import { isContainsTypeSizeOk } from './label-format';
import {
  layoutLabel, minBodyPt, minNetQuantityPt, printedText, type LabelBlock, type LabelLayout, type LegalMinimum, type TextMeasure,
} from './label-layout';
import type { LabelTemplate } from './label-templates';
import type { LabelText } from './label-text';
import { diffLabelText, summariseLabelText, type LabelTextChange, type LabelTextSummary } from './recipe-label';

export interface LabelBusinessFacts {
  name: string;
  addressLine: string;
  city: string;
  region: string;
  postalCode: string;
  registrationNumber: string;
  registrationAuthority: string;
}

export interface LabelBatchFacts {
  lotCode: string;
  madeOn: string;
  bestBy: string | null;
  state: BatchState;
  hasUnresolvedHoldingViolation: boolean;
}

export interface LabelCheckInput {
  productName: string;
  /** The label text of the batch's recipe version as it stands now (what will print). */
  labelText: LabelText;
  /** The label text saved with the batch when it was made; null for a batch recorded without one. */
  snapshot: LabelText | null;
  profile: RuleProfile;
  batch: LabelBatchFacts;
  business: LabelBusinessFacts;
  template: LabelTemplate;
  /** Modules per side of the QR symbol (without quiet zone). */
  qrModules: number;
  measure: TextMeasure;
  /** The owner confirms printing for a batch made while the product assessment said "needs review". */
  confirmNeedsReview: boolean;
  actorRole: string;
}

export interface LabelProblem {
  code: string;
  message: string;
}

export interface LabelCheckResult {
  ok: boolean;
  /** Everything that stops printing, all at once. */
  problems: LabelProblem[];
  warnings: LabelProblem[];
  /** The batch was made while the product assessment said "needs review": only the owner may confirm. */
  needsOwnerConfirmation: boolean;
  layout: LabelLayout | null;
  minimums: LegalMinimum[];
  /** What changed in the label text since the batch was made (the lot page shows a correction notice). */
  changesSinceMade: LabelTextChange[];
}

const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** A calendar date for a label: "Nov 30, 2026" in the US, "30 Nov 2026" elsewhere (month named, never ambiguous). */
export function formatLabelDate(isoDate: string, regime: 'US' | 'EU' | 'UK'): string {
  const [y, m, d] = isoDate.split('-').map(Number) as [number, number, number];
  const month = MONTHS[m - 1]!;
  return regime === 'US' ? `${month} ${d}, ${y}` : `${d} ${month} ${y}`;
}

/** "14 Juniper Lane, Millbrook, TX 78999" from the parts that are filled in. */
export function businessAddress(b: LabelBusinessFacts): string {
  const cityLine = [b.city, [b.region, b.postalCode].filter(Boolean).join(' ')].filter(Boolean).join(', ');
  return [b.addressLine, cityLine].filter(Boolean).join(', ');
}

const hasAddress = (b: LabelBusinessFacts) => b.addressLine.trim() !== '' && b.city.trim() !== '';

/**
 * The business line the profile asks for: name and address (21 CFR 101.5; Reg. 1169/2011 Art. 9(1)(h)),
 * or name and registration number where the rule allows it instead of the address (Tex. HSC 437.0193(b-1),
 * Minn. Stat. 28A.152), plus the registration number where it is required (California).
 */
export function businessLine(b: LabelBusinessFacts, required: readonly LabelElementKey[]): string {
  const reg = b.registrationNumber.trim() ? `Reg. no. ${b.registrationNumber.trim()}${b.registrationAuthority.trim() ? ` (${b.registrationAuthority.trim()})` : ''}` : '';
  const parts = [b.name.trim()];
  const wantsAddress = required.includes('businessNameAddress') || (!required.includes('businessNameRegistration') && !required.includes('registrationNumber'));
  if (wantsAddress || (required.includes('businessNameRegistration') && !reg) || (required.includes('registrationNumber') && hasAddress(b))) {
    if (hasAddress(b)) parts.push(businessAddress(b));
  }
  if (reg && (required.includes('registrationNumber') || required.includes('businessNameRegistration'))) parts.push(reg);
  return parts.filter(Boolean).join(', ');
}

/** The blocks of the label, from the batch's data only, in printing order. */
export function labelBlocks(input: Pick<LabelCheckInput, 'productName' | 'labelText' | 'profile' | 'batch' | 'business'>, netMinPt: number): { blocks: LabelBlock[]; bottomBlock: LabelBlock | null } {
  const { labelText: t, batch } = input;
  const regime = t.allergenStatement.regime.code;
  const emphasise = t.allergenStatement.isEmphasisRequired;
  const blocks: LabelBlock[] = [{ key: 'productName', runs: [{ text: input.productName, isBold: true }], scale: 1.3, minPt: 0 }];
  if (t.ingredientStatement.text) {
    blocks.push({ key: 'ingredients', runs: t.ingredientStatement.segments.map((s) => ({ text: s.text, isBold: emphasise && s.isAllergen })), scale: 1, minPt: 0 });
  }
  if (t.allergenStatement.containsLine) blocks.push({ key: 'contains', runs: [{ text: t.allergenStatement.containsLine, isBold: true }], scale: 1, minPt: 0 });
  if (t.allergenStatement.crossContact) blocks.push({ key: 'crossContact', runs: [{ text: t.allergenStatement.crossContact.text, isBold: false }], scale: 1, minPt: 0 });
  for (const s of t.statements) blocks.push({ key: s.key, runs: [{ text: s.text, isBold: true }], scale: 1, minPt: s.minPoints ?? 0 });
  blocks.push({ key: 'business', runs: [{ text: businessLine(input.business, t.requiredElements), isBold: false }], scale: 1, minPt: 0 });
  const dates = [`Made on ${formatLabelDate(batch.madeOn, regime)}`, ...(batch.bestBy ? [`Best by ${formatLabelDate(batch.bestBy, regime)}`] : [])];
  blocks.push({ key: 'dates', runs: [{ text: dates.join(' · '), isBold: false }], scale: 1, minPt: 0 });
  blocks.push({ key: 'lot', runs: [{ text: `Lot ${batch.lotCode}`, isBold: true }], scale: 1, minPt: 0 });
  const bottomBlock: LabelBlock | null = t.netQuantity ? { key: 'netQuantity', runs: [{ text: t.netQuantity.text, isBold: true }], scale: 1, minPt: netMinPt } : null;
  return { blocks, bottomBlock };
}

/** Each required label element in words, for messages and the rule-profile screen. */
export const ELEMENT_NAMES: Record<LabelElementKey, string> = {
  productName: 'the product name', ingredients: 'the ingredient list', allergens: 'the allergen statement', netQuantity: 'the net quantity',
  businessNameAddress: 'the business name and address', businessNameRegistration: 'the business name with its address or registration number',
  registrationNumber: 'the registration number', homeKitchenStatement: 'the home-kitchen statement', madeOnDate: 'the made-on date',
  bestByDate: 'the best-by date', lotCode: 'the lot code', safeHandlingStatement: 'the safe-handling statement',
};

/** Why a required element is missing, in plain words, or null when it is there. */
function missingElement(key: LabelElementKey, input: LabelCheckInput): string | null {
  const { labelText: t, business: b, batch } = input;
  const statement = (k: 'homeKitchenStatement' | 'safeHandlingStatement') => t.statements.some((s) => s.key === k && s.text.trim());
  switch (key) {
    case 'productName': return input.productName.trim() ? null : 'The product has no name. Name the recipe.';
    case 'ingredients': return t.ingredientStatement.entries.length ? null : 'There is no ingredient list: the recipe has no ingredients.';
    case 'allergens': return null; // Checked on its own below (complete Contains line or emphasis).
    case 'netQuantity': return t.netQuantity ? null : 'The net quantity is missing. Enter the piece weight and pieces per package on the recipe.';
    case 'businessNameAddress':
      if (!b.name.trim()) return 'The business name is missing. An owner can add it in Settings.';
      return hasAddress(b) ? null : 'The business address is missing (street and town). An owner can add it in Settings.';
    case 'businessNameRegistration':
      if (!b.name.trim()) return 'The business name is missing. An owner can add it in Settings.';
      return hasAddress(b) || b.registrationNumber.trim() ? null : 'The label needs the business address or its registration number. An owner can add either in Settings.';
    case 'registrationNumber': return b.registrationNumber.trim() ? null : 'The registration or permit number is missing. An owner can add it in Settings.';
    case 'homeKitchenStatement': return statement('homeKitchenStatement') ? null : 'The home-kitchen statement your rules require is missing from the rule profile.';
    case 'safeHandlingStatement': return statement('safeHandlingStatement') ? null : 'The safe-handling statement your rules require is missing from the rule profile.';
    case 'madeOnDate': return batch.madeOn ? null : 'The made-on date is missing.';
    case 'bestByDate': return batch.bestBy ? null : 'The best-by date is missing. Set the shelf life on the recipe or correct the batch.';
    case 'lotCode': return batch.lotCode.trim() ? null : 'The lot code is missing.';
  }
}

const BLOCKED_STATES: Partial<Record<BatchState, string>> = {
  held: 'This batch is on hold. Release it (or discard it) before printing labels.',
  discarded: 'This batch was discarded; it cannot be labelled.',
  recalled: 'This batch is recalled; it cannot be labelled.',
};

const pt = (n: number) => `${Math.round(n * 100) / 100} pt`;

/**
 * The label check run before any PDF is made: every element the rule profile requires is present, the
 * allergen statement is complete and printed whole, the text fits at or above each legal minimum (shrinking
 * to it if needed), and the batch may be labelled (not held, discarded or recalled, no unresolved holding
 * violation, owner's confirmation when it was made while the product assessment said "needs review").
 * Returns every problem at once.
 */
export function checkLabel(input: LabelCheckInput): LabelCheckResult {
  const { labelText: t, profile, template, measure, batch } = input;
  const problems: LabelProblem[] = [];
  const warnings: LabelProblem[] = [];
  const add = (list: LabelProblem[], code: string, message: string) => {
    if (!list.some((p) => p.code === code && p.message === message)) list.push({ code, message });
  };

  const blocked = BLOCKED_STATES[batch.state];
  if (blocked) add(problems, `batch_${batch.state}`, blocked);
  if (batch.hasUnresolvedHoldingViolation) add(problems, 'holding_violation', 'A holding time of this batch went over its limit and the corrective action is not recorded. Record it on the batch first.');
  if (batch.state === 'in_progress') add(warnings, 'batch_not_released', 'This batch is not released yet. Labels can be printed, but release it before it is sold.');

  // Made while the product's TCS assessment said "needs review" (as saved with the batch).
  const assessment = (input.snapshot ?? t).tcs?.result;
  const needsOwnerConfirmation = assessment === 'needs_review';
  if (needsOwnerConfirmation) {
    if (input.actorRole !== 'owner') add(problems, 'needs_review_owner', 'This batch was made while the product\u2019s safety assessment said \u201cneeds review\u201d. Only the owner can confirm printing its labels.');
    else if (!input.confirmNeedsReview) add(problems, 'needs_review_unconfirmed', 'This batch was made while the product\u2019s safety assessment said \u201cneeds review\u201d. Confirm that you have checked it before printing.');
  }

  for (const key of t.requiredElements) {
    const why = missingElement(key, input);
    if (why) add(problems, `missing_${key}`, why);
  }
  for (const c of t.cautions) {
    if (c.code === 'net_quantity_missing') continue; // Reported as a missing element when the profile requires it.
    if (c.severity === 'block') add(problems, c.code, c.message);
    else if (c.severity === 'warn') add(warnings, c.code, c.message);
  }

  const regime = t.allergenStatement.regime.code;
  const allergens = t.allergenStatement.allergens;
  if (regime === 'US' && allergens.length > 0 && !t.allergenStatement.containsLine) {
    add(problems, 'contains_incomplete', 'The \u201cContains\u201d line cannot be written completely (21 U.S.C. 343(w)). Fix what the cautions above name.');
  }

  const bodyMin = minBodyPt(template, regime, measure.xHeightPerEm.regular);
  const netMin = profile.netQuantity.value.units === 'us-dual' ? minNetQuantityPt(template, measure.xHeightPerEm.bold) : { ...bodyMin, key: 'netQuantity' as const };
  const minimums = [bodyMin, netMin];
  const { blocks, bottomBlock } = labelBlocks(input, netMin.pt);
  const result = layoutLabel(measure, { template, blocks, bottomBlock, qrModules: input.qrModules, maxBodyPt: 10, minBodyPt: bodyMin.pt });
  let layout: LabelLayout | null = null;
  if (!result.fits) {
    const floors = [...blocks, ...(bottomBlock ? [bottomBlock] : [])].filter((b) => b.minPt > bodyMin.pt).map((b) => `${b.key === 'netQuantity' ? 'the net quantity' : ELEMENT_NAMES[b.key as LabelElementKey] ?? b.key} at ${pt(b.minPt)}`);
    add(problems, 'text_does_not_fit', `The label text does not fit on a ${template.name} label, even at ${pt(bodyMin.pt)} (the smallest the rules allow: ${bodyMin.source})${floors.length ? ` with ${floors.join(' and ')}` : ''}. Choose a larger label.`);
  } else {
    layout = result.layout;
    const s = layout.sizes;
    if (s.contains !== undefined && s.ingredients !== undefined && !isContainsTypeSizeOk(s.contains, s.ingredients)) {
      add(problems, 'contains_too_small', 'The \u201cContains\u201d line would be smaller than the ingredient list (21 U.S.C. 343(w)(1)(B)).');
    }
    // What is laid out must carry the whole statement and every allergen.
    if (t.ingredientStatement.text && printedText(layout, 'ingredients') !== t.ingredientStatement.text.replace(/\s+/g, ' ').trim()) {
      add(problems, 'ingredients_incomplete', 'Part of the ingredient list would be left off the label.');
    }
    if (t.allergenStatement.containsLine) {
      const printed = printedText(layout, 'contains');
      for (const p of checkContainsLine(printed, allergens)) add(problems, 'contains_incomplete', `The \u201cContains\u201d line is not complete: ${p}`);
    }
    if (t.allergenStatement.isEmphasisRequired && allergens.length > 0 && !layout.lines.some((l) => l.block === 'ingredients' && l.pieces.some((p) => p.isBold))) {
      add(problems, 'allergens_not_emphasised', 'The allergens must be emphasised in the ingredient list (Reg. (EU) No 1169/2011 Art. 21(1)(b)).');
    }
    for (const st of t.statements) {
      const printed = printedText(layout, st.key);
      if (printed !== st.text.replace(/\s+/g, ' ').trim()) add(problems, `${st.key}_altered`, 'The required statement would not be printed word for word.');
      if (st.minPoints && (s[st.key] ?? 0) < st.minPoints) add(problems, `${st.key}_too_small`, `The required statement must be at least ${st.minPoints} pt.`);
    }
  }

  let changesSinceMade: LabelTextChange[] = [];
  if (input.snapshot) {
    const before: LabelTextSummary = summariseLabelText(input.snapshot);
    changesSinceMade = diffLabelText(before, summariseLabelText(t)).filter((c) => c.field !== 'statements');
    if (changesSinceMade.length) {
      add(warnings, 'label_changed_since_made', `The label text changed since this batch was made (${changesSinceMade.map((c) => c.label.toLowerCase()).join(', ')}). Labels print the current text; the lot page shows a correction notice.`);
    }
  }
  return { ok: problems.length === 0, problems, warnings, needsOwnerConfirmation, layout, minimums, changesSinceMade };
}
