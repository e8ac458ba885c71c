import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { OpenRecallInputSchema, type OpenRecallInput, type TraceResult } from '@shared/contracts/trace';
import { applyServerErrors } from '@/lib/form-errors';
import { Button } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { Checkbox } from '@/components/ui/checkbox';
import { Dialog } from '@/components/ui/dialog';
import { FormError } from '@/components/ui/field';
import { Textarea } from '@/components/ui/textarea';
import { useOpenRecall } from '../api';

type Values = z.input<typeof OpenRecallInputSchema>;

/**
 * Opening a recall: write the reason and the public notice, then review what will happen and confirm
 * (WCAG 2.2 SC 3.3.4: an action that changes records and mails customers is checked before it is sent).
 */
export function OpenRecallDialog({ result, scope, isOpen, onClose, onOpened }: {
  result: TraceResult; scope: OpenRecallInput['scope']; isOpen: boolean; onClose: () => void; onOpened: (id: string) => void;
}) {
  const open = useOpenRecall();
  const [step, setStep] = useState<'write' | 'confirm'>('write');
  const { register, handleSubmit, setError, formState, trigger, reset } = useForm<Values, unknown, OpenRecallInput>({
    resolver: zodResolver(OpenRecallInputSchema),
    defaultValues: { reason: '', publicNotice: '', scope, confirmed: undefined },
  });
  const close = () => { reset(); setStep('write'); onClose(); };
  const emails = result.customers.filter((c) => c.contact?.recallConsent && c.contact.email).length;
  const toCall = result.customers.length - emails;
  const onSubmit = handleSubmit((input) =>
    open.mutateAsync(input).then((r) => { close(); onOpened(r.id); }, (err) => applyServerErrors(err, setError, ['reason', 'publicNotice', 'confirmed'])),
  );
  return (
    <Dialog isOpen={isOpen} onClose={close} title={step === 'write' ? 'Open a recall' : 'Check and confirm the recall'} description={`Starting from ${result.start.label}.`}>
      <form onSubmit={onSubmit} noValidate className="space-y-4">
        <FormError message={formState.errors.root?.server?.message} />
        <div hidden={step !== 'write'} className="space-y-4">
          <Textarea label="Reason (kept in your records)" autoFocus error={formState.errors.reason?.message} {...register('reason')} />
          <Textarea label="Public notice (shown on the lot pages and in the e-mail)" hint="Say what the problem is and what people should do, in plain words." error={formState.errors.publicNotice?.message} {...register('publicNotice')} />
          <div className="flex justify-end gap-3">
            <Button variant="secondary" onClick={close}>Cancel</Button>
            <Button onClick={async () => { if (await trigger(['reason', 'publicNotice'])) setStep('confirm'); }}>Review</Button>
          </div>
        </div>
        {step === 'confirm' ? (
          <div className="space-y-4">
            <ul className="list-disc pl-6">
              <li>{result.batches.length} {result.batches.length === 1 ? 'batch' : 'batches'} will be marked recalled (batches still being made are held): {result.batches.map((b) => b.lotCode).join(', ')}.</li>
              <li>Their lot pages will show your public notice straight away.</li>
              <li>{emails} {emails === 1 ? 'customer' : 'customers'} who agreed to recall notices will get an e-mail.</li>
              <li>{toCall} other {toCall === 1 ? 'customer is' : 'customers are'} listed for you to contact another way.</li>
            </ul>
            <CautionBox title="Before you confirm" headingLevel={3}>
              Follow your recall plan, and tell your local health authority as your local rules require. Crumbtrail helps you find and tell customers; it does not replace that.
            </CautionBox>
            <Checkbox label="I have checked the batches and customers above, and I want to open this recall." error={formState.errors.confirmed?.message} {...register('confirmed', { setValueAs: (v) => (v === true ? true : undefined) })} />
            <div className="flex justify-end gap-3">
              <Button variant="secondary" onClick={() => setStep('write')}>Back</Button>
              <Button type="submit" variant="danger" isBusy={open.isPending}>Open recall</Button>
            </div>
          </div>
        ) : null}
      </form>
    </Dialog>
  );
}
