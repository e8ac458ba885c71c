import { useQuery } from '@tanstack/react-query';
import type { BatchDetail } from '@shared/contracts/batches';
import { formatZonedDateTime } from '@shared/domain/zoned-time';
import { ButtonLink } from '@/components/ui/button';
import { useSession } from '@/features/auth/api';
import { registerBatchSection } from '@/features/batches/components/batch-sections';
import { paths } from '@/app/paths';
import { labelQueries } from '../api';

/** The batch page's labels: a link to print them and what was printed (owners and bakers). */
export function BatchLabelsSection({ batch }: { batch: BatchDetail }) {
  const { user, business } = useSession();
  const canPrint = user?.role === 'owner' || user?.role === 'baker';
  const runs = useQuery({ ...labelQueries.printRuns(batch.id), enabled: canPrint });
  if (!canPrint) return <p className="text-muted">Owners and bakers print labels from this batch&rsquo;s recorded data, after the label check.</p>;
  return (
    <div className="space-y-3">
      <p className="text-muted">Labels come from this batch&rsquo;s recorded data, after the label check.</p>
      <ButtonLink to={`${paths.labels}?batchId=${batch.id}`}>Print labels for lot {batch.lotCode}</ButtonLink>
      {runs.isError ? <p role="alert">{runs.error.message}</p> : null}
      {runs.isSuccess && runs.data.length === 0 ? <p className="text-muted">No labels printed for this batch yet.</p> : null}
      {runs.isSuccess && runs.data.length > 0 ? (
        <ul className="space-y-1">
          {runs.data.map((r) => (
            <li key={r.id}>
              <span className="tabular-nums">{formatZonedDateTime(new Date(r.printedAt), business?.timeZone ?? 'UTC')}</span>: {r.count} labels ({r.templateName}, {r.pages} {r.pages === 1 ? 'page' : 'pages'}) by {r.printedByName}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

registerBatchSection({ id: 'labels', title: 'Labels', order: 30, Component: BatchLabelsSection });
