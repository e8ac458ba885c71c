import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { holdingQueries } from '../api';
import { useServerClock } from './countdown';
import { HoldingCaution } from './holding-caution';
import { StartTimerDialog } from './start-timer-dialog';
import { TimerCard } from './timer-card';

/** Holding times of one batch, for the batch page: every period, the open ones first. */
export function BatchHoldingSection({ batchId, canStart = true }: { batchId: string; canStart?: boolean }) {
  const query = useQuery(holdingQueries.forBatch(batchId));
  const now = useServerClock(query.data?.serverNow);
  const [isStarting, setStarting] = useState(false);
  const periods = query.data?.periods ?? [];
  return (
    <section aria-labelledby="batch-holding-heading" className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <h2 id="batch-holding-heading" className="text-xl font-bold">Holding times</h2>
        {canStart ? <Button onClick={() => setStarting(true)}>Start a timer</Button> : null}
      </div>
      {query.isError ? <p role="alert">{query.error.message}</p> : null}
      {query.isSuccess && periods.length === 0 ? <EmptyState title="No holding times yet">Start a timer when this batch is out of temperature control.</EmptyState> : null}
      <div className="grid gap-4 md:grid-cols-2">
        {periods.map((p) => <TimerCard key={p.id} period={p} now={now} />)}
      </div>
      <HoldingCaution />
      <StartTimerDialog batchOptions={[]} fixedBatchId={batchId} isOpen={isStarting} onClose={() => setStarting(false)} />
    </section>
  );
}
