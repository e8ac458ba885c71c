import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import {
  CustomerSchema, SaleSchema, SalesCapViewSchema, SalesPageSchema,
  type CreateSaleInput, type ListSalesQuery, type UpdateCustomerInput, type VoidSaleInput,
} from '@shared/contracts/sales';
import { BatchPageSchema } from '@shared/contracts/batches';

export type SalesFilters = Partial<Pick<ListSalesQuery, 'from' | 'to' | 'channel' | 'batchId'>>;

export const salesQueries = {
  all: () => ['sales'] as const,
  list: (q: SalesFilters) => queryOptions({ queryKey: [...salesQueries.all(), 'list', q], queryFn: ({ signal }) => api.get('/api/sales', SalesPageSchema, { params: q, signal }) }),
  cap: () => queryOptions({ queryKey: [...salesQueries.all(), 'cap'], queryFn: ({ signal }) => api.get('/api/sales/cap', SalesCapViewSchema, { signal }) }),
  customers: () => queryOptions({ queryKey: [...salesQueries.all(), 'customers'], queryFn: ({ signal }) => api.get('/api/customers', z.object({ items: z.array(CustomerSchema) }), { signal }) }),
  /** Batches that can be sold (released or sold out), for the batch picker. */
  sellable: () =>
    queryOptions({
      queryKey: [...salesQueries.all(), 'sellable'],
      queryFn: async ({ signal }) => {
        const [released, soldOut] = await Promise.all(['released', 'sold_out'].map((state) => api.get('/api/batches', BatchPageSchema, { params: { state, pageSize: 100 }, signal })));
        return [...released!.items, ...soldOut!.items];
      },
    }),
};

function useSalesWrite<I, O>(send: (input: I) => Promise<O>) {
  const qc = useQueryClient();
  return useMutation({ mutationFn: send, onSuccess: () => qc.invalidateQueries({ queryKey: salesQueries.all() }) });
}

export const useCreateSale = () => useSalesWrite((input: CreateSaleInput) => api.post('/api/sales', SaleSchema, input));
export const useVoidSale = () => useSalesWrite(({ id, ...input }: VoidSaleInput & { id: string }) => api.post(`/api/sales/${id}/void`, SaleSchema, input));
export const useUpdateConsent = () => useSalesWrite(({ id, ...input }: UpdateCustomerInput & { id: string }) => api.patch(`/api/customers/${id}`, CustomerSchema, input));
export const useEraseCustomer = () => useSalesWrite((id: string) => api.delete(`/api/customers/${id}`, null));

/** '12.50' → 1250; anything that is not dollars and at most two cents digits → NaN (the form shows why). */
export function dollarsToCents(text: string): number {
  const m = /^\s*\$?(\d{1,7})(?:\.(\d{1,2}))?\s*$/.exec(text);
  if (!m) return Number.NaN;
  return Number(m[1]) * 100 + Number((m[2] ?? '0').padEnd(2, '0'));
}

export const CHANNEL_LABELS: Record<string, string> = { direct: 'Direct (in person)', event: 'Event or market', online: 'Online order', wholesale: 'Wholesale' };
