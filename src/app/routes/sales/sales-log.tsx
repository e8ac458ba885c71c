import { useState } from 'react';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router';
import { ListSalesQuerySchema, SALE_CHANNELS_FOR_FILTER, type Sale } from '@shared/contracts/sales';
import { formatCents } from '@shared/domain/sales-cap';
import { salesQueries, CHANNEL_LABELS, useVoidSale, type SalesFilters } from '@/features/sales/api';
import { CapMeter } from '@/features/sales/components/cap-meter';
import { SaleForm } from '@/features/sales/components/sale-form';
import { CustomerList } from '@/features/sales/components/customer-list';
import { useSession } from '@/features/auth/api';
import { PageHeader } from '@/components/ui/page-header';
import { Button } from '@/components/ui/button';
import { Dialog } from '@/components/ui/dialog';
import { Field } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { Textarea } from '@/components/ui/textarea';
import { EmptyState } from '@/components/ui/empty-state';
import { LoadingBlock } from '@/components/ui/spinner';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

function filtersFrom(search: URLSearchParams): SalesFilters {
  const parsed = ListSalesQuerySchema.safeParse(Object.fromEntries(search));
  if (!parsed.success) return {};
  const { from, to, channel } = parsed.data;
  return { from, to, channel };
}

export const loader = (qc: QueryClient) => async () => {
  await qc.ensureQueryData(salesQueries.cap());
  return null;
};

function localToday(timeZone?: string) {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(new Date());
}

export function Component() {
  const [search, setSearch] = useSearchParams();
  const filters = filtersFrom(search);
  const cap = useQuery(salesQueries.cap());
  const list = useQuery(salesQueries.list(filters));
  const { user, business } = useSession();
  const isOwner = user?.role === 'owner';
  const canWrite = isOwner || user?.role === 'baker';
  const [voiding, setVoiding] = useState<Sale | null>(null);
  const [reason, setReason] = useState('');
  const voidSale = useVoidSale();
  const set = (name: string, value: string) => {
    const next = new URLSearchParams(search);
    if (value) next.set(name, value);
    else next.delete(name);
    setSearch(next, { replace: true });
  };
  const today = localToday(business?.timeZone);
  return (
    <>
      <PageHeader title="Sales" description="Each sale of a batch, the year’s total against your sales cap, and your customers’ contacts." />
      <div className="space-y-6">
        {cap.data ? <CapMeter view={cap.data} /> : <LoadingBlock label="Loading the sales cap…" />}
        {canWrite && cap.data ? <SaleForm cap={cap.data} isOwner={isOwner} today={today} /> : null}
        <section aria-labelledby="sales-heading" className="space-y-3">
          <h2 id="sales-heading" className="text-lg font-bold">Sales</h2>
          <form role="search" aria-label="Filter sales" className="grid gap-4 sm:grid-cols-3" onSubmit={(e) => e.preventDefault()} data-print="hide">
            <Field label="From" type="date" value={filters.from ?? ''} onChange={(e) => set('from', e.target.value)} />
            <Field label="Until" type="date" value={filters.to ?? ''} onChange={(e) => set('to', e.target.value)} />
            <Select label="Channel" placeholder="Any channel" options={SALE_CHANNELS_FOR_FILTER.map((c) => ({ value: c, label: CHANNEL_LABELS[c] ?? c }))} value={filters.channel ?? ''} onChange={(e) => set('channel', e.target.value)} />
          </form>
          {list.isPending ? <LoadingBlock label="Loading sales…" /> : (list.data?.items.length ?? 0) === 0 ? (
            <EmptyState title="No sales here" icon="sales">{search.size > 0 ? 'No sale matches these filters.' : 'Record a sale when a released batch is sold.'}</EmptyState>
          ) : (
            <div className="relative overflow-x-auto rounded-card border border-hairline bg-surface">
              <table className="w-full text-left">
                <caption className="sr-only">Sales, newest first; total {formatCents(list.data!.totalCents)}</caption>
                <thead><tr className="border-b border-hairline">{['Date', 'Lot', 'Product', 'Quantity', 'Amount', 'Channel', ...(isOwner ? ['Customer'] : []), 'Recorded by', ''].map((h, i) => <th key={i} scope="col" className="px-3 py-2">{h || <span className="sr-only">Actions</span>}</th>)}</tr></thead>
                <tbody>
                  {list.data!.items.map((s) => (
                    <tr key={s.id} className="border-b border-hairline last:border-0">
                      <td className="whitespace-nowrap px-3 py-2 tabular">{s.soldOn}</td>
                      <th scope="row" className="whitespace-nowrap px-3 py-2 font-mono">{s.lotCode}</th>
                      <td className="px-3 py-2">{s.productName}</td>
                      <td className="px-3 py-2 tabular">{s.quantity} {s.unit}</td>
                      <td className="px-3 py-2 tabular">{s.voided ? <><s>{formatCents(s.amountCents)}</s> <span className="text-cherry">Voided: {s.voided.reason}</span></> : formatCents(s.amountCents)}</td>
                      <td className="px-3 py-2">{CHANNEL_LABELS[s.channel] ?? s.channel}</td>
                      {isOwner ? <td className="px-3 py-2">{s.customer ? (s.customer.erased ? <em className="text-muted">Erased</em> : s.customer.name) : '—'}</td> : null}
                      <td className="px-3 py-2">{s.recordedByName}</td>
                      <td className="px-3 py-2">{canWrite && !s.voided ? <Button variant="quiet" onClick={() => { setVoiding(s); setReason(''); }}>Void<span className="sr-only"> sale of lot {s.lotCode} on {s.soldOn}</span></Button> : null}</td>
                    </tr>
                  ))}
                </tbody>
                <tfoot><tr><th scope="row" colSpan={4} className="px-3 py-2 text-right">Total shown</th><td className="px-3 py-2 tabular font-bold">{formatCents(list.data!.totalCents)}</td></tr></tfoot>
              </table>
            </div>
          )}
        </section>
        {isOwner ? <CustomerList /> : null}
      </div>
      <Dialog
        isOpen={voiding != null} onClose={() => setVoiding(null)} title="Void this sale?"
        description="The sale stays in the records with your reason beside it; it no longer counts towards the year’s total."
        actions={<>
          <Button variant="secondary" onClick={() => setVoiding(null)}>Keep the sale</Button>
          <Button variant="danger" isBusy={voidSale.isPending} disabled={reason.trim().length < 3} onClick={() => voiding && voidSale.mutateAsync({ id: voiding.id, reason }).then(() => setVoiding(null))}>Void sale</Button>
        </>}
      >
        <Textarea label="Reason" autoFocus value={reason} onChange={(e) => setReason(e.target.value)} hint="At least 3 characters, e.g. “Entered twice”." />
      </Dialog>
    </>
  );
}
