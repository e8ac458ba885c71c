import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import {
  CorrectCleaningRunInputSchema, ExplainStepInputSchema, type CleaningRun, type CleaningSignature, type CleaningStepEntry, type CorrectCleaningRunInput, type ExplainStepInput,
} from '@shared/contracts/cleaning';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { FormError } from '@/components/ui/field';
import { StatusBadge } from '@/components/ui/status-badge';
import { Textarea } from '@/components/ui/textarea';
import { applyServerErrors } from '@/lib/form-errors';
import { useAddCleaningStep, useCorrectCleaningRun } from '../api';
import { SANITISER_NAMES, SanitiseStepForm } from './sanitise-step-form';
import { SignDialog } from './sign-dialog';

/** Printed name, date and time with offset, and meaning: the whole signature, wherever it shows. */
export function SignatureLine({ signature }: { signature: CleaningSignature }) {
  return (
    <div className="flex flex-wrap items-center gap-2" data-testid="signature">
      {signature.validity === 'valid' ? <StatusBadge status="signed" /> : <StatusBadge status="failed" label="Signature invalid" />}
      <span>
        <strong>{signature.printedName}</strong> · <span className="tabular">{signature.signedAtLocal}</span> · &ldquo;{signature.meaning}&rdquo;
        {signature.deviceName ? <span className="text-muted"> (on {signature.deviceName})</span> : null}
      </span>
      {signature.validity === 'invalid' ? <p className="w-full font-bold text-cherry">The signed content has changed since it was signed; this signature no longer holds.</p> : null}
    </div>
  );
}

function entryText(e: CleaningStepEntry): string {
  if (e.entryKind === 'explanation') return `Reason given: ${e.failureReason ?? ''}`;
  const s = e.sanitising;
  if (!s) return e.note ? `Done. ${e.note}` : 'Done.';
  const parts = [s.productName ?? SANITISER_NAMES[s.sanitiser], s.concentrationPpm ? `${Number(s.concentrationPpm)} ppm` : null, s.waterTemperature?.display, s.ph ? `pH ${Number(s.ph)}` : null, s.contactSeconds != null ? `${s.contactSeconds} s` : null, s.hardnessPpm != null ? `hardness ${s.hardnessPpm} ppm` : null];
  return `${parts.filter(Boolean).join(', ')}${e.note ? `. ${e.note}` : ''}`;
}

function EntryItem({ e }: { e: CleaningStepEntry }) {
  return (
    <li className="text-sm">
      {e.sanitising ? (e.sanitising.passed ? <StatusBadge status="within-limit" label="Check passed" /> : <StatusBadge status="failed" label="Check failed" />) : null}{' '}
      {entryText(e)} <span className="text-muted">— {e.by}, <span className="tabular">{e.atLocal}</span>{e.carriedOver ? ' (carried over)' : ''}</span>
      {e.sanitising && !e.sanitising.passed ? <ul className="ml-5 list-disc text-cherry">{e.sanitising.problems.map((p) => <li key={p.message}>{p.message}</li>)}</ul> : null}
      {e.entryKind === 'step' && e.failureReason ? <p className="ml-5">Reason given: {e.failureReason}</p> : null}
    </li>
  );
}

function ExplainForm({ runId, entryId, onDone }: { runId: string; entryId: string; onDone: () => void }) {
  const add = useAddCleaningStep();
  const form = useForm<ExplainStepInput>({ resolver: zodResolver(ExplainStepInputSchema), defaultValues: { explainsEntryId: entryId, reason: '' } });
  const submit = form.handleSubmit(async (input) => {
    try {
      await add.run({ runId, input });
      onDone();
    } catch (err) {
      applyServerErrors(err, form.setError, ['reason']);
    }
  });
  return (
    <form onSubmit={submit} noValidate className="space-y-3">
      <FormError message={form.formState.errors.root?.server?.message} />
      <Textarea label="Why the failed check is accepted" rows={2} error={form.formState.errors.reason?.message} {...form.register('reason')} />
      <div className="flex justify-end gap-3">
        <Button variant="secondary" size="board" onClick={onDone}>Cancel</Button>
        <Button type="submit" size="board" isBusy={add.isPending}>Save reason</Button>
      </div>
    </form>
  );
}

function CorrectDialog({ run, isOpen, onClose }: { run: CleaningRun; isOpen: boolean; onClose: () => void }) {
  const correct = useCorrectCleaningRun();
  const form = useForm<CorrectCleaningRunInput>({ resolver: zodResolver(CorrectCleaningRunInputSchema), defaultValues: { reason: '', steps: [] } });
  const submit = form.handleSubmit(async (input) => {
    try {
      await correct.run({ runId: run.id, input });
      form.reset({ reason: '', steps: [] });
      onClose();
    } catch (err) {
      applyServerErrors(err, form.setError, ['reason']);
    }
  });
  return (
    <Dialog isOpen={isOpen} onClose={onClose} title={`Correct: ${run.templateName}`} description="A correction makes a new version. The signed version stays as it is; the new one is signed again.">
      <form onSubmit={submit} noValidate className="space-y-4">
        <FormError message={form.formState.errors.root?.server?.message} />
        <Textarea label="Reason for the correction" rows={3} data-autofocus error={form.formState.errors.reason?.message} {...form.register('reason')} />
        <p className="text-sm text-muted">After saving, enter the corrected step again, then sign.</p>
        <div className="flex justify-end gap-3">
          <Button variant="secondary" onClick={onClose}>Cancel</Button>
          <Button type="submit" isBusy={correct.isPending}>Make the correction</Button>
        </div>
      </form>
    </Dialog>
  );
}

const STATUS_BADGE = {
  in_progress: <StatusBadge status="in-progress" />,
  ready_to_sign: <StatusBadge status="needs-review" label="Ready to sign" />,
  signed: <StatusBadge status="signed" />,
  signature_invalid: <StatusBadge status="failed" label="Signature invalid" />,
} as const;

/** One run: steps to tap through (large targets), the signature, and the corrections history. */
export function RunCard({ run, isDevice, canCorrect, userName }: { run: CleaningRun; isDevice: boolean; canCorrect: boolean; userName: string }) {
  const add = useAddCleaningStep();
  const [open, setOpen] = useState<{ key: string; mode: 'sanitise' | 'explain' } | null>(null);
  const [isSigning, setSigning] = useState(false);
  const [isCorrecting, setCorrecting] = useState(false);
  const [error, setError] = useState<string>();
  const current = run.versions[0]!;
  const isSigned = current.signature !== null;
  const markDone = async (stepKey: string) => {
    setError(undefined);
    try {
      await add.run({ runId: run.id, input: { stepKey } });
    } catch (err) {
      setError((err as Error).message);
    }
  };
  const headingId = `run-${run.id}`;
  return (
    <article aria-labelledby={headingId} className="space-y-4 rounded-card border border-edge bg-surface p-4 sm:p-6">
      <header className="flex flex-wrap items-center justify-between gap-3">
        <div>
          <h3 id={headingId} className="text-xl font-bold">{run.templateName}{run.batchLotCode ? ` · batch ${run.batchLotCode}` : ''}</h3>
          <p className="text-sm text-muted">Started by {run.started.by} at <span className="tabular">{run.started.atLocal}</span> · version {run.currentVersion}</p>
        </div>
        {STATUS_BADGE[run.status]}
      </header>
      {error ? <p role="alert" className="font-bold text-cherry">{error}</p> : null}
      <ol className="space-y-3">
        {run.steps.map((step) => {
          const entries = current.entries.filter((e) => e.stepKey === step.key);
          return (
            <li key={step.key} className="rounded-card border border-hairline p-3">
              <div className="flex flex-wrap items-center justify-between gap-3">
                <span className="text-board font-bold">{step.label}</span>
                {!isSigned ? (
                  step.kind === 'sanitise' ? (
                    <Button size="board" variant={step.done && !step.needsRedoOrReason ? 'secondary' : 'primary'} onClick={() => setOpen({ key: step.key, mode: 'sanitise' })}>
                      {step.done ? 'Redo sanitising' : 'Record sanitising'}
                    </Button>
                  ) : (
                    <Button size="board" variant={step.done ? 'secondary' : 'primary'} isBusy={add.isPending && add.variables?.input && 'stepKey' in add.variables.input && add.variables.input.stepKey === step.key} onClick={() => void markDone(step.key)}>
                      {step.done ? 'Done again' : `Mark “${step.label}” done`}
                    </Button>
                  )
                ) : null}
              </div>
              {entries.length ? <ul className="mt-2 space-y-1">{entries.map((e) => <EntryItem key={e.id} e={e} />)}</ul> : <p className="mt-1 text-sm text-muted">Not done yet.</p>}
              {step.needsRedoOrReason && !isSigned ? (
                <div className="mt-2 flex flex-wrap items-center gap-3">
                  <StatusBadge status="failed" label="Redo it or give a reason" />
                  <Button variant="secondary" size="board" onClick={() => setOpen({ key: step.key, mode: 'explain' })}>Give a reason</Button>
                </div>
              ) : null}
              {open?.key === step.key && open.mode === 'sanitise' ? <div className="mt-3"><SanitiseStepForm runId={run.id} stepKey={step.key} onDone={() => setOpen(null)} /></div> : null}
              {open?.key === step.key && open.mode === 'explain' && step.latestEntryId ? <div className="mt-3"><ExplainForm runId={run.id} entryId={step.latestEntryId} onDone={() => setOpen(null)} /></div> : null}
            </li>
          );
        })}
      </ol>
      {current.signature ? <SignatureLine signature={current.signature} /> : null}
      {!isSigned && run.blockers.length ? <ul className="list-disc pl-5 text-sm text-muted" aria-label="Before signing">{run.blockers.map((b) => <li key={b}>{b}</li>)}</ul> : null}
      <div className="flex flex-wrap gap-3" data-print="hide">
        {run.status === 'ready_to_sign' ? <Button size="board" onClick={() => setSigning(true)}>Sign this checklist</Button> : null}
        {isSigned && canCorrect ? <Button variant="secondary" onClick={() => setCorrecting(true)}>Correct</Button> : null}
      </div>
      {run.versions.length > 1 ? (
        <details>
          <summary className="cursor-pointer font-bold">Corrections history ({run.versions.length - 1})</summary>
          <ol className="mt-2 space-y-3">
            {run.versions.slice(1).map((v) => (
              <li key={v.version} className="rounded-card border border-hairline p-3">
                <p className="font-bold">Version {v.version}{v.reason ? ` — corrected: ${v.reason}` : ''}</p>
                <p className="text-sm text-muted">By {v.createdBy}, <span className="tabular">{v.createdAtLocal}</span></p>
                <ul className="mt-1 space-y-1">{v.entries.map((e) => <EntryItem key={e.id} e={e} />)}</ul>
                {v.signature ? <SignatureLine signature={v.signature} /> : <p className="text-sm">Not signed.</p>}
              </li>
            ))}
          </ol>
          {current.reason ? <p className="mt-2">Current version {current.version} corrects: {current.reason}</p> : null}
        </details>
      ) : null}
      <SignDialog run={run} isDevice={isDevice} signerName={userName} isOpen={isSigning} onClose={() => setSigning(false)} />
      {canCorrect ? <CorrectDialog run={run} isOpen={isCorrecting} onClose={() => setCorrecting(false)} /> : null}
    </article>
  );
}
