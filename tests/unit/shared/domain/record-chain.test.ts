import { describe, expect, test } from 'vitest';
import { createHash } from 'node:crypto';
import { canonicalJson, GENESIS_HASH, hashEntry, sha256Hex, verifyChain, type ChainEntry } from '../../../../shared/domain/record-chain';

describe('sha256Hex', () => {
  // FIPS 180-4 / NIST CSRC example values for SHA-256.
  test.each([
    ['', 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855'],
    ['abc', 'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad'],
    ['abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq', '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1'],
  ])('SHA-256(%j) is the published digest', (input, digest) => {
    expect(sha256Hex(input)).toBe(digest);
  });
  test('agrees with Node crypto on non-ASCII text', () => {
    const text = 'Crème brûlée – 12 °C';
    expect(sha256Hex(text)).toBe(createHash('sha256').update(text, 'utf8').digest('hex'));
  });
});

describe('canonicalJson', () => {
  test('when keys come in another order, then the bytes are the same', () => {
    expect(canonicalJson({ b: 1, a: { d: [1, 'x'], c: null } })).toBe(canonicalJson({ a: { c: null, d: [1, 'x'] }, b: 1 }));
    expect(canonicalJson({ b: 1, a: 2, u: undefined })).toBe('{"a":2,"b":1}');
  });
});

function chainOf(n: number): Array<ChainEntry & { hash: string }> {
  const out: Array<ChainEntry & { hash: string }> = [];
  let prev = GENESIS_HASH;
  for (let i = 1; i <= n; i++) {
    const e: ChainEntry = {
      businessId: '00000000-0000-4000-8000-000000000001', seq: i, actorUserId: null, actorName: 'Test', actorRole: 'owner',
      entityType: 'batch', entityId: `b${i}`, action: 'create', payload: { n: i }, reason: null,
      occurredAt: '2026-01-01T10:00:00.000Z', recordedAt: '2026-01-01T10:00:00.000Z', idempotencyKey: null, prevHash: prev,
    };
    const hash = hashEntry(e);
    // Hand-computed with Node's crypto as the independent reference.
    expect(hash).toBe(createHash('sha256').update(canonicalJson(e)).digest('hex'));
    out.push({ ...e, hash });
    prev = hash;
  }
  return out;
}

describe('verifyChain', () => {
  test('an intact chain verifies and reports its head', () => {
    const chain = chainOf(5);
    expect(verifyChain(chain)).toEqual({ ok: true, count: 5, headSeq: 5, headHash: chain[4]!.hash });
  });
  test('an edited payload is reported at that entry', () => {
    const chain = chainOf(5);
    chain[2] = { ...chain[2]!, payload: { n: 99 } };
    expect(verifyChain(chain)).toMatchObject({ ok: false, firstBadSeq: 3, problem: 'hash_mismatch' });
  });
  test('a deleted entry is reported as a gap', () => {
    const chain = chainOf(5);
    chain.splice(1, 1);
    expect(verifyChain(chain)).toMatchObject({ ok: false, firstBadSeq: 2, problem: 'gap_in_sequence' });
  });
  test('two swapped entries are reported', () => {
    const chain = chainOf(4);
    const a = chain[1]!, b = chain[2]!;
    chain[1] = { ...b, seq: 2 }; chain[2] = { ...a, seq: 3 };
    expect(verifyChain(chain)).toMatchObject({ ok: false, firstBadSeq: 2 });
  });
});
