import { describe, expect, test } from 'vitest';
import {
  formatIsoWithOffset,
  formatZonedDateTime,
  localDateTimeToInstants,
  offsetMinutes,
  parseInstant,
} from '../../../../shared/domain/zoned-time';

// Transition days per the IANA tz database: US clocks change at 02:00 local on the second Sunday of
// March and the first Sunday of November (15 U.S.C. 260a, value from memory); UK clocks change at
// 01:00 UTC on the last Sunday of March and of October (Summer Time Order 2002, value from memory).
const reference = (iso: string, zone: string) =>
  // Independent reference: ICU's copy of the tz database through Intl.
  new Intl.DateTimeFormat('en-CA', { timeZone: zone, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZoneName: 'longOffset' }).format(new Date(iso));

describe('localDateTimeToInstants', () => {
  test.each([
    // Ordinary times: one instant.
    ['2026-03-08T01:30', 'America/New_York', ['2026-03-08T06:30:00.000Z']], // EST, half an hour before the change
    ['2026-03-08T03:30', 'America/New_York', ['2026-03-08T07:30:00.000Z']], // EDT
    ['2026-03-29T00:30', 'Europe/London', ['2026-03-29T00:30:00.000Z']], // GMT, before the change
    // Skipped hour: no instant.
    ['2026-03-08T02:30', 'America/New_York', []],
    ['2026-03-29T01:30', 'Europe/London', []],
    // Repeated hour: two distinct instants, earlier first.
    ['2026-11-01T01:30', 'America/New_York', ['2026-11-01T05:30:00.000Z', '2026-11-01T06:30:00.000Z']],
    ['2026-10-25T01:30', 'Europe/London', ['2026-10-25T00:30:00.000Z', '2026-10-25T01:30:00.000Z']],
  ])('%s in %s is %j', (local, zone, instants) => {
    const found = localDateTimeToInstants(local, zone);
    expect(found.map((d) => d.toISOString())).toEqual(instants);
    for (const d of found) expect(reference(d.toISOString(), zone)).toContain(local.replace('T', ', '));
  });

  test.each(['2026-02-30T10:00', '2026-03-08T24:00', '2026-03-08 01:30'])('refuses %j', (bad) => {
    expect(() => localDateTimeToInstants(bad, 'America/New_York')).toThrow(RangeError);
  });
});

describe('formatting in the business zone with the offset', () => {
  test.each([
    ['2026-03-08T06:30:00Z', 'America/New_York', '2026-03-08 01:30 \u221205:00', '2026-03-08T01:30:00-05:00'],
    ['2026-03-08T07:30:00Z', 'America/New_York', '2026-03-08 03:30 \u221204:00', '2026-03-08T03:30:00-04:00'],
    ['2026-11-01T05:30:00Z', 'America/New_York', '2026-11-01 01:30 \u221204:00', '2026-11-01T01:30:00-04:00'],
    ['2026-11-01T06:30:00Z', 'America/New_York', '2026-11-01 01:30 \u221205:00', '2026-11-01T01:30:00-05:00'],
    ['2026-03-29T00:30:00Z', 'Europe/London', '2026-03-29 00:30 +00:00', '2026-03-29T00:30:00+00:00'],
    ['2026-03-29T01:30:00Z', 'Europe/London', '2026-03-29 02:30 +01:00', '2026-03-29T02:30:00+01:00'],
    ['2026-10-25T00:30:00Z', 'Europe/London', '2026-10-25 01:30 +01:00', '2026-10-25T01:30:00+01:00'],
    ['2026-10-25T01:30:00Z', 'Europe/London', '2026-10-25 01:30 +00:00', '2026-10-25T01:30:00+00:00'],
    ['2026-07-01T12:00:00Z', 'Asia/Kolkata', '2026-07-01 17:30 +05:30', '2026-07-01T17:30:00+05:30'],
  ])('%s in %s shows as %s and exports as %s', (iso, zone, shown, exported) => {
    expect(formatZonedDateTime(new Date(iso), zone)).toBe(shown);
    expect(formatIsoWithOffset(new Date(iso), zone)).toBe(exported);
    // The exported form parses back to the same instant (RFC 3339).
    expect(parseInstant(exported).toISOString()).toBe(new Date(iso).toISOString());
  });

  test('offsetMinutes follows the tz database', () => {
    expect(offsetMinutes(new Date('2026-03-08T06:59:00Z'), 'America/New_York')).toBe(-300);
    expect(offsetMinutes(new Date('2026-03-08T07:00:00Z'), 'America/New_York')).toBe(-240);
  });
});

describe('parseInstant', () => {
  test.each(['2026-03-08T01:30', '2026-03-08', 'yesterday', '2026-02-30T10:00:00Z'])('refuses %j (no offset or not real)', (bad) => {
    expect(() => parseInstant(bad)).toThrow(RangeError);
  });
  test('accepts Z and numeric offsets', () => {
    expect(parseInstant('2026-03-08T01:30:00-05:00').toISOString()).toBe('2026-03-08T06:30:00.000Z');
    expect(parseInstant('2026-03-08T06:30:00.250Z').getTime()).toBe(Date.UTC(2026, 2, 8, 6, 30, 0, 250));
  });
});
