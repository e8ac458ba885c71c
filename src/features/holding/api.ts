import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { KitchenBoardSchema } from '@shared/contracts/kitchen-board';
import {
  HoldingPeriodListSchema,
  HoldingPeriodResponseSchema,
  type AddReadingInput,
  type RecordHoldingActionInput,
  type StartHoldingInput,
} from '@shared/contracts/holding';

export const holdingQueries = {
  all: () => ['holding'] as const,
  /**
   * The kitchen board, re-fetched every 15 s; the countdowns tick locally in between. Marked as background polling
   * so a board left open does not keep a member signed in.
   */
  board: () =>
    queryOptions({
      queryKey: [...holdingQueries.all(), 'board'],
      queryFn: ({ signal }) => api.get('/api/kitchen-board', KitchenBoardSchema, { signal, headers: { 'X-Background-Refresh': '1' } }),
      refetchInterval: 15_000,
      refetchIntervalInBackground: false,
    }),
  forBatch: (batchId: string) =>
    queryOptions({
      queryKey: [...holdingQueries.all(), 'batch', batchId],
      queryFn: ({ signal }) => api.get('/api/holding-periods', HoldingPeriodListSchema, { signal, params: { state: 'all', batchId } }),
      refetchInterval: 15_000,
    }),
};

/** A random Idempotency-Key (getRandomValues also works on a plain-http kitchen network, unlike randomUUID). */
function newKey(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
}

function useHoldingWrite<I>(send: (input: I, key: string) => Promise<unknown>) {
  const qc = useQueryClient();
  const mutation = useMutation({
    mutationFn: ({ input, key }: { input: I; key: string }) => send(input, key),
    // Retries reuse the tap's key, so a flaky connection never records a reading twice.
    retry: (count, err) => count < 2 && (err as { status?: number }).status === 0,
    onSettled: () => qc.invalidateQueries({ queryKey: holdingQueries.all() }),
  });
  /** One tap = one key. */
  const run = (input: I) => mutation.mutateAsync({ input, key: newKey() });
  return { ...mutation, run };
}

const keyed = (key: string) => ({ headers: { 'Idempotency-Key': key } });

export const useStartHolding = () =>
  useHoldingWrite((input: StartHoldingInput, key) => api.post('/api/holding-periods', HoldingPeriodResponseSchema, input, keyed(key)));
export const useAddReading = () =>
  useHoldingWrite(({ periodId, ...input }: AddReadingInput & { periodId: string }, key) =>
    api.post(`/api/holding-periods/${periodId}/readings`, HoldingPeriodResponseSchema, input, keyed(key)));
export const useStopHolding = () =>
  useHoldingWrite(({ periodId }: { periodId: string }, key) => api.post(`/api/holding-periods/${periodId}/stop`, HoldingPeriodResponseSchema, {}, keyed(key)));
export const useRecordHoldingAction = () =>
  useHoldingWrite(({ periodId, ...input }: RecordHoldingActionInput & { periodId: string }, key) =>
    api.post(`/api/holding-periods/${periodId}/actions`, HoldingPeriodResponseSchema, input, keyed(key)));
