import { useQuery } from '@tanstack/react-query';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { RecordStepInputSchema, type RecordStepInput, type SanitiserProduct } from '@shared/contracts/cleaning';
import { checkSanitiser, type Sanitiser, type SanitiserLabel } from '@shared/domain/sanitiser-checks';
import { Button } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { Field, FormError } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { StatusBadge } from '@/components/ui/status-badge';
import { Textarea } from '@/components/ui/textarea';
import { applyServerErrors } from '@/lib/form-errors';
import { cleaningQueries, useAddCleaningStep } from '../api';

export const SANITISER_NAMES: Record<Sanitiser, string> = {
  chlorine: 'Chlorine (bleach)',
  iodine: 'Iodine',
  quaternary_ammonium: 'Quaternary ammonium (quat)',
  hot_water: 'Hot water',
  label_product: 'Other product (its label range)',
};
const SANITISER_OPTIONS = Object.entries(SANITISER_NAMES).map(([value, label]) => ({ value, label }));
const UNIT_OPTIONS = [{ value: 'F', label: '°F' }, { value: 'C', label: '°C' }];

/** Empty input → undefined, otherwise a number (NaN if not one, which the schema reports). */
const asNumber = (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(String(v).replace(',', '.')));

function labelOf(p: SanitiserProduct | undefined): SanitiserLabel | null {
  return p ? { minPpm: p.labelMinPpm, maxPpm: p.labelMaxPpm, minTempC: p.labelMinTempC, contactSeconds: p.labelContactSeconds, maxHardnessPpm: p.labelMaxHardnessPpm } : null;
}

// Every caution the shared check knows, the hot-water scald warning included (it comes with that check).
const ALL_CAUTIONS = checkSanitiser({ sanitiser: 'hot_water' }).cautions;

/** The cautions shown with every sanitising step: never mix, test strips, the label, scalds, local rules. */
export function SanitiserCautions() {
  return (
    <CautionBox title="Sanitise safely" headingLevel={3}>
      <ul className="list-disc space-y-1 pl-5">
        {ALL_CAUTIONS.map((c) => <li key={c}>{c}</li>)}
      </ul>
    </CautionBox>
  );
}

/**
 * The sanitising step: what was used and what was measured, with the pass/fail of the shared check
 * (FDA Food Code 2022 4-501.114, 4-501.111, 4-703.11 or the product label) shown as you type.
 */
export function SanitiseStepForm({ runId, stepKey, onDone }: { runId: string; stepKey: string; onDone: () => void }) {
  const products = useQuery(cleaningQueries.products()).data?.filter((p) => !p.archived) ?? [];
  const add = useAddCleaningStep();
  const form = useForm<RecordStepInput>({
    resolver: zodResolver(RecordStepInputSchema),
    defaultValues: { stepKey, sanitising: { sanitiser: 'chlorine', waterTemperature: { value: '', unit: 'F' } } },
  });
  const { errors } = form.formState;
  const s = useWatch({ control: form.control, name: 'sanitising' });
  const sanitiser = (s?.sanitiser ?? 'chlorine') as Sanitiser;
  const product = products.find((p) => p.id === s?.productId);
  const temp = s?.waterTemperature?.value !== undefined && String(s.waterTemperature.value) !== '' ? { value: String(s.waterTemperature.value), unit: s.waterTemperature.unit } : null;
  const num = (v: unknown) => { const n = asNumber(v); return n === undefined || Number.isNaN(n) ? null : n; };
  const verdict = checkSanitiser({
    sanitiser, concentrationPpm: num(s?.concentrationPpm), waterTemperature: temp, ph: num(s?.ph), contactSeconds: num(s?.contactSeconds),
    hardnessPpm: num(s?.hardnessPpm), label: labelOf(product),
  });
  const productOptions = products.filter((p) => p.sanitiser === sanitiser).map((p) => ({ value: p.id, label: `${p.name} (label ${p.labelMinPpm}–${p.labelMaxPpm} ppm)` }));
  const needsProduct = sanitiser === 'quaternary_ammonium' || sanitiser === 'label_product';

  const submit = form.handleSubmit(async (input) => {
    try {
      await add.run({ runId, input });
      onDone();
    } catch (err) {
      applyServerErrors(err, form.setError, ['sanitising', 'sanitising.productId', 'sanitising.concentrationPpm', 'sanitising.waterTemperature.value', 'sanitising.ph', 'sanitising.contactSeconds', 'sanitising.hardnessPpm', 'failureReason']);
    }
  });
  const e = errors.sanitising;
  return (
    <form onSubmit={submit} noValidate className="space-y-4" aria-label="Sanitising measurements">
      <FormError message={errors.root?.server?.message} />
      <SanitiserCautions />
      <div className="grid gap-4 sm:grid-cols-2">
        <Select label="Sanitiser" options={SANITISER_OPTIONS} error={e?.sanitiser?.message} {...form.register('sanitising.sanitiser')} />
        {sanitiser !== 'hot_water' ? (
          <Select label="Product" placeholder={needsProduct ? 'Choose the product' : 'No product (Food Code ranges)'} isOptional={!needsProduct} options={productOptions}
            hint={needsProduct ? 'Its label gives the range to check against.' : undefined} error={e?.productId?.message} {...form.register('sanitising.productId', { setValueAs: (v) => (v === '' ? undefined : v) })} />
        ) : null}
        {sanitiser !== 'hot_water' ? (
          <Field label="Concentration" hint="ppm (mg/L), from the test strip" inputMode="decimal" autoComplete="off" error={e?.concentrationPpm?.message} {...form.register('sanitising.concentrationPpm', { setValueAs: asNumber })} />
        ) : null}
        <div className="flex gap-3">
          <Field label="Water temperature" inputMode="decimal" autoComplete="off" className="flex-1" error={e?.waterTemperature?.value?.message} {...form.register('sanitising.waterTemperature.value')} />
          <Select label="Unit" options={UNIT_OPTIONS} {...form.register('sanitising.waterTemperature.unit')} />
        </div>
        {sanitiser === 'chlorine' || sanitiser === 'iodine' ? (
          <Field label="pH" inputMode="decimal" autoComplete="off" error={e?.ph?.message} {...form.register('sanitising.ph', { setValueAs: asNumber })} />
        ) : null}
        <Field label="Contact time" hint="seconds" inputMode="numeric" autoComplete="off" error={e?.contactSeconds?.message} {...form.register('sanitising.contactSeconds', { setValueAs: asNumber })} />
        {sanitiser === 'quaternary_ammonium' ? (
          <Field label="Water hardness" hint="ppm (mg/L)" inputMode="numeric" autoComplete="off" error={e?.hardnessPpm?.message} {...form.register('sanitising.hardnessPpm', { setValueAs: asNumber })} />
        ) : null}
      </div>
      <div role="status" aria-live="polite" className="rounded-card border border-hairline bg-surface p-3">
        {verdict.passed ? <StatusBadge status="within-limit" label="Check passes" /> : <StatusBadge status="failed" label="Check fails" />}
        {verdict.problems.length ? (
          <ul className="mt-2 list-disc space-y-1 pl-5">{verdict.problems.map((p) => <li key={p.field + p.message}>{p.message}</li>)}</ul>
        ) : null}
      </div>
      {!verdict.passed ? (
        <Textarea label="Why this is accepted" isOptional rows={2} hint="Leave empty to redo the step with a fresh solution; a failed check needs a redo or a reason before signing."
          error={errors.failureReason?.message} {...form.register('failureReason', { setValueAs: (v) => (v === '' ? undefined : v) })} />
      ) : null}
      <div className="flex flex-wrap justify-end gap-3">
        <Button variant="secondary" size="board" onClick={onDone}>Cancel</Button>
        <Button type="submit" size="board" isBusy={add.isPending}>Save sanitising step</Button>
      </div>
    </form>
  );
}
