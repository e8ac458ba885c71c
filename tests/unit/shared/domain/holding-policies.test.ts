import { describe, expect, test } from 'vitest';
import { evaluateHolding, formatDuration, type HoldingInput, type HoldingReading } from '../../../../shared/domain/holding-policies';
import { formatZonedDateTime, localDateTimeToInstants } from '../../../../shared/domain/zoned-time';

const DAY = '2026-06-10';
const at = (hhmm: string) => `${DAY}T${hhmm}:00Z`;
const f = (hhmm: string, value: number): HoldingReading => ({ at: at(hhmm), value, unit: 'F' });
const c = (hhmm: string, value: number): HoldingReading => ({ at: at(hhmm), value, unit: 'C' });
const run = (over: Partial<HoldingInput>) =>
  evaluateHolding({ policy: 'tphc_4h', startedAt: at('10:00'), readings: [], now: at('10:00'), ...over });

describe('tphc_4h — FDA Food Code 2022 3-501.19(B)', () => {
  test.each([
    // Removal 10:00 → discard at 14:00 (3-501.19(B): marked 4 h past removal, discarded within 4 h).
    ['cold start, 10:30', [f('10:00', 38)], at('10:30'), undefined, 'within_limit', null],
    ['hot start, 10:30', [f('10:00', 140)], at('10:30'), undefined, 'within_limit', null],
    ['13:30 is 30 min before (our due-soon window)', [f('10:00', 38)], at('13:30'), undefined, 'due_soon', null],
    ['13:29 is not yet due soon', [f('10:00', 38)], at('13:29'), undefined, 'within_limit', null],
    ['14:00 running is over the limit', [f('10:00', 38)], at('14:00'), undefined, 'over_limit', 'discard'],
    ['stopped at 14:00 is within 4 h', [f('10:00', 38)], at('15:00'), at('14:00'), 'completed', null],
    ['stopped at 14:01 is over', [f('10:00', 38)], at('15:00'), at('14:01'), 'over_limit', 'discard'],
    // Boundaries of 3-501.19(B)(1): ≤ 41 °F (5 °C) or ≥ 135 °F (57 °C) at removal.
    ['41 °F start', [f('10:00', 41)], at('10:30'), undefined, 'within_limit', null],
    ['135 °F start', [f('10:00', 135)], at('10:30'), undefined, 'within_limit', null],
    ['5 °C start', [c('10:00', 5)], at('10:30'), undefined, 'within_limit', null],
    ['57 °C start (the code\u2019s own °C figure)', [c('10:00', 57)], at('10:30'), undefined, 'within_limit', null],
    ['42 °F start is not permitted', [f('10:00', 42)], at('10:30'), undefined, 'not_permitted', null],
    ['134.9 °F start is not permitted', [f('10:00', 134.9)], at('10:30'), undefined, 'not_permitted', null],
    ['no reading is not permitted', [], at('10:30'), undefined, 'not_permitted', null],
    ['a first reading 20 min late is not permitted', [f('10:20', 38)], at('10:30'), undefined, 'not_permitted', null],
    ['a reading 10 min before removal counts', [f('09:50', 38)], at('10:30'), undefined, 'within_limit', null],
    // Once TPHC applies, later temperatures do not matter under (B) (RTE food may be served at any temperature).
    ['later warm readings do not matter', [f('10:00', 38), f('12:00', 80)], at('12:30'), undefined, 'within_limit', null],
  ])('%s', (_name, readings, now, stoppedAt, status, action) => {
    const r = run({ readings, now, stoppedAt });
    expect(r.status).toBe(status);
    expect(r.requiredAction).toBe(action);
    expect(r.isFoodSafetyLimit).toBe(true);
    if (status !== 'not_permitted') expect(r.deadlineAt).toBe('2026-06-10T14:00:00.000Z');
  });

  test('the deadline and remaining time are exact', () => {
    const r = run({ readings: [f('10:00', 38)], now: at('13:15') });
    expect(r).toMatchObject({ elapsedMs: 3.25 * 3_600_000, remainingMs: 45 * 60_000, deadlineAt: '2026-06-10T14:00:00.000Z' });
    expect(r.messages).toEqual(['Serve or discard by 2026-06-10T14:00:00+00:00 (FDA Food Code 3-501.19(B)).']);
  });

  test('a 42 °F removal reading explains why TPHC cannot be used', () => {
    expect(run({ readings: [f('10:00', 42)], now: at('10:30') }).messages[0]).toMatch(/42 °F \(5\.6 °C\).*between 41 °F \(5 °C\) and 135 °F \(57 °C\)/);
  });
});

describe('tphc_6h — FDA Food Code 2022 3-501.19(C)', () => {
  const six = (over: Partial<HoldingInput>) => run({ policy: 'tphc_6h', ...over });
  test.each([
    // Removal 10:00 → discard at 16:00 (3-501.19(C)(4): marked with the time 6 h past removal).
    ['running at 12:00', [f('10:00', 40), f('11:00', 55)], at('12:00'), undefined, 'within_limit', null],
    ['70 °F is allowed (may not exceed 70 °F)', [f('10:00', 40), f('13:00', 70)], at('13:30'), undefined, 'within_limit', null],
    // 3-501.19(C)(2): a reading of 71 °F at 13:00 → discard.
    ['71 °F at 13:00 → discard', [f('10:00', 40), f('13:00', 71)], at('13:30'), undefined, 'over_limit', 'discard'],
    ['21.1 °C → discard', [c('10:00', 4), c('13:00', 21.1)], at('13:30'), undefined, 'over_limit', 'discard'],
    ['15:30 is due soon', [f('10:00', 40)], at('15:30'), undefined, 'due_soon', null],
    ['16:00 running → discard', [f('10:00', 40)], at('16:00'), undefined, 'over_limit', 'discard'],
    ['stopped at 15:59', [f('10:00', 40)], at('16:30'), at('15:59'), 'completed', null],
    // 3-501.19(C)(1): cold food only, initial ≤ 41 °F.
    ['42 °F start not permitted', [f('10:00', 42)], at('10:30'), undefined, 'not_permitted', null],
    ['hot food not permitted', [f('10:00', 140)], at('10:30'), undefined, 'not_permitted', null],
    ['no reading not permitted', [], at('10:30'), undefined, 'not_permitted', null],
    ['a warm reading after the stop is ignored', [f('10:00', 40), f('15:00', 75)], at('16:30'), at('14:00'), 'completed', null],
  ])('%s', (_name, readings, now, stoppedAt, status, action) => {
    const r = six({ readings, now, stoppedAt });
    expect(r.status).toBe(status);
    expect(r.requiredAction).toBe(action);
    if (status !== 'not_permitted') expect(r.deadlineAt).toBe('2026-06-10T16:00:00.000Z');
  });

  test('the discard message names the reading and its time', () => {
    const r = six({ readings: [f('10:00', 40), f('13:00', 71)], now: at('13:30'), timeZone: 'America/New_York' });
    expect(r.messages).toContain('The reading of 71 °F (21.7 °C) at 2026-06-10 09:00 \u221204:00 is above 70 °F (21 °C): discard the food (FDA Food Code 3-501.19(C)).');
  });
});

describe('cooling — FDA Food Code 2022 3-501.14(A)', () => {
  const cool = (readings: HoldingReading[], now: string, stoppedAt?: string) =>
    evaluateHolding({ policy: 'cooling', startedAt: at('10:00'), readings, now, stoppedAt });
  test.each([
    // 135 → 70 °F in 1 h 30 min, then 70 → 41 °F by hour 5.5 → pass.
    ['70 °F at 1 h 30, 41 °F at 5 h 30 → complete', [f('10:00', 135), f('11:30', 70), f('15:30', 41)], at('15:30'), 'completed', null, '16:00'],
    // 135 → 70 °F in 2 h 10 min → fail even though the total is under 6 h (reheat or discard, 3-501.14 [V2]).
    ['70 °F at 2 h 10 → reheat or discard', [f('10:00', 135), f('12:10', 70), f('15:00', 41)], at('15:00'), 'over_limit', 'reheat_or_discard', '12:00'],
    // Total 6 h 05 min → fail.
    ['41 °F at 6 h 05 → discard', [f('10:00', 135), f('11:30', 70), f('16:05', 41)], at('16:05'), 'over_limit', 'discard', '16:00'],
    // Boundaries: exactly 2 h and exactly 6 h are "within".
    ['70 °F at exactly 2 h, 41 °F at exactly 6 h', [f('10:00', 135), f('12:00', 70), f('16:00', 41)], at('16:00'), 'completed', null, '16:00'],
    ['°C readings: 21 °C at 1 h 50, 5 °C at 5 h', [c('10:00', 57), c('11:50', 21), c('15:00', 5)], at('15:00'), 'completed', null, '16:00'],
    ['running stage 1 at 1 h', [f('10:00', 135), f('11:00', 100)], at('11:00'), 'within_limit', null, '12:00'],
    ['stage 1 due soon at 1 h 45', [f('10:00', 135), f('11:00', 100)], at('11:45'), 'due_soon', null, '12:00'],
    ['no 70 °F reading by 2 h → reheat or discard', [f('10:00', 135), f('11:00', 100)], at('12:00'), 'over_limit', 'reheat_or_discard', '12:00'],
    ['running stage 2 at 3 h', [f('10:00', 135), f('11:30', 68)], at('13:00'), 'within_limit', null, '16:00'],
    ['stage 2 due soon at 5 h 40', [f('10:00', 135), f('11:30', 68)], at('15:40'), 'due_soon', null, '16:00'],
    ['no 41 °F reading by 6 h → discard', [f('10:00', 135), f('11:30', 68), f('15:00', 45)], at('16:00'), 'over_limit', 'discard', '16:00'],
    ['no reading at all → not permitted', [], at('11:00'), 'not_permitted', null, null],
  ])('%s', (_name, readings, now, status, action, deadline) => {
    const r = cool(readings, now);
    expect(r.status).toBe(status);
    expect(r.requiredAction).toBe(action);
    expect(r.deadlineAt).toBe(deadline ? at(deadline).replace(':00Z', ':00.000Z') : null);
  });

  test('stopping before 41 °F is shown is not a completed cooling', () => {
    expect(cool([f('10:00', 135), f('11:30', 68)], at('14:00'), at('13:00'))).toMatchObject({ status: 'over_limit', requiredAction: 'discard' });
    expect(cool([f('10:00', 135), f('11:00', 90)], at('14:00'), at('11:15'))).toMatchObject({ status: 'over_limit', requiredAction: 'reheat_or_discard' });
  });

  test('a start below 135 °F is allowed with a caution', () => {
    const r = cool([f('10:00', 120)], at('10:30'));
    expect(r.status).toBe('within_limit');
    expect(r.messages[0]).toMatch(/below 135 °F/);
  });
});

describe('custom and none', () => {
  test.each([
    [{ policy: 'custom', customLimitMinutes: 90, now: at('10:59') }, 'within_limit', null],
    [{ policy: 'custom', customLimitMinutes: 90, now: at('11:00') }, 'due_soon', null], // 30 min left (our due-soon window)
    [{ policy: 'custom', customLimitMinutes: 90, now: at('11:30') }, 'over_limit', 'record_reason'],
    [{ policy: 'custom', customLimitMinutes: 90, now: at('12:00'), stoppedAt: at('11:45'), closeReason: 'Glaze test batch, kept for staff' }, 'over_limit', null],
    [{ policy: 'custom', customLimitMinutes: 90, now: at('12:00'), stoppedAt: at('11:45'), closeReason: '   ' }, 'over_limit', 'record_reason'],
    [{ policy: 'custom', customLimitMinutes: 90, now: at('12:00'), stoppedAt: at('11:00') }, 'completed', null],
    [{ policy: 'custom', now: at('11:00') }, 'not_permitted', null],
    [{ policy: 'custom', customLimitMinutes: 0, now: at('11:00') }, 'not_permitted', null],
    [{ policy: 'none', now: at('18:00') }, 'running', null],
    [{ policy: 'none', now: at('18:00'), stoppedAt: at('17:00') }, 'completed', null],
  ] as Array<[Partial<HoldingInput>, string, string | null]>)('%j → %s', (over, status, action) => {
    const r = run(over);
    expect(r.status).toBe(status);
    expect(r.requiredAction).toBe(action);
    expect(r.isFoodSafetyLimit).toBe(false);
  });

  test('a reason for closing over the limit is kept in the messages', () => {
    const r = run({ policy: 'custom', customLimitMinutes: 90, now: at('12:00'), stoppedAt: at('11:45'), closeReason: 'Glaze test batch' });
    expect(r.messages).toContain('Closed over the limit. Reason: Glaze test batch');
  });
});

describe('impossible times', () => {
  test.each([
    [{ startedAt: at('11:00'), now: at('10:00') }, /future/],
    [{ stoppedAt: at('09:00'), now: at('10:30') }, /before the start/],
    [{ stoppedAt: at('11:00'), now: at('10:30') }, /future/],
  ])('%j is not permitted', (over, message) => {
    const r = run({ readings: [f('10:00', 38)], ...over });
    expect(r.status).toBe('not_permitted');
    expect(r.messages[0]).toMatch(message);
  });
  test('a time without an offset is refused', () => {
    expect(() => run({ startedAt: '2026-06-10T10:00' })).toThrow(RangeError);
  });
});

// Daylight-saving days per the IANA tz database (US: 2nd Sunday of March, 1st Sunday of November at
// 02:00 local; UK: last Sunday of March and October at 01:00 UTC). A 4-hour TPHC period is 4 hours
// of real time however the wall clock jumps.
describe('time.dst: holding across daylight-saving changes', () => {
  test.each([
    ['America/New_York', '2026-03-08T01:30', 0, '2026-03-08T06:30:00.000Z', '2026-03-08T10:30:00.000Z', '2026-03-08 01:30 \u221205:00', '2026-03-08 06:30 \u221204:00'],
    ['America/New_York', '2026-11-01T01:30', 0, '2026-11-01T05:30:00.000Z', '2026-11-01T09:30:00.000Z', '2026-11-01 01:30 \u221204:00', '2026-11-01 04:30 \u221205:00'],
    ['America/New_York', '2026-11-01T01:30', 1, '2026-11-01T06:30:00.000Z', '2026-11-01T10:30:00.000Z', '2026-11-01 01:30 \u221205:00', '2026-11-01 05:30 \u221205:00'],
    ['Europe/London', '2026-03-29T00:30', 0, '2026-03-29T00:30:00.000Z', '2026-03-29T04:30:00.000Z', '2026-03-29 00:30 +00:00', '2026-03-29 05:30 +01:00'],
    ['Europe/London', '2026-10-25T01:30', 0, '2026-10-25T00:30:00.000Z', '2026-10-25T04:30:00.000Z', '2026-10-25 01:30 +01:00', '2026-10-25 04:30 +00:00'],
    ['Europe/London', '2026-10-25T01:30', 1, '2026-10-25T01:30:00.000Z', '2026-10-25T05:30:00.000Z', '2026-10-25 01:30 +00:00', '2026-10-25 05:30 +00:00'],
  ])('%s %s (occurrence %i): start %s, discard %s, shown %s → %s', (zone, local, which, startUtc, deadlineUtc, startShown, deadlineShown) => {
    const start = localDateTimeToInstants(local, zone)[which]!;
    expect(start.toISOString()).toBe(startUtc);
    const threeHoursLater = new Date(start.getTime() + 3 * 3_600_000).toISOString();
    const r = evaluateHolding({
      policy: 'tphc_4h', startedAt: start.toISOString(), readings: [{ at: start.toISOString(), value: 38, unit: 'F' }], now: threeHoursLater, timeZone: zone,
    });
    expect(r).toMatchObject({ status: 'within_limit', deadlineAt: deadlineUtc, elapsedMs: 3 * 3_600_000, remainingMs: 3_600_000 });
    expect(formatZonedDateTime(start, zone)).toBe(startShown);
    expect(formatZonedDateTime(new Date(r.deadlineAt!), zone)).toBe(deadlineShown);
    expect(r.messages[0]).toBe(`Serve or discard by ${deadlineShown} (FDA Food Code 3-501.19(B)).`);
  });

  test('the two 01:30 entries on a fall-back day are distinct instants and sort by UTC', () => {
    const [first, second] = localDateTimeToInstants('2026-11-01T01:30', 'America/New_York');
    expect(second!.getTime() - first!.getTime()).toBe(3_600_000);
  });
});

describe('formatDuration', () => {
  test.each([[0, '0 min'], [45 * 60_000, '45 min'], [4 * 3_600_000, '4 h'], [90 * 60_000, '1 h 30 min'], [-90 * 60_000, '1 h 30 min'], [59_999, '0 min']])(
    '%i ms is %s', (ms, text) => expect(formatDuration(ms)).toBe(text),
  );
});
