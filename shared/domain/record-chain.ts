import { sha256 } from '@noble/hashes/sha2.js';
import { bytesToHex, utf8ToBytes } from '@noble/hashes/utils.js';

/** The first entry of every business's chain points at this. */
export const GENESIS_HASH = '0'.repeat(64);

/** The fields of a journal entry that the hash covers (everything but the hash itself). */
export interface ChainEntry {
  businessId: string;
  seq: number;
  actorUserId: string | null;
  actorName: string;
  actorRole: string;
  entityType: string;
  entityId: string;
  action: string;
  payload: unknown;
  reason: string | null;
  occurredAt: string;
  recordedAt: string;
  idempotencyKey: string | null;
  prevHash: string;
}

/**
 * Canonical JSON: object keys sorted, no whitespace, undefined dropped, so the same content always
 * gives the same bytes whatever order PostgreSQL's jsonb hands the keys back in.
 */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') {
    if (typeof value === 'number' && !Number.isFinite(value)) throw new Error('Numbers in records must be finite');
    return JSON.stringify(value) ?? 'null';
  }
  if (Array.isArray(value)) return `[${value.map((v) => (v === undefined ? 'null' : canonicalJson(v))).join(',')}]`;
  const keys = Object.keys(value as Record<string, unknown>)
    .filter((k) => (value as Record<string, unknown>)[k] !== undefined)
    .sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson((value as Record<string, unknown>)[k])}`).join(',')}}`;
}

/** Hex SHA-256 of a UTF-8 string (FIPS 180-4). */
export function sha256Hex(text: string): string {
  return bytesToHex(sha256(utf8ToBytes(text)));
}

/** This entry's hash: SHA-256 over the canonical serialisation, which includes the previous hash. */
export function hashEntry(entry: ChainEntry): string {
  return sha256Hex(canonicalJson(entry));
}

export type ChainVerdict =
  | { ok: true; count: number; headHash: string; headSeq: number }
  | { ok: false; count: number; firstBadSeq: number; problem: 'hash_mismatch' | 'broken_link' | 'gap_in_sequence'; headHash: string };

/** Checks entries one at a time in seq order, so a long chain can be verified page by page. */
export interface ChainVerifier {
  /** Feeds the next entry; returns false once the chain is broken (later entries are ignored). */
  push(entry: ChainEntry & { hash: string }): boolean;
  result(): ChainVerdict;
}

/** A verifier that names the first entry that does not verify; `verifyChain` is the one-shot form. */
export function createChainVerifier(): ChainVerifier {
  let prev = GENESIS_HASH;
  let expectedSeq = 1;
  let count = 0;
  let broken: { firstBadSeq: number; problem: 'hash_mismatch' | 'broken_link' | 'gap_in_sequence'; headHash: string } | null = null;
  return {
    push(e) {
      count += 1;
      if (broken) return false;
      const { hash, ...rest } = e;
      if (e.seq !== expectedSeq) broken = { firstBadSeq: expectedSeq, problem: 'gap_in_sequence', headHash: prev };
      else if (e.prevHash !== prev) broken = { firstBadSeq: e.seq, problem: 'broken_link', headHash: prev };
      else if (hashEntry(rest) !== hash) broken = { firstBadSeq: e.seq, problem: 'hash_mismatch', headHash: prev };
      if (broken) return false;
      prev = hash;
      expectedSeq += 1;
      return true;
    },
    result() {
      return broken ? { ok: false, count, ...broken } : { ok: true, count, headHash: prev, headSeq: expectedSeq - 1 };
    },
  };
}

/** Walks one business's entries in seq order and names the first entry that does not verify. */
export function verifyChain(entries: ReadonlyArray<ChainEntry & { hash: string }>): ChainVerdict {
  const verifier = createChainVerifier();
  for (const e of entries) if (!verifier.push(e)) break;
  const verdict = verifier.result();
  return { ...verdict, count: entries.length };
}
