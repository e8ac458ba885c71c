import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { CleaningRun } from '@shared/contracts/cleaning';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { Select } from '@/components/ui/select';
import { StatusBadge } from '@/components/ui/status-badge';
import { LoadingBlock } from '@/components/ui/spinner';
import { Field, FormError } from '@/components/ui/field';
import { useSession } from '@/features/auth/api';
import { cleaningQueries, useStartCleaningRun } from '@/features/cleaning/api';
import { RunCard } from '@/features/cleaning/components/run-card';
import { CleaningSetupPanel } from '@/features/cleaning/components/setup-panel';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

const DUE_BADGE = {
  overdue: <StatusBadge status="over-limit" label="Overdue" />,
  due_soon: <StatusBadge status="due-soon" />,
  ok: <StatusBadge status="within-limit" label="Cleaned" />,
  not_in_use: <StatusBadge status="sold-out" label="Not in use" />,
} as const;

function StartRun({ batchId }: { batchId?: string }) {
  const templates = (useQuery(cleaningQueries.templates()).data ?? []).filter((t) => !t.archived);
  const start = useStartCleaningRun();
  const [templateId, setTemplateId] = useState('');
  const [error, setError] = useState<string>();
  const chosen = templateId || templates[0]?.id || '';
  if (templates.length === 0) return <p className="text-muted">No checklists yet{batchId ? '' : ': an owner or baker adds them below'}.</p>;
  return (
    <div className="flex flex-wrap items-end gap-3">
      <Select label="Checklist" options={templates.map((t) => ({ value: t.id, label: `${t.name} (${t.frequency === 'daily' ? 'per day' : 'per batch'})` }))} value={chosen} onChange={(e) => setTemplateId(e.target.value)} />
      <Button size="board" isBusy={start.isPending} onClick={() => {
        setError(undefined);
        start.run({ templateId: chosen, batchId }).catch((err: Error) => setError(err.message));
      }}>Start cleaning</Button>
      <FormError message={error} />
    </div>
  );
}

function RunList({ runs, isDevice, canCorrect, userName }: { runs: CleaningRun[]; isDevice: boolean; canCorrect: boolean; userName: string }) {
  return <div className="space-y-4">{runs.map((r) => <RunCard key={r.id} run={r} isDevice={isDevice} canCorrect={canCorrect} userName={userName} />)}</div>;
}

export function Component() {
  const session = useSession();
  const isDevice = session.kind === 'device';
  const role = session.user?.role;
  const canEdit = role === 'owner' || role === 'baker';
  const [date, setDate] = useState<string>();
  const runs = useQuery(cleaningQueries.runs(date));
  const isToday = !date || date === runs.data?.today;
  const due = useQuery(cleaningQueries.due());
  return (
    <div className="space-y-8">
      <PageHeader title="Cleaning" description="Today’s checklists, what is due, and signed records. Local health rules decide what you must clean and how often." />
      <section aria-labelledby="due-heading" className="space-y-3">
        <h2 id="due-heading" className="text-xl font-bold">Due now</h2>
        {due.data ? (
          <>
            {due.data.dailyTemplatesNotStarted.length ? <p>Not started today: {due.data.dailyTemplatesNotStarted.map((t) => t.name).join(', ')}.</p> : <p className="text-muted">Every daily checklist is started today.</p>}
            <p className="text-sm text-muted">Food-contact surfaces in use are cleaned and sanitised at least every 4 hours (FDA Food Code 4-602.11(C)).</p>
            <ul className="grid gap-2 md:grid-cols-2">
              {due.data.equipment.map((e) => (
                <li key={e.equipmentId} className="flex flex-wrap items-center gap-2 rounded-card border border-hairline bg-surface p-3">
                  {DUE_BADGE[e.status]} <span className="font-bold">{e.name}</span>
                  {e.nextDueAtLocal ? <span className="tabular text-sm text-muted">{e.status === 'overdue' ? 'due since' : 'next by'} {e.nextDueAtLocal}</span> : null}
                </li>
              ))}
            </ul>
          </>
        ) : <LoadingBlock />}
      </section>
      <section aria-labelledby="today-heading" className="space-y-4">
        <div className="flex flex-wrap items-end justify-between gap-3">
          <h2 id="today-heading" className="text-xl font-bold">{isToday ? 'Today' : 'Cleaning on'}{runs.data ? ` (${date ?? runs.data.today})` : ''}</h2>
          <Field label="Show another day" type="date" value={date ?? runs.data?.today ?? ''} max={runs.data?.today} onChange={(e) => setDate(e.target.value || undefined)} data-print="hide" />
        </div>
        {isToday ? <StartRun /> : null}
        {runs.isError ? <p role="alert">{runs.error.message}</p> : null}
        {runs.data && runs.data.runs.length === 0 ? <EmptyState title={isToday ? 'No cleaning recorded today' : 'No cleaning recorded that day'}>{isToday ? 'Start a checklist above when you clean.' : 'Choose another day.'}</EmptyState> : null}
        {runs.data ? <RunList runs={runs.data.runs} isDevice={isDevice} canCorrect={!isDevice} userName={session.user?.displayName ?? ''} /> : null}
      </section>
      {canEdit ? (
        <section aria-labelledby="setup-heading" className="space-y-4" data-print="hide">
          <h2 id="setup-heading" className="text-xl font-bold">Equipment and checklists</h2>
          <CleaningSetupPanel />
        </section>
      ) : null}
    </div>
  );
}

