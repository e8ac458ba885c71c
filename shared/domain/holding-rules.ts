import type { HoldingAction, HoldingEvaluation, HoldingPolicy } from './holding-policies';
import { HOLDING_POLICIES } from './holding-policies';

/** What was recorded after a limit was passed. */
export type RecordedHoldingAction = 'discarded' | 'reheated' | 'reason';

/**
 * Reads a stored policy name, accepting both spellings in use ('tphc-4h' in rule profiles, 'tphc_4h'
 * in holding evaluation). Unknown or empty → null.
 */
export function normalizeHoldingPolicy(value: string | null | undefined): HoldingPolicy | null {
  if (!value) return null;
  const v = value.trim().toLowerCase().replace(/-/g, '_');
  return (HOLDING_POLICIES as readonly string[]).includes(v) ? (v as HoldingPolicy) : null;
}

/**
 * The whole limit in minutes for a policy, as snapshotted at the start: TPHC 4 h (FDA Food Code 2022
 * 3-501.19(B)), 6 h (3-501.19(C)), cooling 6 h in all (3-501.14(A)); custom = the bakery's own; none = null.
 */
export function holdingLimitMinutes(policy: HoldingPolicy, customLimitMinutes?: number | null): number | null {
  switch (policy) {
    case 'none': return null;
    case 'custom': return customLimitMinutes ?? null;
    case 'tphc_4h': return 240;
    case 'tphc_6h': return 360;
    case 'cooling': return 360;
  }
}

/** Policies whose evaluation needs a temperature at the start (3-501.19(B)(1), (C)(1); 3-501.14). */
export function policyNeedsFirstReading(policy: HoldingPolicy): boolean {
  return policy === 'tphc_4h' || policy === 'tphc_6h' || policy === 'cooling';
}

/** Time as a public health control needs written procedures prepared in advance (3-501.19(A)). */
export function policyNeedsWrittenProcedure(policy: HoldingPolicy): boolean {
  return policy === 'tphc_4h' || policy === 'tphc_6h';
}

/** A short name for people: 'Time as a public health control, 4 h (Food Code 3-501.19(B))'. */
export function holdingPolicyName(policy: HoldingPolicy, customLimitMinutes?: number | null): string {
  switch (policy) {
    case 'none': return 'No limit (timer only)';
    case 'custom': return `Own quality limit, ${customLimitMinutes ?? '?'} min`;
    case 'tphc_4h': return 'Time as a public health control, 4 h (Food Code 3-501.19(B))';
    case 'tphc_6h': return 'Time as a public health control, 6 h, cold food (Food Code 3-501.19(C))';
    case 'cooling': return 'Two-stage cooling, 2 h + 6 h (Food Code 3-501.14)';
  }
}

/** Which recorded actions answer a required action: reheating only a failed first cooling stage, a reason only a quality limit. */
export function actionsAllowedFor(required: HoldingAction): RecordedHoldingAction[] {
  switch (required) {
    case 'discard': return ['discarded'];
    case 'reheat_or_discard': return ['reheated', 'discarded'];
    case 'record_reason': return ['reason', 'discarded'];
  }
}

/**
 * True when a period went over a limit and no fitting action has been recorded yet. Such a batch
 * may not be released or labelled.
 */
export function needsHoldingAction(evaluation: Pick<HoldingEvaluation, 'status' | 'requiredAction'>, recorded: readonly RecordedHoldingAction[]): boolean {
  if (evaluation.status !== 'over_limit' || !evaluation.requiredAction) return false;
  const allowed = actionsAllowedFor(evaluation.requiredAction);
  return !recorded.some((a) => allowed.includes(a));
}

/** 0 for periods that need an action, then due soon, within limit, plain timers, then finished ones. */
export function holdingUrgencyRank(status: HoldingEvaluation['status'], needsAction: boolean): number {
  if (needsAction) return 0;
  const order: Record<HoldingEvaluation['status'], number> = { over_limit: 1, not_permitted: 1, due_soon: 2, within_limit: 3, running: 4, completed: 5 };
  return order[status];
}
