import { isCalendarDate } from './calendar-date';

const DAY_MS = 86_400_000;

/** Days before expiry when the owner is reminded (common practice: a month, a week, the day before). */
export const REMINDER_STAGES = [30, 7, 1] as const;
export type ReminderStage = (typeof REMINDER_STAGES)[number];

/** The Kitchen board and Records screen flag documents expiring within this many days. */
export const EXPIRING_SOON_DAYS = 30;

export type ExpiryStatus = 'no_expiry' | 'valid' | 'expiring_soon' | 'expired';

/** Whole calendar days from `today` to `expiresOn` (both 'YYYY-MM-DD'); negative once past. */
export function daysUntil(expiresOn: string, today: string): number {
  if (!isCalendarDate(expiresOn) || !isCalendarDate(today)) throw new RangeError('Dates must be YYYY-MM-DD');
  return Math.round((Date.parse(`${expiresOn}T00:00:00Z`) - Date.parse(`${today}T00:00:00Z`)) / DAY_MS);
}

/** A document is still valid on its expiry date and expired the day after. */
export function expiryStatus(expiresOn: string | null, today: string): ExpiryStatus {
  if (!expiresOn) return 'no_expiry';
  const left = daysUntil(expiresOn, today);
  if (left < 0) return 'expired';
  return left <= EXPIRING_SOON_DAYS ? 'expiring_soon' : 'valid';
}

/**
 * The reminder due today: the most urgent stage the days left have reached (6 days left → the 7-day
 * reminder; a 30-day reminder that was missed is not sent late). Null when none applies or expired.
 */
export function reminderStageDue(daysLeft: number): ReminderStage | null {
  if (daysLeft < 0) return null;
  const reached = REMINDER_STAGES.filter((s) => daysLeft <= s);
  return reached.length ? reached[reached.length - 1]! : null;
}
