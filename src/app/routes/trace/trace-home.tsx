import { useState } from 'react';
import { businessLocalDate, formatZonedDateTime } from '@shared/domain/zoned-time';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router';
import type { OpenRecallInput, TraceQuery } from '@shared/contracts/trace';
import { traceQueries } from '@/features/trace/api';
import { TraceCustomers, TraceTree } from '@/features/trace/components/trace-tree';
import { OpenRecallDialog } from '@/features/trace/components/open-recall-dialog';
import { RecallView } from '@/features/trace/components/recall-view';
import { useSession } from '@/features/auth/api';
import { PageHeader } from '@/components/ui/page-header';
import { Button } from '@/components/ui/button';
import { Select } from '@/components/ui/select';
import { StatusBadge } from '@/components/ui/status-badge';
import { EmptyState } from '@/components/ui/empty-state';
import { LoadingBlock } from '@/components/ui/spinner';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

type Kind = 'supplierLotId' | 'ingredientId' | 'batchId';
const KINDS: { value: Kind; label: string }[] = [
  { value: 'supplierLotId', label: 'A supplier lot (forward)' },
  { value: 'ingredientId', label: 'An ingredient, every lot (forward)' },
  { value: 'batchId', label: 'A batch (backward to its supplier lots)' },
];

function queryFrom(search: URLSearchParams): TraceQuery | null {
  for (const k of ['supplierLotId', 'ingredientId', 'batchId'] as const) {
    const v = search.get(k);
    if (v) return { [k]: v } as TraceQuery;
  }
  return null;
}

export const loader = (qc: QueryClient) => async () => {
  await qc.ensureQueryData(traceQueries.options());
  return null;
};

export function Component() {
  const [search, setSearch] = useSearchParams();
  const q = queryFrom(search);
  const recallId = search.get('recall');
  const { user, business } = useSession();
  const tz = business?.timeZone ?? 'UTC';
  const isOwner = user?.role === 'owner';
  const options = useQuery(traceQueries.options());
  const result = useQuery({ ...traceQueries.trace(q ?? {}), enabled: q != null });
  const recalls = useQuery(traceQueries.recalls());
  const recall = useQuery({ ...traceQueries.recall(recallId ?? ''), enabled: recallId != null });
  const [kind, setKind] = useState<Kind>((q && (Object.keys(q)[0] as Kind)) || 'supplierLotId');
  const [isRecalling, setIsRecalling] = useState(false);
  const go = (k: Kind, id: string) => setSearch(id ? new URLSearchParams({ [k]: id }) : new URLSearchParams());
  const items = kind === 'supplierLotId'
    ? (options.data?.supplierLots ?? []).map((l) => ({ value: l.id, label: `${l.ingredientName} — lot ${l.lotCode} (received ${l.receivedOn})` }))
    : kind === 'ingredientId'
      ? (options.data?.ingredients ?? []).map((i) => ({ value: i.id, label: i.name }))
      : (options.data?.batches ?? []).map((b) => ({ value: b.id, label: `${b.lotCode} — ${b.productName} (${b.madeOn})` }));
  const data = result.data;
  const scope: OpenRecallInput['scope'] | null = !data ? null
    : data.start.kind === 'supplier_lot' ? { kind: 'supplier_lot', supplierLotId: data.start.id }
    : data.start.kind === 'batch' ? { kind: 'batches', batchIds: [data.start.id] } : null;
  return (
    <>
      <PageHeader
        title="Trace & recall"
        description="Follow a supplier lot to every batch and customer, or a batch back to its supplier lots; open a recall."
        actions={<Button variant="secondary" onClick={() => window.print()} data-print="hide">Print report</Button>}
      />
      <div className="space-y-6">
        {recallId ? (
          recall.data ? <RecallView recall={recall.data} isOwner={isOwner} /> : <LoadingBlock label="Loading the recall…" />
        ) : null}
        <form role="search" aria-label="Trace from" className="grid gap-4 sm:grid-cols-2" onSubmit={(e) => e.preventDefault()} data-print="hide">
          <Select label="Trace from" options={KINDS} value={kind} onChange={(e) => setKind(e.target.value as Kind)} />
          <Select label="Which one" placeholder="Choose…" options={items} value={(q && Object.keys(q)[0] === kind ? Object.values(q)[0] : '') ?? ''} onChange={(e) => go(kind, e.target.value)} />
        </form>
        {q == null ? (
          <EmptyState title="Choose where to start" icon="trace">Pick a supplier lot (for example one your supplier has recalled), an ingredient or a batch.</EmptyState>
        ) : result.isPending ? <LoadingBlock label="Tracing…" /> : data ? (
          <section aria-labelledby="trace-heading" className="space-y-4">
            <h2 id="trace-heading" className="text-xl font-bold">{data.direction === 'forward' ? 'Forward' : 'Backward'} from {data.start.label}</h2>
            <p className="text-sm text-muted">
              Report made {formatZonedDateTime(new Date(data.generatedAt), tz)}. {data.batches.length} {data.batches.length === 1 ? 'batch' : 'batches'} found.{' '}
              <a data-print="hide" className="text-berry underline" href={`/api/trace/report.pdf?${new URLSearchParams(q as Record<string, string>).toString()}`} target="_blank" rel="noreferrer">Download the report as PDF</a>
            </p>
            {data.direction === 'backward' ? (
              <>
                <h3 className="font-bold">Supplier lots that went in</h3>
                {data.supplierLots.length ? <ul className="list-disc pl-6">{data.supplierLots.map((l) => <li key={l.id}>{l.ingredientName}, lot <span className="font-mono">{l.lotCode}</span> (received {l.receivedOn})</li>)}</ul> : <p>No supplier lot recorded.</p>}
                {data.unrecordedIngredients.length ? <p className="text-honey">No lot was noted for: {data.unrecordedIngredients.map((u) => u.ingredientName).join(', ')}.</p> : null}
              </>
            ) : null}
            <h3 className="font-bold">Batches</h3>
            {data.batches.length ? <TraceTree result={data} /> : <p>No batch used it.</p>}
            {data.direction === 'forward' ? (
              <>
                <h3 className="font-bold">Customers ({data.customers.length}; {data.consentingCustomerCount} agreed to recall notices)</h3>
                <TraceCustomers result={data} />
              </>
            ) : null}
            {isOwner && scope && data.batches.length > 0 ? (
              <div data-print="hide"><Button variant="danger" onClick={() => setIsRecalling(true)}>Open a recall</Button></div>
            ) : null}
            {isOwner && scope ? (
              <OpenRecallDialog result={data} scope={scope} isOpen={isRecalling} onClose={() => setIsRecalling(false)} onOpened={(id) => setSearch(new URLSearchParams({ recall: id }))} />
            ) : null}
          </section>
        ) : null}
        <section aria-labelledby="recalls-heading" className="space-y-2" data-print="hide">
          <h2 id="recalls-heading" className="text-lg font-bold">Recalls</h2>
          {(recalls.data?.items.length ?? 0) === 0 ? <p>No recalls yet.</p> : (
            <ul className="space-y-2">
              {recalls.data!.items.map((r) => (
                <li key={r.id} className="flex flex-wrap items-center gap-2">
                  <StatusBadge status={r.status === 'open' ? 'recalled' : 'signed'} label={r.status === 'open' ? 'Open' : 'Closed'} />
                  <button type="button" className="text-berry underline" onClick={() => setSearch(new URLSearchParams({ recall: r.id }))}>
                    {businessLocalDate(new Date(r.openedAt), tz)}: {r.supplierLot ? `${r.supplierLot.ingredientName} lot ${r.supplierLot.lotCode}` : `${r.batches.length} batches`}
                  </button>
                  <span className="text-sm text-muted">{r.progress.told} of {r.progress.customers} customers told</span>
                </li>
              ))}
            </ul>
          )}
        </section>
      </div>
    </>
  );
}
