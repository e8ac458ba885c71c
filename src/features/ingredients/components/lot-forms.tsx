import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import {
  CreateSupplierLotInputSchema, LabelCheckInputSchema, type CreateSupplierLotFormValues, type CreateSupplierLotInput,
  type LabelCheckFormValues, type LabelCheckInput,
} from '@shared/contracts/ingredients';
import { applyServerErrors } from '@/lib/form-errors';
import { Field, FormError } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { Button } from '@/components/ui/button';
import { useToast } from '@/components/ui/toast';
import { useReceiveLot, useRecordLabelCheck } from '../api';

/** Receiving a delivery: the lot code from the package and the day it arrived. */
export function ReceiveLotForm({ ingredientId, today }: { ingredientId: string; today: string }) {
  const receive = useReceiveLot(ingredientId);
  const { showToast } = useToast();
  const { register, handleSubmit, setError, reset, formState } = useForm<CreateSupplierLotFormValues, unknown, CreateSupplierLotInput>({
    resolver: zodResolver(CreateSupplierLotInputSchema),
    defaultValues: { lotCode: '', receivedOn: today, bestBy: null, quantity: '', notes: '' },
  });
  const onSubmit = handleSubmit((input) => receive.mutateAsync(input).then(
    (lot) => { reset(); showToast(`Lot ${lot.lotCode} received. Compare its label with the stored one.`); },
    (err) => applyServerErrors(err, setError),
  ));
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-3 sm:grid-cols-2" aria-label="Receive a lot">
      <div className="sm:col-span-2"><FormError message={formState.errors.root?.server?.message} /></div>
      <Field label="Lot code on the package" error={formState.errors.lotCode?.message} {...register('lotCode')} />
      <Field label="Received on" type="date" error={formState.errors.receivedOn?.message} {...register('receivedOn')} />
      <Field label="Best by" type="date" isOptional error={formState.errors.bestBy?.message} {...register('bestBy', { setValueAs: (v) => v || null })} />
      <Field label="Quantity" isOptional hint="e.g. 2 × 5 lb bags" error={formState.errors.quantity?.message} {...register('quantity')} />
      <div className="sm:col-span-2"><Button type="submit" isBusy={receive.isPending}>Record lot</Button></div>
    </form>
  );
}

/** "Does this lot's label still say the same?" — suppliers change recipes without notice. */
export function LabelCheckForm({ ingredientId, lotId, lotCode }: { ingredientId: string; lotId: string; lotCode: string }) {
  const check = useRecordLabelCheck(ingredientId);
  const { showToast } = useToast();
  const { register, handleSubmit, setError, watch, formState } = useForm<LabelCheckFormValues, unknown, LabelCheckInput>({
    resolver: zodResolver(LabelCheckInputSchema),
    defaultValues: { outcome: 'matches', notes: '' },
  });
  const onSubmit = handleSubmit((input) => check.mutateAsync({ ...input, lotId }).then(
    () => showToast(input.outcome === 'changed' ? `Recorded: lot ${lotCode} label changed. Edit the ingredient to match the new label.` : `Recorded: lot ${lotCode} label matches.`),
    (err) => applyServerErrors(err, setError),
  ));
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-wrap items-end gap-3" aria-label={`Label re-check for lot ${lotCode}`}>
      <FormError message={formState.errors.root?.server?.message} />
      <Select label="Compared with the stored label" options={[{ value: 'matches', label: 'Matches' }, { value: 'changed', label: 'Changed' }]} {...register('outcome')} />
      <Field label="What changed" isOptional={watch('outcome') === 'matches'} error={formState.errors.notes?.message} {...register('notes')} />
      <Button type="submit" variant="secondary" isBusy={check.isPending}>Record re-check</Button>
    </form>
  );
}
