import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { batchesUpstreamOfBatch } from '../../../../shared/domain/trace-upstream';
import { batchesDownstreamOfBatch, type TraceEdge } from '../../../../shared/domain/trace';

describe('batchesUpstreamOfBatch', () => {
  test('finds batches through in-between batches, not lots or the batch itself', () => {
    const edges: TraceEdge[] = [
      { fromSupplierLotId: 'lot', toBatchId: 'base' },
      { fromBatchId: 'base', toBatchId: 'frosting' },
      { fromBatchId: 'frosting', toBatchId: 'pops' },
      { fromBatchId: 'other', toBatchId: 'unrelated' },
    ];
    expect(batchesUpstreamOfBatch(edges, 'pops')).toEqual(['base', 'frosting']);
    expect(batchesUpstreamOfBatch(edges, 'base')).toEqual([]);
  });

  test('stops on a cycle in bad data', () => {
    const edges: TraceEdge[] = [{ fromBatchId: 'a', toBatchId: 'b' }, { fromBatchId: 'b', toBatchId: 'a' }];
    expect(batchesUpstreamOfBatch(edges, 'a')).toEqual(['b']);
  });

  test('is the mirror of batchesDownstreamOfBatch on random graphs', () => {
    const ids = ['a', 'b', 'c', 'd', 'e', 'f'];
    fc.assert(fc.property(fc.array(fc.tuple(fc.constantFrom(...ids), fc.constantFrom(...ids))), (pairs) => {
      const edges: TraceEdge[] = pairs.map(([f, t]) => ({ fromBatchId: f, toBatchId: t }));
      for (const x of ids) for (const y of ids) {
        if (x === y) continue;
        expect(batchesUpstreamOfBatch(edges, y).includes(x)).toBe(batchesDownstreamOfBatch(edges, x).includes(y));
      }
    }));
  });
});
