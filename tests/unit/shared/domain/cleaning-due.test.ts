import { describe, expect, test } from 'vitest';
import { cleaningDue, cleaningDueForAll } from '../../../../shared/domain/cleaning-due';

const at = (hhmm: string, day = '2026-06-10') => `${day}T${hhmm}:00Z`;
const iso = (hhmm: string, day = '2026-06-10') => `${day}T${hhmm}:00.000Z`;

describe('cleaningDue — FDA Food Code 2022 4-602.11(C): at least every 4 hours while in use', () => {
  test.each([
    // in use since, last cleaned, now → status, next due
    [at('08:00'), at('08:00'), at('10:00'), 'ok', iso('12:00')],
    [at('08:00'), at('08:00'), at('11:30'), 'due_soon', iso('12:00')], // 30 min left (our warning window)
    [at('08:00'), at('08:00'), at('11:29'), 'ok', iso('12:00')],
    [at('08:00'), at('08:00'), at('12:00'), 'overdue', iso('12:00')], // at 4 h it is due
    [at('08:00'), at('10:15'), at('13:00'), 'ok', iso('14:15')], // cleaned mid-shift resets the clock
    [at('08:00'), at('06:00'), at('09:00'), 'ok', iso('12:00')], // cleaned before use: clock starts at use
    [at('08:00'), null, at('08:05'), 'overdue', iso('08:00')], // in use, never cleaned
  ] as const)('in use %s, cleaned %s, at %s → %s, next %s', (inUseSince, lastCleanedAt, now, status, nextDueAt) => {
    expect(cleaningDue({ equipmentId: 'bench', inUseSince, lastCleanedAt }, now)).toMatchObject({ status, nextDueAt });
  });

  test('an item not in use has no due time', () => {
    expect(cleaningDue({ equipmentId: 'mixer', inUseSince: null, lastCleanedAt: at('08:00') }, at('20:00'))).toEqual({
      equipmentId: 'mixer', status: 'not_in_use', nextDueAt: null, remainingMs: null,
    });
  });

  test('4 hours across the US spring-forward change is 4 real hours (IANA tz: 2026-03-08 07:00Z)', () => {
    // Cleaned 01:30 EST (06:30Z); due 10:30Z, which New York clocks show as 06:30 EDT.
    const r = cleaningDue({ equipmentId: 'bench', inUseSince: '2026-03-08T01:30:00-05:00', lastCleanedAt: '2026-03-08T01:30:00-05:00' }, '2026-03-08T09:30:00Z');
    expect(r).toMatchObject({ nextDueAt: '2026-03-08T10:30:00.000Z', remainingMs: 3_600_000, status: 'ok' });
  });
});

describe('cleaningDueForAll', () => {
  test('lists the most urgent first and idle items last', () => {
    const list = cleaningDueForAll([
      { equipmentId: 'mixer', inUseSince: null, lastCleanedAt: null },
      { equipmentId: 'bench', inUseSince: at('08:00'), lastCleanedAt: at('10:00') },
      { equipmentId: 'scoop', inUseSince: at('08:00'), lastCleanedAt: at('08:00') },
    ], at('11:00'));
    expect(list.map((d) => [d.equipmentId, d.status])).toEqual([['scoop', 'ok'], ['bench', 'ok'], ['mixer', 'not_in_use']]);
    expect(list[0]!.remainingMs).toBe(3_600_000);
  });
});
