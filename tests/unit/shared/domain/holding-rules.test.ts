import { describe, expect, test } from 'vitest';
import { actionsAllowedFor, holdingLimitMinutes, holdingUrgencyRank, needsHoldingAction, normalizeHoldingPolicy, policyNeedsFirstReading, policyNeedsWrittenProcedure } from '../../../../shared/domain/holding-rules';

describe('holding rules', () => {
  test('reads both spellings of a policy name', () => {
    expect(normalizeHoldingPolicy('tphc-4h')).toBe('tphc_4h');
    expect(normalizeHoldingPolicy('TPHC_6H')).toBe('tphc_6h');
    expect(normalizeHoldingPolicy('cooling')).toBe('cooling');
    expect(normalizeHoldingPolicy('tphc-8h')).toBeNull();
    expect(normalizeHoldingPolicy(null)).toBeNull();
  });

  test('limit snapshots: FDA Food Code 2022 3-501.19(B) 4 h, (C) 6 h, 3-501.14(A) 6 h in all', () => {
    expect(holdingLimitMinutes('tphc_4h')).toBe(240);
    expect(holdingLimitMinutes('tphc_6h')).toBe(360);
    expect(holdingLimitMinutes('cooling')).toBe(360);
    expect(holdingLimitMinutes('custom', 45)).toBe(45);
    expect(holdingLimitMinutes('none', 45)).toBeNull();
  });

  test('readings and written procedures: TPHC needs both (3-501.19(A)), cooling needs readings only', () => {
    expect(policyNeedsFirstReading('cooling')).toBe(true);
    expect(policyNeedsWrittenProcedure('cooling')).toBe(false);
    expect(policyNeedsWrittenProcedure('tphc_6h')).toBe(true);
    expect(policyNeedsFirstReading('custom')).toBe(false);
  });

  test('only a failed first cooling stage may be reheated (3-501.14(A)(1)); only a quality limit takes a reason', () => {
    expect(actionsAllowedFor('discard')).toEqual(['discarded']);
    expect(actionsAllowedFor('reheat_or_discard')).toEqual(['reheated', 'discarded']);
    expect(actionsAllowedFor('record_reason')).toContain('reason');
  });

  test('needs an action until a fitting one is recorded', () => {
    const over = { status: 'over_limit' as const, requiredAction: 'discard' as const };
    expect(needsHoldingAction(over, [])).toBe(true);
    expect(needsHoldingAction(over, ['reheated'])).toBe(true);
    expect(needsHoldingAction(over, ['discarded'])).toBe(false);
    expect(needsHoldingAction({ status: 'due_soon', requiredAction: null }, [])).toBe(false);
    expect(needsHoldingAction({ status: 'over_limit', requiredAction: 'reheat_or_discard' }, ['reheated'])).toBe(false);
  });

  test('urgency: needing an action first, then due soon before within limit', () => {
    const ranks = [holdingUrgencyRank('within_limit', false), holdingUrgencyRank('over_limit', true), holdingUrgencyRank('due_soon', false)];
    expect(ranks).toEqual([3, 0, 2]);
  });
});
