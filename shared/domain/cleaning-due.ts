import { parseInstant } from './zoned-time';

/**
 * FDA Food Code 2022 4-602.11(C): food-contact surfaces and utensils in use with TCS food are cleaned
 * throughout the day at least every 4 hours. (Also clean before first use, on changing from raw to
 * ready-to-eat food and after contamination, 4-602.11(A); those are events, not a clock.)
 */
export const CLEANING_INTERVAL_MS = 4 * 3_600_000;

/** 'due_soon' starts this long before the 4-hour mark (our choice, as for holding times). */
export const CLEANING_DUE_SOON_MS = 30 * 60_000;

/**
 * - 'not_in_use': nothing to time.
 * - 'ok': in use and cleaned within the interval.
 * - 'due_soon': 30 minutes or less left.
 * - 'overdue': the 4 hours have passed, or the item is in use with no cleaning on record.
 */
export type CleaningDueStatus = 'not_in_use' | 'ok' | 'due_soon' | 'overdue';

/** One equipment item's state; instants are ISO 8601 with offset. */
export interface CleaningItemState {
  equipmentId: string;
  /** Null when the item is not in use. */
  inUseSince: string | null;
  /** The last completed cleaning, or null when none is recorded. */
  lastCleanedAt: string | null;
}

/** When the item must next be cleaned. */
export interface CleaningDue {
  equipmentId: string;
  status: CleaningDueStatus;
  nextDueAt: string | null;
  /** nextDueAt minus now; negative when overdue; null when not in use. */
  remainingMs: number | null;
}

/**
 * When an item in use must next be cleaned: 4 hours after the later of its last cleaning and the
 * start of use (a surface cleaned and then left unused starts its clock when use begins). An item in
 * use with no cleaning recorded is overdue from the moment use began.
 */
export function cleaningDue(item: CleaningItemState, now: string): CleaningDue {
  const nowMs = parseInstant(now).getTime();
  if (!item.inUseSince) return { equipmentId: item.equipmentId, status: 'not_in_use', nextDueAt: null, remainingMs: null };
  const inUse = parseInstant(item.inUseSince).getTime();
  const cleaned = item.lastCleanedAt ? parseInstant(item.lastCleanedAt).getTime() : null;
  const due = cleaned === null ? inUse : Math.max(cleaned, inUse) + CLEANING_INTERVAL_MS;
  const remainingMs = due - nowMs;
  const status: CleaningDueStatus = remainingMs <= 0 ? 'overdue' : remainingMs <= CLEANING_DUE_SOON_MS ? 'due_soon' : 'ok';
  return { equipmentId: item.equipmentId, status, nextDueAt: new Date(due).toISOString(), remainingMs };
}

/** cleaningDue for every item, soonest first (items not in use last). */
export function cleaningDueForAll(items: readonly CleaningItemState[], now: string): CleaningDue[] {
  return items
    .map((i) => cleaningDue(i, now))
    .sort((a, b) => (a.remainingMs ?? Number.POSITIVE_INFINITY) - (b.remainingMs ?? Number.POSITIVE_INFINITY) || a.equipmentId.localeCompare(b.equipmentId));
}
