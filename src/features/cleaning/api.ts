import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import {
  CleaningDueListSchema, CleaningRunListSchema, CleaningRunSchema, CleaningSignerListSchema, CleaningTemplateSchema, EquipmentSchema,
  SanitiserProductSchema, type AddCleaningStepInput, type CleaningTemplateInput, type CleaningTemplateUpdate, type CorrectCleaningRunInput,
  type EquipmentInput, type EquipmentUpdate, type SanitiserProductInput, type SignCleaningRunInput, type StartCleaningRunInput,
} from '@shared/contracts/cleaning';

export const cleaningQueries = {
  all: () => ['cleaning'] as const,
  runs: (date?: string) =>
    queryOptions({
      queryKey: [...cleaningQueries.all(), 'runs', date ?? 'today'],
      queryFn: ({ signal }) => api.get('/api/cleaning-runs', CleaningRunListSchema, { signal, params: { date } }),
    }),
  forBatch: (batchId: string) =>
    queryOptions({
      queryKey: [...cleaningQueries.all(), 'batch', batchId],
      queryFn: ({ signal }) => api.get('/api/cleaning-runs', CleaningRunListSchema, { signal, params: { batchId } }),
    }),
  due: () =>
    queryOptions({
      queryKey: [...cleaningQueries.all(), 'due'],
      queryFn: ({ signal }) => api.get('/api/cleaning-runs/due', CleaningDueListSchema, { signal }),
      refetchInterval: 60_000,
    }),
  templates: () => queryOptions({ queryKey: [...cleaningQueries.all(), 'templates'], queryFn: ({ signal }) => api.get('/api/cleaning-templates', z.array(CleaningTemplateSchema), { signal }) }),
  equipment: () => queryOptions({ queryKey: [...cleaningQueries.all(), 'equipment'], queryFn: ({ signal }) => api.get('/api/equipment', z.array(EquipmentSchema), { signal, params: { includeArchived: 'true' } }) }),
  products: () => queryOptions({ queryKey: [...cleaningQueries.all(), 'products'], queryFn: ({ signal }) => api.get('/api/sanitiser-products', z.array(SanitiserProductSchema), { signal }) }),
  signers: () => queryOptions({ queryKey: [...cleaningQueries.all(), 'signers'], queryFn: ({ signal }) => api.get('/api/cleaning-runs/signers', CleaningSignerListSchema, { signal }) }),
};

/** A random Idempotency-Key (getRandomValues also works on a plain-http kitchen network). */
function newKey(): string {
  return Array.from(crypto.getRandomValues(new Uint8Array(16)), (b) => b.toString(16).padStart(2, '0')).join('');
}

function useCleaningWrite<I, O>(send: (input: I, key: string) => Promise<O>) {
  const qc = useQueryClient();
  const mutation = useMutation({
    mutationFn: ({ input, key }: { input: I; key: string }) => send(input, key),
    // A retry reuses the tap's key, so a flaky connection never records a step or signature twice.
    retry: (count, err) => count < 2 && (err as { status?: number }).status === 0,
    onSettled: () => qc.invalidateQueries({ queryKey: cleaningQueries.all() }),
  });
  return { ...mutation, run: (input: I) => mutation.mutateAsync({ input, key: newKey() }) };
}

const keyed = (key: string) => ({ headers: { 'Idempotency-Key': key } });

export const useStartCleaningRun = () => useCleaningWrite((input: StartCleaningRunInput, key) => api.post('/api/cleaning-runs', CleaningRunSchema, input, keyed(key)));
export const useAddCleaningStep = () =>
  useCleaningWrite(({ runId, input }: { runId: string; input: AddCleaningStepInput }, key) => api.post(`/api/cleaning-runs/${runId}/steps`, CleaningRunSchema, input, keyed(key)));
export const useSignCleaningRun = () =>
  useCleaningWrite(({ runId, input }: { runId: string; input: SignCleaningRunInput }, key) => api.post(`/api/cleaning-runs/${runId}/signatures`, CleaningRunSchema, input, keyed(key)));
export const useCorrectCleaningRun = () =>
  useCleaningWrite(({ runId, input }: { runId: string; input: CorrectCleaningRunInput }, key) => api.post(`/api/cleaning-runs/${runId}/corrections`, CleaningRunSchema, input, keyed(key)));

export const useCreateEquipment = () => useCleaningWrite((input: EquipmentInput) => api.post('/api/equipment', EquipmentSchema, input));
export const useUpdateEquipment = () => useCleaningWrite(({ id, input }: { id: string; input: EquipmentUpdate }) => api.patch(`/api/equipment/${id}`, EquipmentSchema, input));
export const useCreateTemplate = () => useCleaningWrite((input: CleaningTemplateInput) => api.post('/api/cleaning-templates', CleaningTemplateSchema, input));
export const useUpdateTemplate = () => useCleaningWrite(({ id, input }: { id: string; input: CleaningTemplateUpdate }) => api.patch(`/api/cleaning-templates/${id}`, CleaningTemplateSchema, input));
export const useCreateProduct = () => useCleaningWrite((input: SanitiserProductInput) => api.post('/api/sanitiser-products', SanitiserProductSchema, input));
