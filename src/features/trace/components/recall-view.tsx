import { useState } from 'react';
import { formatZonedDateTime } from '@shared/domain/zoned-time';
import { useSession } from '@/features/auth/api';
import type { RecallCustomerProgress, RecallDetail } from '@shared/contracts/trace';
import { Button } from '@/components/ui/button';
import { StatusBadge, type Status } from '@/components/ui/status-badge';
import { Textarea } from '@/components/ui/textarea';
import { useToast } from '@/components/ui/toast';
import { useCloseRecall, useToldByPhone } from '../api';

const STATUS: Record<RecallCustomerProgress['status'], { status: Status; label: string }> = {
  email_queued: { status: 'due-soon', label: 'E-mail waiting to send' },
  email_sent: { status: 'signed', label: 'E-mail sent' },
  email_failed: { status: 'failed', label: 'E-mail failed' },
  told_by_phone: { status: 'signed', label: 'Told by phone' },
  to_call: { status: 'needs-review', label: 'To contact' },
  no_consent: { status: 'needs-review', label: 'No consent to notices' },
  erased: { status: 'discarded', label: 'Contact erased' },
};

/** A recall's batches and, per customer, whether they have been told; owners mark phone calls and close it. */
export function RecallView({ recall, isOwner }: { recall: RecallDetail; isOwner: boolean }) {
  const { business } = useSession();
  const when = (iso: string) => formatZonedDateTime(new Date(iso), business?.timeZone ?? 'UTC');
  const phone = useToldByPhone();
  const close = useCloseRecall();
  const toast = useToast();
  const [note, setNote] = useState('');
  const lot = (id: string) => recall.batches.find((b) => b.id === id)?.lotCode ?? '';
  return (
    <section aria-labelledby="recall-heading" className="space-y-4" data-testid="recall-view">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="recall-heading" className="text-xl font-bold">Recall opened {when(recall.openedAt)}</h2>
        <StatusBadge status={recall.status === 'open' ? 'recalled' : 'signed'} label={recall.status === 'open' ? 'Open' : 'Closed'} />
      </div>
      <p><strong>Reason:</strong> {recall.reason}</p>
      <p><strong>Public notice:</strong> {recall.publicNotice}</p>
      {recall.supplierLot ? <p><strong>Supplier lot:</strong> {recall.supplierLot.ingredientName}, lot {recall.supplierLot.lotCode}</p> : null}
      <p>
        Progress: {recall.progress.told} of {recall.progress.customers} customers told; {recall.progress.emailQueued} e-mails waiting; {recall.progress.toCall} to contact; {recall.progress.noConsent} without consent or erased.
      </p>
      <h3 className="font-bold">Batches</h3>
      <ul className="list-disc pl-6">
        {recall.batches.map((b) => (
          <li key={b.id}><span className="font-mono">{b.lotCode}</span> {b.productName}: {b.fromState.replace('_', ' ')} → {b.toState.replace('_', ' ')} (<a className="text-berry underline" href={`/lot/${b.publicCode}`} target="_blank" rel="noreferrer">lot page</a>)</li>
        ))}
      </ul>
      <h3 className="font-bold">Customers</h3>
      {recall.customers.length === 0 ? <p>No customer was recorded for these batches.</p> : (
        <div className="relative overflow-x-auto rounded-card border border-hairline bg-surface">
          <table className="w-full text-left">
            <caption className="sr-only">Who has been told</caption>
            <thead><tr className="border-b border-hairline">{[isOwner ? 'Name' : 'Customer', ...(isOwner ? ['E-mail', 'Phone'] : []), 'Lots', 'Status', 'Told', ''].map((h, i) => <th key={i} scope="col" className="px-3 py-2">{h || <span className="sr-only">Actions</span>}</th>)}</tr></thead>
            <tbody>
              {recall.customers.map((c, i) => (
                <tr key={c.customerId} className="border-b border-hairline last:border-0">
                  <th scope="row" className="px-3 py-2">{isOwner ? c.contact?.name ?? <em className="text-muted">Erased</em> : `Customer ${i + 1}`}</th>
                  {isOwner ? <><td className="px-3 py-2">{c.contact?.email ?? '—'}</td><td className="px-3 py-2">{c.contact?.phone ?? '—'}</td></> : null}
                  <td className="px-3 py-2 font-mono">{c.batchIds.map(lot).join(', ')}</td>
                  <td className="px-3 py-2"><StatusBadge status={STATUS[c.status].status} label={STATUS[c.status].label} /></td>
                  <td className="px-3 py-2">{c.toldAt ? `${when(c.toldAt)}${c.toldByName ? ` by ${c.toldByName}` : ''}${c.note ? ` — ${c.note}` : ''}` : '—'}</td>
                  <td className="px-3 py-2" data-print="hide">
                    {isOwner && c.status !== 'told_by_phone' && c.contact ? (
                      <Button variant="secondary" isBusy={phone.isPending} onClick={() => phone.mutateAsync({ id: recall.id, customerId: c.customerId, note: '' }).then(() => toast.showToast('Marked as told by phone.'))}>
                        Told by phone<span className="sr-only"> ({c.contact.name})</span>
                      </Button>
                    ) : null}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {isOwner && recall.status === 'open' ? (
        <form className="space-y-3" data-print="hide" onSubmit={(e) => { e.preventDefault(); close.mutateAsync({ id: recall.id, note }).then(() => toast.showToast('Recall closed.')); }}>
          <Textarea label="Close the recall: how did it end?" value={note} onChange={(e) => setNote(e.target.value)} hint="e.g. “All bags returned or thrown away; supplier confirmed.”" />
          <Button type="submit" variant="secondary" disabled={note.trim().length < 3} isBusy={close.isPending}>Close recall</Button>
        </form>
      ) : recall.closedAt ? <p>Closed {when(recall.closedAt)} by {recall.closedByName}: {recall.closeNote}</p> : null}
    </section>
  );
}
