import argon2 from 'argon2';

// OWASP Password Storage: argon2id with m >= 19 MiB, t >= 2, p >= 1. Raising these makes
// needsRehash true for older hashes, which sign-in then upgrades.
export interface HashParams { memoryCost: number; timeCost: number; parallelism: number }
export const DEFAULT_HASH_PARAMS: HashParams = { memoryCost: 19_456, timeCost: 2, parallelism: 1 };

export function hashPassword(password: string, params: HashParams = DEFAULT_HASH_PARAMS): Promise<string> {
  return argon2.hash(password, { type: argon2.argon2id, ...params });
}

export async function verifyPassword(hash: string, password: string): Promise<boolean> {
  try {
    return await argon2.verify(hash, password);
  } catch {
    return false;
  }
}

export function needsRehash(hash: string, params: HashParams = DEFAULT_HASH_PARAMS): boolean {
  return argon2.needsRehash(hash, { ...params });
}

// Verified against when the e-mail is unknown, so both failures take the same time.
let dummyHash: Promise<string> | undefined;
export function dummyPasswordHash(): Promise<string> {
  dummyHash ??= hashPassword('not-a-real-password-for-timing');
  return dummyHash;
}
