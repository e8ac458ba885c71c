import type { TraceEdge } from './trace';

/**
 * Every batch that went into `batchId`, directly or through other batches (e.g. the frosting batch in
 * a cake-pop batch), not the batch itself. Sorted ids; safe on cyclic data.
 */
export function batchesUpstreamOfBatch(edges: readonly TraceEdge[], batchId: string): string[] {
  const inputs = new Map<string, string[]>();
  for (const e of edges) if (e.fromBatchId !== undefined) inputs.set(e.toBatchId, [...(inputs.get(e.toBatchId) ?? []), e.fromBatchId]);
  const seen = new Set<string>();
  const queue = [...(inputs.get(batchId) ?? [])];
  while (queue.length > 0) {
    const id = queue.pop()!;
    if (seen.has(id)) continue;
    seen.add(id);
    queue.push(...(inputs.get(id) ?? []));
  }
  seen.delete(batchId);
  return [...seen].sort();
}
