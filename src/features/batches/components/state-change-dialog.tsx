import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { ChangeBatchStateInputSchema, type BatchDetail, type ChangeBatchStateInput } from '@shared/contracts/batches';
import type { BatchState } from '@shared/domain/batch-states';
import { applyServerErrors } from '@/lib/form-errors';
import { Dialog } from '@/components/ui/dialog';
import { Button } from '@/components/ui/button';
import { FormError } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { Textarea } from '@/components/ui/textarea';
import { useToast } from '@/components/ui/toast';
import { newIdempotencyKey, useChangeBatchState } from '../api';
import { BATCH_STATE_LABELS } from './batch-state-badge';

// Moves that stop sale or destroy stock are confirmed in a second step (WCAG 2.2 SC 3.3.4).
const NEEDS_CONFIRMATION: readonly BatchState[] = ['held', 'discarded', 'recalled'];

const CONFIRM_TEXT: Partial<Record<BatchState, string>> = {
  held: 'Holding stops sale of this batch until someone releases, discards or recalls it.',
  discarded: 'Discarding is final: the batch can never be released or sold again.',
  recalled: 'A recall means the batch may have reached customers; follow your recall plan and local health authority guidance.',
};

/** Change a batch's state with a required reason; holds, discards and recalls ask for confirmation. */
export function StateChangeDialog({ batch, isOpen, onClose }: { batch: BatchDetail; isOpen: boolean; onClose: () => void }) {
  const change = useChangeBatchState();
  const toast = useToast();
  const [key, setKey] = useState(newIdempotencyKey);
  const [isConfirming, setIsConfirming] = useState(false);
  const form = useForm<ChangeBatchStateInput>({
    resolver: zodResolver(ChangeBatchStateInputSchema),
    defaultValues: { toState: batch.allowedTransitions[0], reason: '' },
  });
  const { register, handleSubmit, setError, formState, watch, reset } = form;
  const toState = watch('toState');
  const close = () => {
    reset({ toState: batch.allowedTransitions[0], reason: '' });
    setIsConfirming(false);
    setKey(newIdempotencyKey());
    onClose();
  };
  const onSubmit = handleSubmit((input) => {
    if (NEEDS_CONFIRMATION.includes(input.toState) && !isConfirming) return setIsConfirming(true);
    return change.mutateAsync({ ...input, id: batch.id, key }).then(
      (b) => {
        toast.showToast(`Batch ${b.lotCode} is now ${BATCH_STATE_LABELS[b.state].toLowerCase()}.`);
        close();
      },
      (err) => {
        setIsConfirming(false);
        applyServerErrors(err, setError, ['toState', 'reason']);
      },
    );
  });
  const label = BATCH_STATE_LABELS[toState] ?? '';
  return (
    <Dialog
      isOpen={isOpen}
      onClose={close}
      title={`Change state of ${batch.lotCode}`}
      description={`Now ${BATCH_STATE_LABELS[batch.state].toLowerCase()}. Every change is kept with your name, the time and the reason.`}
      isAlert={isConfirming}
    >
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <FormError message={formState.errors.root?.server?.message} />
        {isConfirming ? (
          <div role="alert" className="rounded-card border border-cherry bg-cherry-soft p-3">
            <p className="font-bold">Mark batch {batch.lotCode} as {label.toLowerCase()}?</p>
            <p className="mt-1">{CONFIRM_TEXT[toState]}</p>
            <p className="mt-1">Reason: {watch('reason')}</p>
          </div>
        ) : (
          <>
            <Select label="New state" options={batch.allowedTransitions.map((s) => ({ value: s, label: BATCH_STATE_LABELS[s] }))} error={formState.errors.toState?.message} {...register('toState')} />
            <Textarea label="Reason" hint="Say why, e.g. “Cooled, dipped and bagged; labels checked”." rows={3} error={formState.errors.reason?.message} data-autofocus {...register('reason')} />
          </>
        )}
        <div className="flex flex-wrap justify-end gap-3">
          <Button variant="secondary" onClick={isConfirming ? () => setIsConfirming(false) : close}>{isConfirming ? 'Go back' : 'Cancel'}</Button>
          <Button type="submit" variant={NEEDS_CONFIRMATION.includes(toState) ? 'danger' : 'primary'} isBusy={change.isPending}>
            {isConfirming ? `Yes, mark as ${label.toLowerCase()}` : NEEDS_CONFIRMATION.includes(toState) ? 'Review change' : `Mark as ${label.toLowerCase()}`}
          </Button>
        </div>
      </form>
    </Dialog>
  );
}
