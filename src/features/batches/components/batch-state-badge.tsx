import type { BatchState } from '@shared/domain/batch-states';
import { StatusBadge, type Status } from '@/components/ui/status-badge';

const STATUS: Record<BatchState, Status> = {
  in_progress: 'in-progress',
  released: 'released',
  held: 'held',
  sold_out: 'sold-out',
  recalled: 'recalled',
  discarded: 'discarded',
};

/** Words for each state, as buttons and history lines say them. */
export const BATCH_STATE_LABELS: Record<BatchState, string> = {
  in_progress: 'In progress',
  released: 'Released',
  held: 'Held',
  sold_out: 'Sold out',
  recalled: 'Recalled',
  discarded: 'Discarded',
};

/** A batch state as word + icon + colour. */
export function BatchStateBadge({ state }: { state: BatchState }) {
  return <StatusBadge status={STATUS[state]} label={BATCH_STATE_LABELS[state]} />;
}
