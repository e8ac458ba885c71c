import { describe, expect, test } from 'vitest';
import { daysUntil, expiryStatus, reminderStageDue } from '../../../../shared/domain/document-expiry';

describe('document expiry', () => {
  test('counts calendar days, across month and leap-day boundaries', () => {
    expect(daysUntil('2028-03-01', '2028-02-28')).toBe(2);
    expect(daysUntil('2027-01-01', '2026-12-31')).toBe(1);
    expect(daysUntil('2026-05-01', '2026-05-03')).toBe(-2);
    expect(() => daysUntil('2026-02-30', '2026-01-01')).toThrow(RangeError);
  });

  test('valid through its expiry date, expired the day after; soon within 30 days', () => {
    expect(expiryStatus('2026-06-10', '2026-06-10')).toBe('expiring_soon');
    expect(expiryStatus('2026-06-10', '2026-06-11')).toBe('expired');
    expect(expiryStatus('2026-07-10', '2026-06-10')).toBe('expiring_soon');
    expect(expiryStatus('2026-07-11', '2026-06-10')).toBe('valid');
    expect(expiryStatus(null, '2026-06-10')).toBe('no_expiry');
  });

  test('the most urgent reached stage is the one due', () => {
    expect(reminderStageDue(31)).toBeNull();
    expect(reminderStageDue(30)).toBe(30);
    expect(reminderStageDue(8)).toBe(30);
    expect(reminderStageDue(7)).toBe(7);
    expect(reminderStageDue(6)).toBe(7);
    expect(reminderStageDue(1)).toBe(1);
    expect(reminderStageDue(0)).toBe(1);
    expect(reminderStageDue(-1)).toBeNull();
  });
});
