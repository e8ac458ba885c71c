import { addCalendarDays } from './calendar-date';

/** Life of a batch from mixing to its end. */
export const BATCH_STATES = ['in_progress', 'released', 'held', 'sold_out', 'recalled', 'discarded'] as const;

/** One of BATCH_STATES. */
export type BatchState = (typeof BATCH_STATES)[number];

/**
 * Allowed moves. Our rules:
 * - Only a released batch can be sold, so only released → sold_out.
 * - A batch still being made cannot be recalled (nothing has left the kitchen); hold or discard it.
 * - Held is a pause for a question (a temperature, a label): it ends in released, discarded or recalled.
 * - Recalled is reached from anything that may have reached customers (released, held, sold_out),
 *   and ends only in discarded once the stock is back; discarded is terminal.
 * - Staying in the same state is not a transition.
 */
export const BATCH_TRANSITIONS: Readonly<Record<BatchState, readonly BatchState[]>> = {
  in_progress: ['released', 'held', 'discarded'],
  released: ['sold_out', 'held', 'recalled', 'discarded'],
  held: ['released', 'discarded', 'recalled'],
  sold_out: ['recalled'],
  recalled: ['discarded'],
  discarded: [],
};

/** Moves into these states must carry a reason, because they are the evidence of a problem. */
export const STATES_NEEDING_REASON: readonly BatchState[] = ['held', 'recalled', 'discarded'];

const LABELS: Record<BatchState, string> = {
  in_progress: 'in progress',
  released: 'released',
  held: 'on hold',
  sold_out: 'sold out',
  recalled: 'recalled',
  discarded: 'discarded',
};

/** Result of assertTransition: either allowed, or a message to show the user. */
export type TransitionCheck = { ok: true; needsReason: boolean } | { ok: false; message: string };

/** True when a batch in `from` may move to `to`. */
export function canTransition(from: BatchState, to: BatchState): boolean {
  return BATCH_TRANSITIONS[from].includes(to);
}

/**
 * Checks a move and explains a refusal in words for the user, e.g. "A sold out batch can only be
 * recalled." When allowed, says whether the move needs a reason (STATES_NEEDING_REASON).
 */
export function assertTransition(from: BatchState, to: BatchState): TransitionCheck {
  if (canTransition(from, to)) return { ok: true, needsReason: STATES_NEEDING_REASON.includes(to) };
  if (from === to) return { ok: false, message: `This batch is already ${LABELS[from]}.` };
  const next = BATCH_TRANSITIONS[from];
  if (next.length === 0) return { ok: false, message: `A ${LABELS[from]} batch cannot be changed.` };
  const options = next.map((s) => LABELS[s]);
  const list = options.length === 1 ? options[0] : `${options.slice(0, -1).join(', ')} or ${options.at(-1)}`;
  return { ok: false, message: `A batch that is ${LABELS[from]} cannot be ${LABELS[to]}; it can only be ${list}.` };
}

/**
 * Best-by date: the day of making is day 0, so 'YYYY-MM-DD' + shelfLifeDays calendar days (common
 * practice). madeOn is already a calendar date in the business zone, so month ends, leap days and
 * daylight-saving changes are plain calendar arithmetic. shelfLifeDays is a whole number 0–3650.
 */
export function bestByDate(madeOn: string, shelfLifeDays: number): string {
  if (!Number.isSafeInteger(shelfLifeDays) || shelfLifeDays < 0 || shelfLifeDays > 3650) {
    throw new RangeError('Shelf life must be a whole number of days from 0 to 3650.');
  }
  return addCalendarDays(madeOn, shelfLifeDays);
}
