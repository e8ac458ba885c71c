import { describe, expect, test } from 'vitest';
import { createChainVerifier, GENESIS_HASH, hashEntry, verifyChain, type ChainEntry } from '../../../../shared/domain/record-chain';

function chain(n: number): (ChainEntry & { hash: string })[] {
  const out: (ChainEntry & { hash: string })[] = [];
  let prev = GENESIS_HASH;
  for (let seq = 1; seq <= n; seq++) {
    const e: ChainEntry = {
      businessId: 'b1', seq, actorUserId: null, actorName: 'Maren Holt', actorRole: 'owner', entityType: 'note', entityId: `n${seq}`, action: 'create',
      payload: { seq }, reason: null, occurredAt: '2026-03-08T08:30:00.000Z', recordedAt: '2026-03-08T08:30:00.000Z', idempotencyKey: null, prevHash: prev,
    };
    const hash = hashEntry(e);
    out.push({ ...e, hash });
    prev = hash;
  }
  return out;
}

describe('createChainVerifier', () => {
  test('fed in pages it gives the same verdict as verifyChain', () => {
    const entries = chain(25);
    const v = createChainVerifier();
    for (let i = 0; i < entries.length; i += 7) for (const e of entries.slice(i, i + 7)) v.push(e);
    expect(v.result()).toEqual(verifyChain(entries));
    expect(v.result()).toMatchObject({ ok: true, count: 25, headSeq: 25, headHash: entries[24]!.hash });
  });

  test('names the first bad entry, keeps counting, and reports the last good head', () => {
    const entries = chain(10);
    entries[3] = { ...entries[3]!, payload: { seq: 'forged' } };
    const v = createChainVerifier();
    const answers = entries.map((e) => v.push(e));
    expect(answers.indexOf(false)).toBe(3);
    expect(v.result()).toEqual({ ok: false, count: 10, firstBadSeq: 4, problem: 'hash_mismatch', headHash: entries[2]!.hash });
    expect(verifyChain(entries)).toEqual(v.result());
  });

  test('a missing entry is a gap at the expected number', () => {
    const entries = chain(6).filter((e) => e.seq !== 5);
    expect(verifyChain(entries)).toMatchObject({ ok: false, firstBadSeq: 5, problem: 'gap_in_sequence', count: 5 });
  });
});
