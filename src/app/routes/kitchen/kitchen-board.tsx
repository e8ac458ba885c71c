import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { KitchenBoardSection } from '@shared/contracts/kitchen-board';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { Spinner } from '@/components/ui/spinner';
import { Icon } from '@/components/ui/icon';
import { StatusBadge } from '@/components/ui/status-badge';
import { holdingQueries } from '@/features/holding/api';
import { useServerClock } from '@/features/holding/components/countdown';
import { HoldingCaution } from '@/features/holding/components/holding-caution';
import { StartTimerDialog } from '@/features/holding/components/start-timer-dialog';
import { TimerCard } from '@/features/holding/components/timer-card';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

type Section<K extends KitchenBoardSection['kind']> = Extract<KitchenBoardSection, { kind: K }>;

/** The Kitchen board: running timers (anything over a limit first), batches in progress, and what other features add. */
export function Component() {
  const board = useQuery(holdingQueries.board());
  const now = useServerClock(board.data?.serverNow);
  const [isStarting, setStarting] = useState(false);
  if (board.isPending) return <Spinner label="Loading the kitchen board" />;
  if (board.isError) return <p role="alert" className="text-board">{board.error.message}</p>;
  const timers = board.data.sections.find((s): s is Section<'holding_timers'> => s.kind === 'holding_timers');
  return (
    <div className="space-y-8 text-board">
      <div className="flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-3xl font-bold">Kitchen board</h1>
          <p className="text-muted">Times shown in {board.data.timeZone}, with the offset.</p>
        </div>
        <Button size="board" icon={<Icon name="clock" className="size-6" />} onClick={() => setStarting(true)}>Start timer</Button>
      </div>
      {board.data.sections.map((section) => <BoardSection key={section.kind} section={section} now={now} />)}
      <HoldingCaution />
      <StartTimerDialog batchOptions={timers?.batchOptions ?? []} isOpen={isStarting} onClose={() => setStarting(false)} />
    </div>
  );
}

function BoardSection({ section, now }: { section: KitchenBoardSection; now: number }) {
  switch (section.kind) {
    case 'holding_timers':
      return (
        <section aria-labelledby="timers-heading" className="space-y-4">
          <h2 id="timers-heading" className="text-2xl font-bold">Timers</h2>
          {section.periods.length === 0 ? <EmptyState title="No timers running">Start one when food comes out of the fridge or off the heat.</EmptyState> : null}
          <div className="grid gap-4 lg:grid-cols-2">
            {section.periods.map((p) => <TimerCard key={p.id} period={p} now={now} />)}
          </div>
        </section>
      );
    case 'batches_in_progress':
      return (
        <section aria-labelledby="batches-heading" className="space-y-3">
          <h2 id="batches-heading" className="text-2xl font-bold">Batches in progress</h2>
          {section.batches.length === 0 ? <p className="text-muted">Nothing being made right now.</p> : (
            <ul className="grid gap-3 md:grid-cols-2">
              {section.batches.map((b) => (
                <li key={b.id} className="min-h-11 rounded-card border border-edge bg-surface p-4">
                  <span className="font-bold">{b.productName}</span> <span className="tabular text-muted">{b.lotCode} · made {b.madeOn}</span>
                </li>
              ))}
            </ul>
          )}
        </section>
      );
    case 'cleanings_due':
      return (
        <section aria-labelledby="cleanings-heading" className="space-y-3">
          <h2 id="cleanings-heading" className="text-2xl font-bold">Cleaning due</h2>
          <ul className="space-y-2">
            {section.items.map((c) => (
              <li key={c.id} className={`flex flex-wrap items-center gap-2 ${c.isOverdue ? 'font-bold text-cherry' : ''}`}>
                {/* Word + icon + colour, as on the Cleaning screen. */}
                <StatusBadge status={c.isOverdue ? 'over-limit' : 'due-soon'} label={c.isOverdue ? 'Overdue' : 'Due'} />
                <span>{c.title} — {c.isOverdue ? 'overdue since' : 'due'} <span className="tabular">{c.dueAtLocal}</span></span>
              </li>
            ))}
          </ul>
        </section>
      );
    case 'documents_expiring':
      return (
        <section aria-labelledby="documents-heading" className="space-y-3">
          <h2 id="documents-heading" className="text-2xl font-bold">Documents expiring</h2>
          <ul className="space-y-2">
            {section.items.map((d) => <li key={d.id}>{d.title} — expires {d.expiresOn} ({d.daysLeft} days)</li>)}
          </ul>
        </section>
      );
    case 'sales_cap':
      return section.warning ? (
        <section aria-labelledby="sales-cap-heading" className="rounded-card border border-honey bg-honey-soft p-4">
          <h2 id="sales-cap-heading" className="text-2xl font-bold">Sales cap</h2>
          <p>{section.warning.message}</p>
        </section>
      ) : null;
  }
}
