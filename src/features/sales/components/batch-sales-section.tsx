import { useQuery } from '@tanstack/react-query';
import type { BatchDetail } from '@shared/contracts/batches';
import { formatCents } from '@shared/domain/sales-cap';
import { EmptyState } from '@/components/ui/empty-state';
import { registerBatchSection } from '@/features/batches/components/batch-sections';
import { CHANNEL_LABELS, salesQueries } from '../api';

/** Sales recorded against one batch, for the batch page. */
export function BatchSalesSection({ batch }: { batch: BatchDetail }) {
  const query = useQuery(salesQueries.list({ batchId: batch.id }));
  const sales = query.data?.items ?? [];
  if (query.isError) return <p role="alert">{query.error.message}</p>;
  if (query.isSuccess && sales.length === 0) return <EmptyState title="No sales recorded for this batch">Owners and bakers record sales on the Sales page.</EmptyState>;
  return (
    <div className="space-y-2">
      <ul className="space-y-1">
        {sales.map((s) => (
          <li key={s.id} className={s.voided ? 'text-muted line-through' : undefined}>
            <span className="tabular-nums">{s.soldOn}</span>: {s.quantity} {s.unit}, <span className="tabular-nums">{formatCents(s.amountCents)}</span>, {CHANNEL_LABELS[s.channel] ?? s.channel}
            {s.voided ? <span className="no-underline"> (voided: {s.voided.reason})</span> : null}
          </li>
        ))}
      </ul>
      {query.isSuccess ? <p className="font-bold">Total: <span className="tabular-nums">{formatCents(query.data.totalCents)}</span></p> : null}
    </div>
  );
}

registerBatchSection({ id: 'sales', title: 'Sales', order: 40, Component: BatchSalesSection });
