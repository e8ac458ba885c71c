import { useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { CLEANING_SIGNATURE_MEANING, SignCleaningRunInputSchema, type CleaningRun, type SignCleaningRunInput } from '@shared/contracts/cleaning';
import { Dialog } from '@/components/ui/dialog';
import { Button } from '@/components/ui/button';
import { Field, FormError } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { useToast } from '@/components/ui/toast';
import { applyServerErrors } from '@/lib/form-errors';
import { cleaningQueries, useSignCleaningRun } from '../api';

/**
 * Signing asks for the signer's own password again and shows what the signature means (WCAG 2.2
 * 3.3.4: a legal commitment is confirmed). On a kitchen tablet the signer also chooses their name.
 */
export function SignDialog({ run, isDevice, signerName, isOpen, onClose }: { run: CleaningRun; isDevice: boolean; signerName: string; isOpen: boolean; onClose: () => void }) {
  const sign = useSignCleaningRun();
  const { showToast } = useToast();
  const signers = useQuery({ ...cleaningQueries.signers(), enabled: isDevice && isOpen }).data?.signers ?? [];
  const form = useForm<SignCleaningRunInput>({ resolver: zodResolver(SignCleaningRunInputSchema), defaultValues: { password: '', version: run.currentVersion } });
  const { errors } = form.formState;
  const submit = form.handleSubmit(async (input) => {
    try {
      await sign.run({ runId: run.id, input: { ...input, version: run.currentVersion, signerUserId: isDevice ? input.signerUserId : undefined } });
      form.reset({ password: '' });
      showToast(`Signed: ${run.templateName}`);
      onClose();
    } catch (err) {
      form.setValue('password', '');
      applyServerErrors(err, form.setError, ['password', 'signerUserId']);
    }
  });
  return (
    <Dialog isOpen={isOpen} onClose={onClose} title={`Sign: ${run.templateName}`} description={`Version ${run.currentVersion}${run.batchLotCode ? ` · batch ${run.batchLotCode}` : ''} · ${run.runDate}`}>
      <form onSubmit={submit} noValidate className="space-y-4 text-board">
        <FormError message={errors.root?.server?.message} />
        <p className="rounded-card border border-hairline bg-flour p-3">
          By signing you confirm: <strong>&ldquo;{CLEANING_SIGNATURE_MEANING}&rdquo;</strong>. {isDevice ? 'Your name' : <>Your name, <strong>{signerName}</strong>,</>} and the time are kept with this version; once signed it cannot be changed, only corrected with a reason.
        </p>
        {isDevice ? (
          <Select label="Who is signing" placeholder="Choose your name" options={signers.map((s) => ({ value: s.userId, label: s.name }))} error={errors.signerUserId?.message} {...form.register('signerUserId', { setValueAs: (v) => (v === '' ? undefined : v) })} />
        ) : null}
        <Field label="Your password" hint="Type your own password again to sign." type="password" autoComplete="current-password" data-autofocus error={errors.password?.message} {...form.register('password')} />
        <div className="flex flex-wrap justify-end gap-3">
          <Button variant="secondary" size="board" onClick={onClose}>Cancel</Button>
          <Button type="submit" size="board" isBusy={sign.isPending}>Sign</Button>
        </div>
      </form>
    </Dialog>
  );
}
