import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import {
  RecallDetailSchema, RecallSummarySchema, TraceOptionsSchema, TraceResultSchema,
  type CloseRecallInput, type OpenRecallInput, type PhoneNoticeInput, type TraceQuery,
} from '@shared/contracts/trace';

export const traceQueries = {
  all: () => ['trace'] as const,
  options: () => queryOptions({ queryKey: [...traceQueries.all(), 'options'], queryFn: ({ signal }) => api.get('/api/trace/options', TraceOptionsSchema, { signal }) }),
  trace: (q: TraceQuery) => queryOptions({ queryKey: [...traceQueries.all(), 'result', q], queryFn: ({ signal }) => api.get('/api/trace', TraceResultSchema, { params: q, signal }) }),
  recalls: () => queryOptions({ queryKey: [...traceQueries.all(), 'recalls'], queryFn: ({ signal }) => api.get('/api/recalls', z.object({ items: z.array(RecallSummarySchema) }), { signal }) }),
  recall: (id: string) => queryOptions({ queryKey: [...traceQueries.all(), 'recall', id], queryFn: ({ signal }) => api.get(`/api/recalls/${id}`, RecallDetailSchema, { signal }) }),
};

function useRecallWrite<I>(send: (input: I) => Promise<z.infer<typeof RecallDetailSchema>>) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: send,
    onSuccess: async (r) => {
      qc.setQueryData(traceQueries.recall(r.id).queryKey, r);
      // Batch states and sales pickers change with a recall.
      await Promise.all([qc.invalidateQueries({ queryKey: traceQueries.all() }), qc.invalidateQueries({ queryKey: ['batches'] }), qc.invalidateQueries({ queryKey: ['sales'] })]);
    },
  });
}

export const useOpenRecall = () => useRecallWrite((input: OpenRecallInput) => api.post('/api/recalls', RecallDetailSchema, input));
export const useCloseRecall = () => useRecallWrite(({ id, ...input }: CloseRecallInput & { id: string }) => api.post(`/api/recalls/${id}/close`, RecallDetailSchema, input));
export const useToldByPhone = () =>
  useRecallWrite(({ id, customerId, ...input }: PhoneNoticeInput & { id: string; customerId: string }) => api.post(`/api/recalls/${id}/customers/${customerId}/phone`, RecallDetailSchema, input));
