import { formatTemperatureBoth, isAtOrAbove, isAtOrBelow, type Temperature, type TemperatureLimit } from './temperature';
import { formatIsoWithOffset, formatZonedDateTime, parseInstant } from './zoned-time';

/**
 * How a period out of temperature control is limited:
 * - 'none': just a timer, no limit.
 * - 'custom': the bakery's own quality limit in minutes (not a food-safety limit).
 * - 'tphc_4h': FDA Food Code 2022 3-501.19(B), time as a public health control, 4 hours.
 * - 'tphc_6h': 3-501.19(C), cold food only, 6 hours, never above 70 °F (21 °C).
 * - 'cooling': 3-501.14(A), cooked food 135 °F → 70 °F within 2 h and → 41 °F within 6 h in all.
 * Jurisdictions adopt the Food Code with changes (e.g. NYC: hot food ≥ 140 °F, a 4-hour check on the
 * 6-hour option); the local health authority's rules win over these defaults.
 */
export const HOLDING_POLICIES = ['none', 'custom', 'tphc_4h', 'tphc_6h', 'cooling'] as const;

/** One of HOLDING_POLICIES. */
export type HoldingPolicy = (typeof HOLDING_POLICIES)[number];

/**
 * - 'running': a timer with no limit is running.
 * - 'within_limit': running, more than 30 minutes before the deadline.
 * - 'due_soon': running, 30 minutes or less before the deadline (our choice of warning time).
 * - 'over_limit': the deadline passed or a rule was broken; see requiredAction.
 * - 'completed': ended within the limit (cooling: reached 41 °F in time).
 * - 'not_permitted': the policy cannot be used for this food (see messages).
 */
export type HoldingStatus = 'running' | 'within_limit' | 'due_soon' | 'over_limit' | 'completed' | 'not_permitted';

/** What must happen now: throw the food away, reheat it or throw it away, or write down why. */
export type HoldingAction = 'discard' | 'reheat_or_discard' | 'record_reason';

/** A temperature reading taken at an instant (ISO 8601 with offset, normally UTC). */
export interface HoldingReading extends Temperature {
  at: string;
}

/** Everything needed to evaluate one holding period; instants are ISO 8601 with offset (UTC). */
export interface HoldingInput {
  policy: HoldingPolicy;
  /** Only for 'custom': the quality limit in whole minutes. */
  customLimitMinutes?: number | null;
  startedAt: string;
  stoppedAt?: string | null;
  readings: readonly HoldingReading[];
  now: string;
  /** Only for 'custom': why a period that ran over the quality limit was accepted. */
  closeReason?: string | null;
  /** IANA zone used to show times in messages; UTC when absent. */
  timeZone?: string;
}

/** The verdict on one holding period. */
export interface HoldingEvaluation {
  status: HoldingStatus;
  /** From start to the stop (or now), computed on UTC instants so it is exact across DST changes. */
  elapsedMs: number;
  /** The deadline that applies now (cooling: the current stage's), as a UTC ISO instant. */
  deadlineAt: string | null;
  /** Deadline minus the stop (or now); negative once past. Null without a deadline. */
  remainingMs: number | null;
  requiredAction: HoldingAction | null;
  isFoodSafetyLimit: boolean;
  messages: string[];
}

/** 'due_soon' starts this long before a deadline (our choice). */
export const DUE_SOON_MS = 30 * 60_000;

/**
 * The first reading counts as the temperature "at removal" (3-501.19) or at the start of cooling when
 * it is taken within 15 minutes either side of the start (our choice).
 */
export const INITIAL_READING_WINDOW_MS = 15 * 60_000;

const HOUR_MS = 3_600_000;
// FDA Food Code 2022 3-501.19(B)(1) and 3-501.16: cold ≤ 41 °F (5 °C), hot ≥ 135 °F (57 °C).
const COLD: TemperatureLimit = { fahrenheit: 41, celsius: 5 };
const HOT: TemperatureLimit = { fahrenheit: 135, celsius: 57 };
// 3-501.19(C)(2) and 3-501.14(A)(1): 70 °F (21 °C).
const SEVENTY: TemperatureLimit = { fahrenheit: 70, celsius: 21 };

/** '4 h', '1 h 30 min', '45 min', '0 min' (whole minutes, rounded down). */
export function formatDuration(ms: number): string {
  const minutes = Math.floor(Math.abs(ms) / 60_000);
  const h = Math.floor(minutes / 60);
  const m = minutes % 60;
  if (h === 0) return `${m} min`;
  return m === 0 ? `${h} h` : `${h} h ${m} min`;
}

interface Context {
  start: number;
  end: number;
  isStopped: boolean;
  readings: Array<{ t: number; reading: HoldingReading }>;
  show: (t: number) => string;
}

type Verdict = Omit<HoldingEvaluation, 'elapsedMs'>;

function refuse(message: string, isFoodSafetyLimit: boolean): Verdict {
  return { status: 'not_permitted', deadlineAt: null, remainingMs: null, requiredAction: null, isFoodSafetyLimit, messages: [message] };
}

/** A countdown to one deadline; `action` is what going over it requires. */
function countdown(c: Context, limitMs: number, action: HoldingAction, isFoodSafetyLimit: boolean, messages: string[]): Verdict {
  const deadline = c.start + limitMs;
  const base = { deadlineAt: new Date(deadline).toISOString(), remainingMs: deadline - c.end, isFoodSafetyLimit };
  // A stop at the deadline itself is within the limit; a running timer at its deadline is over it.
  const isOver = c.isStopped ? c.end > deadline : c.end >= deadline;
  if (isOver) return { ...base, status: 'over_limit', requiredAction: action, messages };
  if (c.isStopped) return { ...base, status: 'completed', requiredAction: null, messages };
  const status = deadline - c.end <= DUE_SOON_MS ? 'due_soon' : 'within_limit';
  return { ...base, status, requiredAction: null, messages };
}

function initialReading(c: Context): HoldingReading | null {
  const first = c.readings[0];
  return first && Math.abs(first.t - c.start) <= INITIAL_READING_WINDOW_MS ? first.reading : null;
}

function evaluateTphc(c: Context, hours: 4 | 6): Verdict {
  const section = hours === 4 ? '3-501.19(B)' : '3-501.19(C)';
  const initial = initialReading(c);
  if (!initial) {
    return refuse(
      `Record the food's temperature when it comes out of ${hours === 4 ? 'hot or cold' : 'cold'} holding (within 15 minutes of the start); time as a public health control needs it (FDA Food Code ${section}).`,
      true,
    );
  }
  const startsCold = isAtOrBelow(initial, COLD);
  if (hours === 6 && !startsCold) {
    return refuse(`The 6-hour option is for cold food only: it must start at 41 °F (5 °C) or colder, and this food was ${formatTemperatureBoth(initial)} (FDA Food Code ${section}).`, true);
  }
  if (!startsCold && !isAtOrAbove(initial, HOT)) {
    return refuse(`This food was ${formatTemperatureBoth(initial)} when it came out, between 41 °F (5 °C) and 135 °F (57 °C), so time as a public health control cannot be used; follow your usual hot or cold holding (FDA Food Code ${section}).`, true);
  }
  const messages: string[] = [];
  if (hours === 6) {
    const warm = c.readings.find((r) => !isAtOrBelow(r.reading, SEVENTY));
    if (warm) {
      const v = countdown(c, hours * HOUR_MS, 'discard', true, messages);
      messages.push(`The reading of ${formatTemperatureBoth(warm.reading)} at ${c.show(warm.t)} is above 70 °F (21 °C): discard the food (FDA Food Code ${section}).`);
      return { ...v, status: 'over_limit', requiredAction: 'discard' };
    }
  }
  const v = countdown(c, hours * HOUR_MS, 'discard', true, messages);
  const deadline = c.show(c.start + hours * HOUR_MS);
  if (v.status === 'over_limit') messages.push(`More than ${hours} hours have passed since ${c.show(c.start)}: discard the food (FDA Food Code ${section}).`);
  else if (v.status !== 'completed') messages.push(`Serve or discard by ${deadline} (FDA Food Code ${section}).`);
  return v;
}

function evaluateCooling(c: Context): Verdict {
  const initial = initialReading(c);
  if (!initial) {
    return refuse('Record the food\u2019s temperature when cooling starts (within 15 minutes of the start); the cooling check needs readings (FDA Food Code 3-501.14).', true);
  }
  const messages: string[] = [];
  if (!isAtOrAbove(initial, HOT)) {
    messages.push(`Cooling started at ${formatTemperatureBoth(initial)}, below 135 °F (57 °C); the 2-hour stage counts from when the food was at 135 °F, so this timing may be too generous.`);
  }
  const stage1 = c.start + 2 * HOUR_MS;
  const stage2 = c.start + 6 * HOUR_MS;
  const at70 = c.readings.find((r) => isAtOrBelow(r.reading, SEVENTY));
  const at41 = c.readings.find((r) => isAtOrBelow(r.reading, COLD));
  const verdict = (status: HoldingStatus, deadline: number, requiredAction: HoldingAction | null): Verdict => ({
    status, deadlineAt: new Date(deadline).toISOString(), remainingMs: deadline - c.end, requiredAction, isFoodSafetyLimit: true, messages,
  });

  const isStage1Late = at70 ? at70.t > stage1 : c.end >= stage1;
  if (isStage1Late) {
    messages.push(`The food did not reach 70 °F (21 °C) within 2 hours (by ${c.show(stage1)}): reheat it or discard it (FDA Food Code 3-501.14(A)(1)).`);
    return verdict('over_limit', stage1, 'reheat_or_discard');
  }
  if (!at70) {
    if (c.isStopped) {
      messages.push('Cooling was stopped before the food was shown to reach 70 °F (21 °C): reheat it or discard it.');
      return verdict('over_limit', stage1, 'reheat_or_discard');
    }
    messages.push(`Cool to 70 °F (21 °C) by ${c.show(stage1)} and to 41 °F (5 °C) by ${c.show(stage2)} (FDA Food Code 3-501.14(A)).`);
    return verdict(stage1 - c.end <= DUE_SOON_MS ? 'due_soon' : 'within_limit', stage1, null);
  }
  messages.push(`Reached 70 °F (21 °C) at ${c.show(at70.t)}, after ${formatDuration(at70.t - c.start)}.`);
  if (at41 && at41.t <= stage2) {
    messages.push(`Reached 41 °F (5 °C) at ${c.show(at41.t)}, after ${formatDuration(at41.t - c.start)}: cooling is complete.`);
    return verdict('completed', stage2, null);
  }
  if (at41 || c.end >= stage2) {
    messages.push(`The food did not reach 41 °F (5 °C) within 6 hours in all (by ${c.show(stage2)}): discard it (FDA Food Code 3-501.14(A)(2)).`);
    return verdict('over_limit', stage2, 'discard');
  }
  if (c.isStopped) {
    messages.push('Cooling was stopped before the food was shown to reach 41 °F (5 °C): discard it.');
    return verdict('over_limit', stage2, 'discard');
  }
  messages.push(`Cool to 41 °F (5 °C) by ${c.show(stage2)} (FDA Food Code 3-501.14(A)(2)).`);
  return verdict(stage2 - c.end <= DUE_SOON_MS ? 'due_soon' : 'within_limit', stage2, null);
}

function evaluateCustom(c: Context, limitMinutes: number | null | undefined, closeReason: string | null | undefined): Verdict {
  if (!limitMinutes || !Number.isSafeInteger(limitMinutes) || limitMinutes < 1) {
    return refuse('Set the time limit in whole minutes (at least 1).', false);
  }
  const messages = ['This is your own quality limit, not a food-safety limit.'];
  const v = countdown(c, limitMinutes * 60_000, 'record_reason', false, messages);
  if (v.status !== 'over_limit') return v;
  const reason = closeReason?.trim();
  if (c.isStopped && reason) {
    messages.push(`Closed over the limit. Reason: ${reason}`);
    return { ...v, requiredAction: null };
  }
  messages.push(`Over the ${formatDuration(limitMinutes * 60_000)} limit: record why.`);
  return v;
}

/**
 * Evaluates a period out of temperature control at `now`. Durations come from UTC instants, so they
 * are exact across daylight-saving changes. Readings from 15 minutes before the start up to the stop
 * (or now) count; later ones are ignored. Throws RangeError only for malformed instants; impossible
 * times (a stop before the start, a start in the future) give 'not_permitted' with a message.
 */
export function evaluateHolding(input: HoldingInput): HoldingEvaluation {
  const start = parseInstant(input.startedAt).getTime();
  const now = parseInstant(input.now).getTime();
  const stop = input.stoppedAt ? parseInstant(input.stoppedAt).getTime() : null;
  const end = stop ?? now;
  const isFoodSafetyLimit = input.policy !== 'none' && input.policy !== 'custom';
  const done = (v: Verdict): HoldingEvaluation => ({ ...v, elapsedMs: Math.max(0, end - start) });

  if (start > now) return done(refuse('The start time is in the future; check the time entered.', isFoodSafetyLimit));
  if (stop !== null && stop < start) return done(refuse('The stop time is before the start time; check the times entered.', isFoodSafetyLimit));
  if (stop !== null && stop > now) return done(refuse('The stop time is in the future; check the time entered.', isFoodSafetyLimit));

  const zone = input.timeZone;
  const c: Context = {
    start,
    end,
    isStopped: stop !== null,
    readings: input.readings
      .map((reading) => ({ t: parseInstant(reading.at).getTime(), reading }))
      .filter((r) => r.t >= start - INITIAL_READING_WINDOW_MS && r.t <= end)
      .sort((a, b) => a.t - b.t),
    show: (t) => (zone ? formatZonedDateTime(new Date(t), zone) : formatIsoWithOffset(new Date(t), 'UTC')),
  };

  switch (input.policy) {
    case 'none':
      return done({ status: c.isStopped ? 'completed' : 'running', deadlineAt: null, remainingMs: null, requiredAction: null, isFoodSafetyLimit: false, messages: [] });
    case 'custom':
      return done(evaluateCustom(c, input.customLimitMinutes, input.closeReason));
    case 'tphc_4h':
      return done(evaluateTphc(c, 4));
    case 'tphc_6h':
      return done(evaluateTphc(c, 6));
    case 'cooling':
      return done(evaluateCooling(c));
  }
}
