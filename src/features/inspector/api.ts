import { queryOptions } from '@tanstack/react-query';
import { z } from 'zod';
import { api } from '@/lib/api-client';
import { InspectorRecordsSchema, InspectorSessionSchema } from '@shared/contracts/inspector';
import type { AllergenMatrix } from '@shared/contracts/recipes';

const shape = <T,>() => z.custom<T>((v) => typeof v === 'object' && v !== null);

// The inspector's read-only views. No retries on 4xx: a 401/410 means the link ended.
export const inspectorQueries = {
  session: () => queryOptions({ queryKey: ['inspector', 'session'], queryFn: ({ signal }) => api.get('/api/inspector/session', InspectorSessionSchema, { signal }), staleTime: 60_000 }),
  records: () => queryOptions({ queryKey: ['inspector', 'records'], queryFn: ({ signal }) => api.get('/api/inspector/records', InspectorRecordsSchema, { signal }), staleTime: 60_000 }),
  allergenMatrix: () => queryOptions({ queryKey: ['inspector', 'allergen-matrix'], queryFn: ({ signal }) => api.get('/api/inspector/allergen-matrix', shape<AllergenMatrix>(), { signal }), staleTime: 60_000 }),
};

export const inspectorDocumentUrl = (documentId: string, versionId: string) => `/api/inspector/documents/${documentId}/versions/${versionId}/download`;
