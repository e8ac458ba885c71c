import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import {
  batchesDownstreamOfBatch,
  batchesDownstreamOfSupplierLot,
  supplierLotsUpstreamOfBatch,
  type TraceEdge,
} from '../../../../shared/domain/trace';

// An invented kitchen: flour lot L1 goes into sponge B1; sponge and frosting B2 (butter lot L2) go into
// cake pops B3; L1 also goes straight into cookies B4.
const KITCHEN: TraceEdge[] = [
  { fromSupplierLotId: 'L1', toBatchId: 'B1' },
  { fromSupplierLotId: 'L2', toBatchId: 'B2' },
  { fromBatchId: 'B1', toBatchId: 'B3' },
  { fromBatchId: 'B2', toBatchId: 'B3' },
  { fromSupplierLotId: 'L1', toBatchId: 'B4' },
  { fromSupplierLotId: 'L3', toBatchId: 'B5' },
];

describe('worked example (hand-traced)', () => {
  test.each([
    ['L1', ['B1', 'B3', 'B4']],
    ['L2', ['B2', 'B3']],
    ['L3', ['B5']],
    ['L9', []],
  ])('lot %s reaches %j', (lot, batches) => {
    expect(batchesDownstreamOfSupplierLot(KITCHEN, lot)).toEqual(batches);
  });
  test.each([
    ['B3', ['L1', 'L2']],
    ['B4', ['L1']],
    ['B1', ['L1']],
    ['B9', []],
  ])('batch %s came from %j', (batch, lots) => {
    expect(supplierLotsUpstreamOfBatch(KITCHEN, batch)).toEqual(lots);
  });
  test('a recalled batch reaches the batches made from it', () => {
    expect(batchesDownstreamOfBatch(KITCHEN, 'B1')).toEqual(['B3']);
    expect(batchesDownstreamOfBatch(KITCHEN, 'B3')).toEqual([]);
  });
  test('a cycle in bad data ends', () => {
    const cyclic: TraceEdge[] = [...KITCHEN, { fromBatchId: 'B3', toBatchId: 'B1' }];
    expect(batchesDownstreamOfSupplierLot(cyclic, 'L1')).toEqual(['B1', 'B3', 'B4']);
    expect(supplierLotsUpstreamOfBatch(cyclic, 'B1')).toEqual(['L1', 'L2']);
    expect(batchesDownstreamOfBatch(cyclic, 'B1')).toEqual(['B3']);
  });
});

// Generated graphs (cycles allowed) against an independent oracle: a fixed-point closure, which
// repeatedly adds any batch that used something already in the set until nothing changes.
const graph = fc
  .record({ lots: fc.integer({ min: 1, max: 4 }), batches: fc.integer({ min: 1, max: 10 }) })
  .chain(({ lots, batches }) =>
    fc.record({
      lots: fc.constant(lots),
      batches: fc.constant(batches),
      edges: fc.array(
        fc.oneof(
          fc.record({ lot: fc.integer({ min: 0, max: lots - 1 }), to: fc.integer({ min: 0, max: batches - 1 }) }).map(({ lot, to }): TraceEdge => ({ fromSupplierLotId: `L${lot}`, toBatchId: `B${to}` })),
          fc.record({ from: fc.integer({ min: 0, max: batches - 1 }), to: fc.integer({ min: 0, max: batches - 1 }) }).map(({ from, to }): TraceEdge => ({ fromBatchId: `B${from}`, toBatchId: `B${to}` })),
        ),
        { maxLength: 30 },
      ),
    }),
  );

function oracleDownstream(edges: TraceEdge[], lot: string): string[] {
  const found = new Set<string>();
  let changed = true;
  while (changed) {
    changed = false;
    for (const e of edges) {
      const uses = e.fromSupplierLotId === lot || (e.fromBatchId !== undefined && found.has(e.fromBatchId));
      if (uses && !found.has(e.toBatchId)) {
        found.add(e.toBatchId);
        changed = true;
      }
    }
  }
  return [...found].sort();
}

describe('property: downstream is exactly the batches that used the lot, through any chain', () => {
  test('every batch that used the lot is found, and no other', () => {
    fc.assert(
      fc.property(graph, ({ lots, edges }) => {
        for (let l = 0; l < lots; l++) {
          expect(batchesDownstreamOfSupplierLot(edges, `L${l}`)).toEqual(oracleDownstream(edges, `L${l}`));
        }
      }),
      { numRuns: 500 },
    );
  });

  test('backward and forward agree: lot L reaches batch B exactly when B traces back to L', () => {
    fc.assert(
      fc.property(graph, ({ lots, batches, edges }) => {
        for (let b = 0; b < batches; b++) {
          const upstream = supplierLotsUpstreamOfBatch(edges, `B${b}`);
          for (let l = 0; l < lots; l++) {
            expect(upstream.includes(`L${l}`)).toBe(batchesDownstreamOfSupplierLot(edges, `L${l}`).includes(`B${b}`));
          }
        }
      }),
      { numRuns: 300 },
    );
  });
});
