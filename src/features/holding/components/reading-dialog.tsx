import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { AddReadingInputSchema, type AddReadingInput } from '@shared/contracts/holding';
import { Dialog } from '@/components/ui/dialog';
import { Button } from '@/components/ui/button';
import { Field, FormError } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { applyServerErrors } from '@/lib/form-errors';
import { useAddReading } from '../api';

export const UNIT_OPTIONS = [
  { value: 'F', label: '°F' },
  { value: 'C', label: '°C' },
];

/** Adds a temperature reading to a running timer. */
export function ReadingDialog({ periodId, title, isOpen, onClose }: { periodId: string; title: string; isOpen: boolean; onClose: () => void }) {
  const add = useAddReading();
  const form = useForm<AddReadingInput>({ resolver: zodResolver(AddReadingInputSchema), defaultValues: { value: '', unit: 'F' } });
  const { errors } = form.formState;
  const submit = form.handleSubmit(async (input) => {
    try {
      await add.run({ periodId, ...input });
      form.reset({ value: '', unit: input.unit });
      onClose();
    } catch (err) {
      applyServerErrors(err, form.setError, ['value', 'unit']);
    }
  });
  return (
    <Dialog isOpen={isOpen} onClose={onClose} title={`Add a reading: ${title}`} description="Take the temperature of the warmest part of the food.">
      <form onSubmit={submit} noValidate className="space-y-4 text-board">
        <FormError message={errors.root?.server?.message} />
        <div className="flex gap-3">
          <Field label="Temperature" inputMode="decimal" autoComplete="off" data-autofocus className="flex-1" error={errors.value?.message} {...form.register('value')} />
          <Select label="Unit" options={UNIT_OPTIONS} error={errors.unit?.message} {...form.register('unit')} />
        </div>
        <div className="flex flex-wrap justify-end gap-3">
          <Button variant="secondary" size="board" onClick={onClose}>Cancel</Button>
          <Button type="submit" size="board" isBusy={add.isPending}>Save reading</Button>
        </div>
      </form>
    </Dialog>
  );
}
