import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { HOLDING_KINDS, StartHoldingInputSchema } from '@shared/contracts/holding';
import { holdingPolicyName } from '@shared/domain/holding-rules';
import { HOLDING_POLICIES } from '@shared/domain/holding-policies';
import { Dialog } from '@/components/ui/dialog';
import { Button } from '@/components/ui/button';
import { Field, FormError } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { applyServerErrors } from '@/lib/form-errors';
import { useStartHolding } from '../api';
import { UNIT_OPTIONS } from './reading-dialog';

export const KIND_LABELS: Record<(typeof HOLDING_KINDS)[number], string> = {
  resting: 'Resting',
  cooling: 'Cooling',
  setting: 'Setting',
  display: 'On display',
  custom: 'Other',
};

interface FormValues {
  batchId: string;
  kind: (typeof HOLDING_KINDS)[number];
  label?: string;
  policy?: (typeof HOLDING_POLICIES)[number];
  customLimitMinutes?: number;
  firstReading?: { value: string; unit: 'F' | 'C' };
}

// The same contract schema the server parses; empty optional fields are dropped first.
const FormSchema = z.preprocess((raw) => {
  const v = { ...(raw as Record<string, unknown>) };
  const reading = v.firstReading as { value?: string } | undefined;
  if (!reading?.value) delete v.firstReading;
  for (const key of ['label', 'policy', 'customLimitMinutes'] as const) {
    if (v[key] === '' || v[key] === undefined || Number.isNaN(v[key])) delete v[key];
  }
  return v;
}, StartHoldingInputSchema);

const FIELDS = ['batchId', 'kind', 'label', 'policy', 'customLimitMinutes', 'firstReading', 'firstReading.value', 'firstReading.unit'];

/** Starts a holding timer: batch, what the food is doing, the limit and the first temperature. */
export function StartTimerDialog({ batchOptions, isOpen, onClose, fixedBatchId }: {
  batchOptions: Array<{ id: string; lotCode: string; productName: string }>;
  isOpen: boolean;
  onClose: () => void;
  fixedBatchId?: string;
}) {
  const start = useStartHolding();
  const form = useForm<FormValues>({
    resolver: zodResolver(FormSchema as unknown as z.ZodType<FormValues, FormValues>),
    defaultValues: { batchId: fixedBatchId ?? '', kind: 'resting', policy: undefined, firstReading: { value: '', unit: 'F' } },
  });
  const { errors } = form.formState;
  const kind = form.watch('kind');
  const policy = form.watch('policy');
  const submit = form.handleSubmit(async (values) => {
    try {
      await start.run(FormSchema.parse(values) as FormValues);
      form.reset();
      onClose();
    } catch (err) {
      applyServerErrors(err, form.setError, FIELDS);
    }
  });
  const readingError = errors.firstReading?.message ?? errors.firstReading?.value?.message;
  return (
    <Dialog isOpen={isOpen} onClose={onClose} title="Start a timer" description="Out of the fridge or off the heat now? Start the clock and take the temperature.">
      <form onSubmit={submit} noValidate className="space-y-4 text-board">
        <FormError message={errors.root?.server?.message} />
        {fixedBatchId ? null : (
          <Select
            label="Batch"
            placeholder="Choose a batch"
            options={batchOptions.map((b) => ({ value: b.id, label: `${b.productName} — ${b.lotCode}` }))}
            error={errors.batchId?.message}
            data-autofocus
            {...form.register('batchId')}
          />
        )}
        <Select label="What is the food doing?" options={HOLDING_KINDS.map((k) => ({ value: k, label: KIND_LABELS[k] }))} error={errors.kind?.message} {...form.register('kind')} />
        {kind === 'custom' ? <Field label="Name it" error={errors.label?.message} {...form.register('label')} /> : null}
        <Select
          label="Time limit"
          placeholder="The recipe's or the rules' default"
          options={HOLDING_POLICIES.map((p) => ({ value: p, label: p === 'custom' ? 'Own quality limit (minutes)' : holdingPolicyName(p) }))}
          error={errors.policy?.message}
          {...form.register('policy', { setValueAs: (v: string) => (v === '' ? undefined : v) })}
        />
        {policy === 'custom' ? (
          <Field label="Limit in minutes" inputMode="numeric" error={errors.customLimitMinutes?.message} {...form.register('customLimitMinutes', { setValueAs: (v: string) => (v === '' ? undefined : Number(v)) })} />
        ) : null}
        <fieldset>
          <legend className="font-bold">Temperature now</legend>
          <p className="text-base text-muted">Needed for time as a public health control and for cooling.</p>
          <div className="mt-2 flex gap-3">
            <Field label="Reading" inputMode="decimal" autoComplete="off" className="flex-1" isOptional error={readingError} {...form.register('firstReading.value')} />
            <Select label="Unit" options={UNIT_OPTIONS} error={errors.firstReading?.unit?.message} {...form.register('firstReading.unit')} />
          </div>
        </fieldset>
        <div className="flex flex-wrap justify-end gap-3">
          <Button variant="secondary" size="board" onClick={onClose}>Cancel</Button>
          <Button type="submit" size="board" isBusy={start.isPending}>Start timer</Button>
        </div>
      </form>
    </Dialog>
  );
}
