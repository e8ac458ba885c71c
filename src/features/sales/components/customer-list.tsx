import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { Customer } from '@shared/contracts/sales';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { EmptyState } from '@/components/ui/empty-state';
import { useToast } from '@/components/ui/toast';
import { salesQueries, useEraseCustomer, useUpdateConsent } from '../api';

/** The owner's customers, with consent and "erase contact" (confirmed first: it cannot be undone). */
export function CustomerList() {
  const list = useQuery(salesQueries.customers());
  const erase = useEraseCustomer();
  const consent = useUpdateConsent();
  const toast = useToast();
  const [erasing, setErasing] = useState<Customer | null>(null);
  const items = list.data?.items ?? [];
  return (
    <section aria-labelledby="customers-heading" className="space-y-3" data-print="hide">
      <h2 id="customers-heading" className="text-lg font-bold">Customers</h2>
      {items.length === 0 ? <EmptyState title="No customers yet" icon="empty">Customers appear here when a sale is recorded with a contact.</EmptyState> : (
        <div className="relative overflow-x-auto rounded-card border border-hairline bg-surface">
          <table className="w-full text-left">
            <caption className="sr-only">Customers, newest first</caption>
            <thead><tr className="border-b border-hairline">{['Name', 'E-mail', 'Phone', 'Recall notices', 'Sales', ''].map((h, i) => <th key={i} scope="col" className="px-3 py-2">{h || <span className="sr-only">Actions</span>}</th>)}</tr></thead>
            <tbody>
              {items.map((c) => (
                <tr key={c.id} className="border-b border-hairline last:border-0">
                  <th scope="row" className="px-3 py-2">{c.contact?.name ?? <em className="text-muted">Erased on request</em>}</th>
                  <td className="px-3 py-2">{c.contact?.email ?? '—'}</td>
                  <td className="px-3 py-2">{c.contact?.phone ?? '—'}</td>
                  <td className="px-3 py-2">
                    {c.contact ? (
                      <label className="flex items-center gap-2">
                        <input type="checkbox" className="size-5 accent-berry" checked={c.contact.recallConsent} onChange={(e) => consent.mutate({ id: c.id, recallConsent: e.target.checked })} />
                        {c.contact.recallConsent ? `Yes, since ${c.contact.consentOn}` : 'No'}
                      </label>
                    ) : '—'}
                  </td>
                  <td className="px-3 py-2 tabular">{c.saleCount}</td>
                  <td className="px-3 py-2">{c.contact ? <Button variant="danger" onClick={() => setErasing(c)}>Erase contact<span className="sr-only"> of {c.contact.name}</span></Button> : null}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <Dialog
        isOpen={erasing != null} onClose={() => setErasing(null)} isAlert title="Erase this contact?"
        description={`${erasing?.contact?.name ?? ''}’s name, e-mail and phone will be deleted for good. Their sales stay, without a name. You will not be able to tell them about a recall through Crumbtrail.`}
        actions={<>
          <Button variant="secondary" autoFocus onClick={() => setErasing(null)}>Keep the contact</Button>
          <Button variant="danger" isBusy={erase.isPending} onClick={() => erasing && erase.mutateAsync(erasing.id).then(() => { toast.showToast('Contact erased. The sales are kept without a name.'); setErasing(null); })}>Erase contact</Button>
        </>}
      />
    </section>
  );
}
