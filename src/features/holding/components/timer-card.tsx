import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { HoldingPeriod, RecordHoldingActionInput } from '@shared/contracts/holding';
import { RecordHoldingActionInputSchema } from '@shared/contracts/holding';
import { StatusBadge, type Status } from '@/components/ui/status-badge';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { FormError } from '@/components/ui/field';
import { Textarea } from '@/components/ui/textarea';
import { applyServerErrors } from '@/lib/form-errors';
import { useRecordHoldingAction, useStopHolding } from '../api';
import { Countdown } from './countdown';
import { ReadingDialog } from './reading-dialog';
import { KIND_LABELS } from './start-timer-dialog';

const STATUS: Record<HoldingPeriod['evaluation']['status'], { status: Status; label?: string }> = {
  running: { status: 'in-progress', label: 'Running' },
  within_limit: { status: 'within-limit' },
  due_soon: { status: 'due-soon' },
  over_limit: { status: 'over-limit' },
  completed: { status: 'signed', label: 'Done' },
  not_permitted: { status: 'needs-review', label: 'Check' },
};

type ActionKind = RecordHoldingActionInput['action'];
const ACTION_TITLES: Record<ActionKind, string> = { discarded: 'Record discard', reheated: 'Record reheat', reason: 'Record reason' };

/** One timer on the board: live countdown, status, readings, and the buttons that fit its state. */
export function TimerCard({ period, now }: { period: HoldingPeriod; now: number }) {
  const [dialog, setDialog] = useState<'reading' | ActionKind | null>(null);
  const stop = useStopHolding();
  const e = period.evaluation;
  const title = `${period.productName} (${period.lotCode})`;
  const last = period.readings.at(-1);
  const badge = STATUS[e.status];
  const actions: ActionKind[] = !period.needsAction
    ? []
    : e.requiredAction === 'discard' ? ['discarded'] : e.requiredAction === 'reheat_or_discard' ? ['reheated', 'discarded'] : ['reason', 'discarded'];
  return (
    <article
      aria-label={title}
      className={`rounded-card border-2 bg-surface p-5 text-board ${period.needsAction ? 'border-cherry' : e.status === 'due_soon' ? 'border-honey' : 'border-edge'}`}
    >
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0">
          <h3 className="text-2xl font-bold">{period.productName}</h3>
          <p className="text-muted">
            Lot {period.lotCode} · {period.kind === 'custom' ? period.label : KIND_LABELS[period.kind]}
          </p>
        </div>
        <StatusBadge size="board" status={badge.status} label={period.needsAction ? (e.requiredAction === 'reheat_or_discard' ? 'Reheat or discard' : e.requiredAction === 'record_reason' ? 'Over your limit' : 'Discard') : badge.label} />
      </div>
      <div className="mt-4">
        <Countdown now={now} startedAt={period.started.at} deadlineAt={e.deadlineAt} stoppedAt={period.stopped?.at ?? null} />
      </div>
      <dl className="mt-3 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-base">
        <dt className="font-bold">Limit</dt>
        <dd>{period.policyName}</dd>
        <dt className="font-bold">Started</dt>
        <dd className="tabular">{period.started.atLocal} by {period.started.by}</dd>
        {e.deadlineAtLocal ? (
          <>
            <dt className="font-bold">{period.policy === 'cooling' ? 'Stage deadline' : 'Deadline'}</dt>
            <dd className="tabular">{e.deadlineAtLocal}</dd>
          </>
        ) : null}
        {last ? (
          <>
            <dt className="font-bold">Last reading</dt>
            <dd className="tabular">{last.display} at {last.atLocal}</dd>
          </>
        ) : null}
      </dl>
      {e.messages.length ? (
        <ul className="mt-3 space-y-1 text-base">
          {e.messages.map((m) => <li key={m}>{m}</li>)}
        </ul>
      ) : null}
      <div className="mt-4 flex flex-wrap gap-3">
        {actions.map((a) => (
          <Button key={a} size="board" variant={a === 'discarded' ? 'danger' : 'primary'} onClick={() => setDialog(a)}>
            {ACTION_TITLES[a]}
          </Button>
        ))}
        {period.stopped ? null : (
          <>
            <Button size="board" variant="secondary" onClick={() => setDialog('reading')}>Add reading</Button>
            <Button size="board" variant="secondary" isBusy={stop.isPending} onClick={() => void stop.run({ periodId: period.id }).catch(() => undefined)}>
              Stop
            </Button>
          </>
        )}
      </div>
      {stop.error ? <FormError message={stop.error.message} /> : null}
      <ReadingDialog periodId={period.id} title={title} isOpen={dialog === 'reading'} onClose={() => setDialog(null)} />
      {dialog && dialog !== 'reading' ? <ActionDialog period={period} action={dialog} onClose={() => setDialog(null)} /> : null}
    </article>
  );
}

/** Confirms a corrective action; a reason is required to close a custom limit. */
function ActionDialog({ period, action, onClose }: { period: HoldingPeriod; action: ActionKind; onClose: () => void }) {
  const record = useRecordHoldingAction();
  const form = useForm<RecordHoldingActionInput>({ resolver: zodResolver(RecordHoldingActionInputSchema), defaultValues: { action, reason: '' } });
  const { errors } = form.formState;
  const submit = form.handleSubmit(async (input) => {
    try {
      await record.run({ periodId: period.id, ...input });
      onClose();
    } catch (err) {
      applyServerErrors(err, form.setError, ['reason']);
    }
  });
  const description =
    action === 'discarded' ? 'The food goes in the bin. The batch will be marked discarded.'
      // FDA Food Code 3-403.11(A): reheat for hot holding to 165 °F (74 °C) (value from memory).
      : action === 'reheated' ? 'Reheat the food (the Food Code asks for 165 °F / 74 °C), then start a new cooling timer.'
        : 'Write why the food was still fine to use. This is your own quality limit, not a food-safety one.';
  return (
    <Dialog isOpen onClose={onClose} isAlert title={`${ACTION_TITLES[action]}: ${period.productName}`} description={description}>
      <form onSubmit={submit} noValidate className="space-y-4 text-board">
        <FormError message={errors.root?.server?.message} />
        <Textarea label={action === 'reason' ? 'Reason' : 'Note'} isOptional={action !== 'reason'} data-autofocus error={errors.reason?.message} {...form.register('reason')} />
        <div className="flex flex-wrap justify-end gap-3">
          <Button variant="secondary" size="board" onClick={onClose}>Cancel</Button>
          <Button type="submit" size="board" variant={action === 'discarded' ? 'danger' : 'primary'} isBusy={record.isPending}>{ACTION_TITLES[action]}</Button>
        </div>
      </form>
    </Dialog>
  );
}
