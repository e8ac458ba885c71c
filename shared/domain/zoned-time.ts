import { tzOffset } from '@date-fns/tz';
import { isCalendarDate } from './calendar-date';

const ISO_INSTANT = /^(\d{4}-\d{2}-\d{2})T([01]\d|2[0-3]):[0-5]\d(:[0-5]\d(\.\d{1,9})?)?(Z|[+-]\d{2}:[0-5]\d)$/;
const LOCAL_DATE_TIME = /^(\d{4})-(\d{2})-(\d{2})T(\d{2}):(\d{2})$/;
const MINUTE_MS = 60_000;

/** True when `timeZone` is an IANA zone name this runtime knows (e.g. 'America/New_York'). */
export function isValidTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone });
    return timeZone.length > 0;
  } catch {
    return false;
  }
}

function assertTimeZone(timeZone: string): void {
  if (!isValidTimeZone(timeZone)) throw new RangeError(`Unknown time zone: ${timeZone}`);
}

/**
 * Parses an ISO 8601 instant that carries its offset ('Z' or ±hh:mm). A time without an offset is
 * refused because it could mean two instants on a daylight-saving day. Throws RangeError.
 */
export function parseInstant(iso: string): Date {
  const m = ISO_INSTANT.exec(iso);
  const d = new Date(iso);
  if (!m || !isCalendarDate(m[1]!) || Number.isNaN(d.getTime())) {
    throw new RangeError(`Not an ISO 8601 instant with an offset: ${iso}`);
  }
  return d;
}

/** Offset of `timeZone` from UTC at `instant`, in minutes (e.g. -240 for EDT). */
export function offsetMinutes(instant: Date, timeZone: string): number {
  assertTimeZone(timeZone);
  return tzOffset(timeZone, instant);
}

interface WallClock {
  year: string; month: string; day: string; hour: string; minute: string; second: string; offset: string;
}

function wallClock(instant: Date, timeZone: string, offsetMinus: string): WallClock {
  const off = offsetMinutes(instant, timeZone);
  const local = new Date(instant.getTime() + off * MINUTE_MS);
  const p2 = (n: number) => String(n).padStart(2, '0');
  const abs = Math.abs(off);
  return {
    year: String(local.getUTCFullYear()).padStart(4, '0'),
    month: p2(local.getUTCMonth() + 1),
    day: p2(local.getUTCDate()),
    hour: p2(local.getUTCHours()),
    minute: p2(local.getUTCMinutes()),
    second: p2(local.getUTCSeconds()),
    offset: `${off < 0 ? offsetMinus : '+'}${p2(Math.floor(abs / 60))}:${p2(abs % 60)}`,
  };
}

/** The calendar date ('YYYY-MM-DD') at `instant` on the wall clocks of `timeZone`. */
export function businessLocalDate(instant: Date, timeZone: string): string {
  const w = wallClock(instant, timeZone, '-');
  return `${w.year}-${w.month}-${w.day}`;
}

/**
 * RFC 3339 / ISO 8601 with the business zone's offset, for exports: '2026-03-08T03:30:00-04:00'.
 */
export function formatIsoWithOffset(instant: Date, timeZone: string): string {
  const w = wallClock(instant, timeZone, '-');
  return `${w.year}-${w.month}-${w.day}T${w.hour}:${w.minute}:${w.second}${w.offset}`;
}

/**
 * A time for people to read, in the business zone with its offset so that the repeated hour on a
 * daylight-saving day is never ambiguous: '2026-03-08 03:30 −04:00' (U+2212 minus sign).
 */
export function formatZonedDateTime(instant: Date, timeZone: string): string {
  const w = wallClock(instant, timeZone, '\u2212');
  return `${w.year}-${w.month}-${w.day} ${w.hour}:${w.minute} ${w.offset}`;
}

/**
 * The instants at which the wall clocks of `timeZone` show `localDateTime` ('YYYY-MM-DDTHH:mm').
 * Usually one; two in the repeated hour when clocks go back (earlier first); none in the skipped
 * hour when clocks go forward. The caller asks the user which one they meant, or to re-enter.
 */
export function localDateTimeToInstants(localDateTime: string, timeZone: string): Date[] {
  assertTimeZone(timeZone);
  const m = LOCAL_DATE_TIME.exec(localDateTime);
  if (!m) throw new RangeError(`Not a local date-time 'YYYY-MM-DDTHH:mm': ${localDateTime}`);
  const [, y, mo, d, h, mi] = m.map(Number) as [number, number, number, number, number, number];
  const asUtc = Date.UTC(y, mo - 1, d, h, mi);
  const check = new Date(asUtc);
  if (check.getUTCMonth() !== mo - 1 || check.getUTCDate() !== d || h > 23 || mi > 59) {
    throw new RangeError(`Not a real date and time: ${localDateTime}`);
  }
  // Any zone's offset on that day is one of the offsets in force a day either side.
  const candidates = new Set<number>();
  for (const probe of [asUtc - 86_400_000, asUtc, asUtc + 86_400_000]) {
    candidates.add(asUtc - tzOffset(timeZone, new Date(probe)) * MINUTE_MS);
  }
  return [...candidates]
    .filter((t) => t + tzOffset(timeZone, new Date(t)) * MINUTE_MS === asUtc)
    .sort((a, b) => a - b)
    .map((t) => new Date(t));
}
