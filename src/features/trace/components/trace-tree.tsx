import { Link } from 'react-router';
import type { TraceBatch, TraceResult } from '@shared/contracts/trace';
import { formatCents } from '@shared/domain/sales-cap';
import { BatchStateBadge } from '@/features/batches/components/batch-state-badge';
import { batchPath } from '@/app/paths';

function Node({ batch, all, depth }: { batch: TraceBatch; all: TraceBatch[]; depth: number }) {
  const children = all.filter((b) => b.madeFromBatchIds.includes(batch.id));
  return (
    <li className="mt-2">
      <div className="rounded-card border border-hairline bg-surface p-3">
        <div className="flex flex-wrap items-center gap-2">
          <Link to={batchPath(batch.id)} className="font-mono text-berry underline">{batch.lotCode}</Link>
          <span className="font-bold">{batch.productName}</span>
          <span className="text-muted">made {batch.madeOn}</span>
          <BatchStateBadge state={batch.state} />
          {batch.lotNotRecorded ? <span className="text-honey">(lot not recorded: may contain any lot)</span> : null}
        </div>
        <p className="text-sm">
          {batch.sales.count === 0 ? 'No sales recorded.' : `${batch.sales.count} ${batch.sales.count === 1 ? 'sale' : 'sales'}, ${formatCents(batch.sales.amountCents)}, ${batch.sales.customerCount} known ${batch.sales.customerCount === 1 ? 'customer' : 'customers'}.`}
          {depth > 0 ? ' Made with the batch above.' : ''}
        </p>
      </div>
      {children.length ? <ul className="ml-6 border-l-2 border-hairline pl-4" aria-label={`Made with ${batch.lotCode}`}>{children.map((c) => <Node key={c.id} batch={c} all={all} depth={depth + 1} />)}</ul> : null}
    </li>
  );
}

/** Batches as a tree: those made straight from the start first, and under each the batches made with it. */
export function TraceTree({ result }: { result: TraceResult }) {
  const roots = result.batches.filter((b) => b.madeFromBatchIds.length === 0);
  return <ul aria-label="Batches found" data-testid="trace-tree">{roots.map((b) => <Node key={b.id} batch={b} all={result.batches} depth={0} />)}</ul>;
}

/** Who bought the traced batches; contact details only reach the owner's screen. */
export function TraceCustomers({ result }: { result: TraceResult }) {
  const lot = (id: string) => result.batches.find((b) => b.id === id)?.lotCode ?? '';
  if (result.customers.length === 0) return <p>No customer was recorded for these sales.</p>;
  const withContacts = result.customers.some((c) => c.contact !== undefined);
  return (
    <div className="relative overflow-x-auto rounded-card border border-hairline bg-surface">
      <table className="w-full text-left">
        <caption className="sr-only">Customers who bought the traced batches</caption>
        <thead><tr className="border-b border-hairline">{[...(withContacts ? ['Name', 'E-mail', 'Phone'] : ['Customer']), 'Recall notices', 'Bought lots'].map((h) => <th key={h} scope="col" className="px-3 py-2">{h}</th>)}</tr></thead>
        <tbody>
          {result.customers.map((c, i) => (
            <tr key={c.customerId} className="border-b border-hairline last:border-0">
              {withContacts ? <>
                <th scope="row" className="px-3 py-2">{c.contact?.name ?? <em className="text-muted">Erased on request</em>}</th>
                <td className="px-3 py-2">{c.contact?.email ?? '—'}</td>
                <td className="px-3 py-2">{c.contact?.phone ?? '—'}</td>
              </> : <th scope="row" className="px-3 py-2">Customer {i + 1}</th>}
              <td className="px-3 py-2">{c.contact ? (c.contact.recallConsent ? 'Agreed' : 'Not agreed') : '—'}</td>
              <td className="px-3 py-2 font-mono">{c.batchIds.map(lot).join(', ')}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
