import { useQuery } from '@tanstack/react-query';
import type { BatchDetail } from '@shared/contracts/batches';
import { EmptyState } from '@/components/ui/empty-state';
import { useSession } from '@/features/auth/api';
import { registerBatchSection } from '@/features/batches/components/batch-sections';
import { cleaningQueries } from '../api';
import { RunCard } from './run-card';

/** Cleaning runs recorded for one batch, for the batch page. */
export function BatchCleaningSection({ batch }: { batch: BatchDetail }) {
  const session = useSession();
  const query = useQuery(cleaningQueries.forBatch(batch.id));
  const runs = query.data?.runs ?? [];
  return (
    <div className="space-y-4">
      {query.isError ? <p role="alert">{query.error.message}</p> : null}
      {query.isSuccess && runs.length === 0 ? <EmptyState title="No cleaning recorded for this batch">Start a per-batch checklist on the Cleaning page.</EmptyState> : null}
      {runs.map((r) => <RunCard key={r.id} run={r} isDevice={session.kind === 'device'} canCorrect={session.kind === 'member'} userName={session.user?.displayName ?? ''} />)}
    </div>
  );
}

registerBatchSection({ id: 'cleanings', title: 'Cleanings', order: 20, Component: BatchCleaningSection });
