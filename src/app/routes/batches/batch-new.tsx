import { useQuery, type QueryClient } from '@tanstack/react-query';
import { useNavigate } from 'react-router';
import { businessLocalDate } from '@shared/domain/zoned-time';
import { batchQueries } from '@/features/batches/api';
import { NewBatchForm } from '@/features/batches/components/batch-form';
import { useSession } from '@/features/auth/api';
import { teamQueries } from '@/features/team/api';
import { PageHeader } from '@/components/ui/page-header';
import { useToast } from '@/components/ui/toast';
import { batchPath } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async () => {
  await Promise.all([qc.ensureQueryData(batchQueries.recipeOptions()), qc.ensureQueryData(teamQueries.members())]);
  return null;
};

export function Component() {
  const { user, business } = useSession();
  const members = useQuery(teamQueries.members());
  const navigate = useNavigate();
  const toast = useToast();
  const today = businessLocalDate(new Date(), business?.timeZone ?? 'UTC');
  return (
    <>
      <PageHeader title="Record a batch" description="One production run of one recipe version. The lot code is given when you save." />
      <div className="rounded-card border border-hairline bg-surface p-4 sm:p-6">
        <NewBatchForm
          today={today}
          currentUserId={user?.id ?? ''}
          members={(members.data?.members ?? []).map((m) => ({ value: m.userId, label: m.displayName }))}
          onSaved={(b) => {
            toast.showToast(`Batch ${b.lotCode} recorded.`);
            navigate(batchPath(b.id));
          }}
        />
      </div>
    </>
  );
}
