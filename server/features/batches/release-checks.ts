import type { DbOrTx } from '../../db/client';

/** A reason a batch may not be released yet, e.g. a holding-time violation with no recorded action. */
export interface ReleaseBlocker {
  code: string;
  message: string;
}

/** Called inside the release transaction; answers [] when it has no objection. */
export type ReleaseCheck = (db: DbOrTx, businessId: string, batchId: string) => Promise<ReleaseBlocker[]>;

const checks: ReleaseCheck[] = [];

/** Other features add a checker at module load (e.g. holding: violations without a corrective action). */
export function registerReleaseCheck(check: ReleaseCheck): void {
  if (!checks.includes(check)) checks.push(check);
}

/** Everything that blocks releasing the batch now, from every registered checker. */
export async function releaseBlockers(db: DbOrTx, businessId: string, batchId: string): Promise<ReleaseBlocker[]> {
  const out: ReleaseBlocker[] = [];
  for (const check of checks) out.push(...(await check(db, businessId, batchId)));
  return out;
}

/** For tests: removes a checker registered earlier. */
export function unregisterReleaseCheck(check: ReleaseCheck): void {
  const i = checks.indexOf(check);
  if (i >= 0) checks.splice(i, 1);
}
