/**
 * One use of an input by a batch: a supplier lot or another batch went into `toBatchId`.
 * Exactly one of fromSupplierLotId / fromBatchId is set.
 */
export type TraceEdge =
  | { fromSupplierLotId: string; fromBatchId?: undefined; toBatchId: string }
  | { fromBatchId: string; fromSupplierLotId?: undefined; toBatchId: string };

function walk(start: Iterable<string>, next: (id: string) => Iterable<string>): Set<string> {
  const seen = new Set<string>();
  const queue = [...start];
  while (queue.length > 0) {
    const id = queue.pop()!;
    if (seen.has(id)) continue; // a cycle in bad data cannot loop forever
    seen.add(id);
    queue.push(...next(id));
  }
  return seen;
}

function index(edges: readonly TraceEdge[], key: (e: TraceEdge) => string | undefined, value: (e: TraceEdge) => string | undefined) {
  const map = new Map<string, string[]>();
  for (const e of edges) {
    const k = key(e);
    const v = value(e);
    if (k === undefined || v === undefined) continue;
    const list = map.get(k);
    if (list) list.push(v);
    else map.set(k, [v]);
  }
  return (id: string) => map.get(id) ?? [];
}

/** Batches that used `batchId` directly, for walking forward. */
const batchUsers = (edges: readonly TraceEdge[]) => index(edges, (e) => e.fromBatchId, (e) => e.toBatchId);

/**
 * Every batch that contains the supplier lot, directly or through batches made from batches
 * (e.g. a frosting used in cake pops). Sorted ids; safe on cyclic data.
 */
export function batchesDownstreamOfSupplierLot(edges: readonly TraceEdge[], supplierLotId: string): string[] {
  const direct = edges.filter((e) => e.fromSupplierLotId === supplierLotId).map((e) => e.toBatchId);
  return [...walk(direct, batchUsers(edges))].sort();
}

/** Every batch made using `batchId`, directly or through other batches (not the batch itself). Sorted ids. */
export function batchesDownstreamOfBatch(edges: readonly TraceEdge[], batchId: string): string[] {
  const found = walk(batchUsers(edges)(batchId), batchUsers(edges));
  found.delete(batchId);
  return [...found].sort();
}

/** Every supplier lot that went into `batchId`, directly or through the batches it used. Sorted ids. */
export function supplierLotsUpstreamOfBatch(edges: readonly TraceEdge[], batchId: string): string[] {
  const batchInputs = index(edges, (e) => e.toBatchId, (e) => e.fromBatchId);
  const lotInputs = index(edges, (e) => e.toBatchId, (e) => e.fromSupplierLotId);
  const batches = walk([batchId], batchInputs);
  return [...new Set([...batches].flatMap(lotInputs))].sort();
}
