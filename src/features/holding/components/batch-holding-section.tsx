import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { BatchDetail } from '@shared/contracts/batches';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { registerBatchSection } from '@/features/batches/components/batch-sections';
import { holdingQueries } from '../api';
import { useServerClock } from './countdown';
import { HoldingCaution } from './holding-caution';
import { StartTimerDialog } from './start-timer-dialog';
import { TimerCard } from './timer-card';

const STARTABLE = ['in_progress', 'released', 'held'];

/** Holding times of one batch, for the batch page: every period, the open ones first. */
export function BatchHoldingSection({ batch }: { batch: BatchDetail }) {
  const query = useQuery(holdingQueries.forBatch(batch.id));
  const now = useServerClock(query.data?.serverNow);
  const [isStarting, setStarting] = useState(false);
  const periods = query.data?.periods ?? [];
  return (
    <div className="space-y-4">
      {STARTABLE.includes(batch.state) ? <Button onClick={() => setStarting(true)}>Start a timer</Button> : null}
      {query.isError ? <p role="alert">{query.error.message}</p> : null}
      {query.isSuccess && periods.length === 0 ? <EmptyState title="No holding times yet">Start a timer when this batch is out of temperature control.</EmptyState> : null}
      <div className="grid gap-4 md:grid-cols-2">
        {periods.map((p) => <TimerCard key={p.id} period={p} now={now} />)}
      </div>
      <HoldingCaution />
      <StartTimerDialog batchOptions={[]} fixedBatchId={batch.id} isOpen={isStarting} onClose={() => setStarting(false)} />
    </div>
  );
}

registerBatchSection({ id: 'holding', title: 'Holding times', order: 10, Component: BatchHoldingSection });
