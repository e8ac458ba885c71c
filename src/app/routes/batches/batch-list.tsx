import { useQuery, type QueryClient } from '@tanstack/react-query';
import { Link, useSearchParams, type LoaderFunctionArgs } from 'react-router';
import { BATCH_STATES, type BatchState } from '@shared/domain/batch-states';
import { ListBatchesQuerySchema, type BatchListItem } from '@shared/contracts/batches';
import { batchQueries, type BatchListFilters } from '@/features/batches/api';
import { BatchStateBadge, BATCH_STATE_LABELS } from '@/features/batches/components/batch-state-badge';
import { useSession } from '@/features/auth/api';
import { PageHeader } from '@/components/ui/page-header';
import { ButtonLink, Button } from '@/components/ui/button';
import { Select } from '@/components/ui/select';
import { Field } from '@/components/ui/field';
import { EmptyState } from '@/components/ui/empty-state';
import { LoadingBlock } from '@/components/ui/spinner';
import { batchPath, paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

function filtersFrom(search: URLSearchParams): BatchListFilters {
  const parsed = ListBatchesQuerySchema.safeParse(Object.fromEntries(search));
  if (!parsed.success) return {};
  const { state, recipeId, from, to, page } = parsed.data;
  return { state, recipeId, from, to, page };
}

export const loader = (qc: QueryClient) => async ({ request }: LoaderFunctionArgs) => {
  await qc.ensureQueryData(batchQueries.list(filtersFrom(new URL(request.url).searchParams)));
  return null;
};

const quantity = (b: BatchListItem) => [b.quantityPieces != null ? `${b.quantityPieces} pcs` : '', b.quantityPackages != null ? `${b.quantityPackages} pkgs` : ''].filter(Boolean).join(', ') || '—';

export function Component() {
  const [search, setSearch] = useSearchParams();
  const filters = filtersFrom(search);
  const list = useQuery(batchQueries.list(filters));
  const recipes = useQuery(batchQueries.recipeOptions());
  const { user } = useSession();
  const canWrite = user?.role === 'owner' || user?.role === 'baker';
  const set = (name: string, value: string) => {
    const next = new URLSearchParams(search);
    if (value) next.set(name, value);
    else next.delete(name);
    if (name !== 'page') next.delete('page');
    setSearch(next, { replace: true });
  };
  const page = list.data?.page ?? 1;
  const pages = list.data ? Math.max(1, Math.ceil(list.data.total / list.data.pageSize)) : 1;
  return (
    <>
      <PageHeader
        title="Batches"
        description="Every production run with its lot code, what went in, and where it stands."
        actions={canWrite ? <ButtonLink variant="primary" to={paths.batchNew}>Record a batch</ButtonLink> : null}
      />
      <form role="search" aria-label="Filter batches" className="mb-4 grid gap-4 sm:grid-cols-2 lg:grid-cols-4" onSubmit={(e) => e.preventDefault()}>
        <Select label="State" placeholder="Any state" options={BATCH_STATES.map((s: BatchState) => ({ value: s, label: BATCH_STATE_LABELS[s] }))} value={filters.state ?? ''} onChange={(e) => set('state', e.target.value)} />
        <Select label="Recipe" placeholder="Any recipe" options={(recipes.data?.recipes ?? []).map((r) => ({ value: r.recipeId, label: r.name }))} value={filters.recipeId ?? ''} onChange={(e) => set('recipeId', e.target.value)} />
        <Field label="Made from" type="date" value={filters.from ?? ''} onChange={(e) => set('from', e.target.value)} />
        <Field label="Made until" type="date" value={filters.to ?? ''} onChange={(e) => set('to', e.target.value)} />
      </form>
      {list.isPending ? <LoadingBlock label="Loading batches…" /> : list.data && list.data.items.length === 0 ? (
        <EmptyState title="No batches here" icon="batch" action={canWrite ? <ButtonLink variant="primary" to={paths.batchNew}>Record a batch</ButtonLink> : undefined}>
          {search.size > 0 ? 'No batch matches these filters.' : 'Record a batch when you start a production run.'}
        </EmptyState>
      ) : (
        <div className="relative overflow-x-auto rounded-card border border-hairline bg-surface">
          <table className="w-full text-left">
            <caption className="sr-only">Batches, newest first</caption>
            <thead>
              <tr className="border-b border-hairline">
                {['Lot code', 'Recipe', 'Made on', 'Best by', 'Quantity', 'Made by', 'State'].map((h) => <th key={h} scope="col" className="px-3 py-2">{h}</th>)}
              </tr>
            </thead>
            <tbody>
              {list.data?.items.map((b) => (
                <tr key={b.id} className="border-b border-hairline last:border-0">
                  <th scope="row" className="px-3 py-2 font-mono">
                    <Link to={batchPath(b.id)} className="whitespace-nowrap text-berry underline">{b.lotCode}</Link>
                    {b.warningCount > 0 ? <span className="ml-2 font-sans text-sm font-normal text-honey">({b.warningCount} {b.warningCount === 1 ? 'warning' : 'warnings'})</span> : null}
                  </th>
                  <td className="px-3 py-2">{b.recipeName} <span className="text-muted">v{b.recipeVersion}</span></td>
                  <td className="whitespace-nowrap px-3 py-2 tabular">{b.madeOn}</td>
                  <td className="whitespace-nowrap px-3 py-2 tabular">{b.bestBy ?? '—'}</td>
                  <td className="px-3 py-2">{quantity(b)}</td>
                  <td className="px-3 py-2">{b.madeByName ?? '—'}</td>
                  <td className="px-3 py-2"><BatchStateBadge state={b.state} /></td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {pages > 1 ? (
        <nav aria-label="Pages" className="mt-4 flex items-center gap-3">
          <Button variant="secondary" disabled={page <= 1} onClick={() => set('page', String(page - 1))}>Previous</Button>
          <span>Page {page} of {pages}</span>
          <Button variant="secondary" disabled={page >= pages} onClick={() => set('page', String(page + 1))}>Next</Button>
        </nav>
      ) : null}
    </>
  );
}
