import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import {
  BatchDetailSchema,
  BatchPageSchema,
  BatchRecipeOptionsSchema,
  LotCandidatesSchema,
  type BatchDetail,
  type ChangeBatchStateInput,
  type CorrectBatchInput,
  type CreateBatchInput,
  type ListBatchesQuery,
} from '@shared/contracts/batches';

export type BatchListFilters = Partial<Pick<ListBatchesQuery, 'state' | 'recipeId' | 'from' | 'to' | 'page'>>;

export const batchQueries = {
  all: () => ['batches'] as const,
  lists: () => [...batchQueries.all(), 'list'] as const,
  list: (q: BatchListFilters) => queryOptions({ queryKey: [...batchQueries.lists(), q], queryFn: ({ signal }) => api.get('/api/batches', BatchPageSchema, { params: q, signal }) }),
  detail: (id: string) => queryOptions({ queryKey: [...batchQueries.all(), 'detail', id], queryFn: ({ signal }) => api.get(`/api/batches/${id}`, BatchDetailSchema, { signal }) }),
  recipeOptions: () => queryOptions({ queryKey: [...batchQueries.all(), 'recipe-options'], queryFn: ({ signal }) => api.get('/api/batches/recipe-options', BatchRecipeOptionsSchema, { signal }) }),
  lotCandidates: (recipeVersionId: string) =>
    queryOptions({ queryKey: [...batchQueries.all(), 'lot-candidates', recipeVersionId], queryFn: ({ signal }) => api.get('/api/batches/lot-candidates', LotCandidatesSchema, { params: { recipeVersionId }, signal }) }),
};

/** A fresh key per form submission attempt series, so a retried request never makes a second record. */
export function newIdempotencyKey(): string {
  return crypto.randomUUID();
}

function useBatchWrite<I>(send: (input: I) => Promise<BatchDetail>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: send,
    onSuccess: async (batch) => {
      qc.setQueryData(batchQueries.detail(batch.id).queryKey, batch);
      await qc.invalidateQueries({ queryKey: batchQueries.lists() });
    },
  });
}

const keyed = (key: string) => ({ headers: { 'Idempotency-Key': key } });

export const useCreateBatch = () =>
  useBatchWrite(({ key, ...input }: CreateBatchInput & { key: string }) => api.post('/api/batches', BatchDetailSchema, input, keyed(key)));
export const useCorrectBatch = () =>
  useBatchWrite(({ id, key, ...input }: CorrectBatchInput & { id: string; key: string }) => api.post(`/api/batches/${id}/versions`, BatchDetailSchema, input, keyed(key)));
export const useChangeBatchState = () =>
  useBatchWrite(({ id, key, ...input }: ChangeBatchStateInput & { id: string; key: string }) => api.post(`/api/batches/${id}/state`, BatchDetailSchema, input, keyed(key)));
