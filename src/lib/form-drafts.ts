import { useEffect } from 'react';
import type { FieldValues, UseFormReturn } from 'react-hook-form';

// Unsaved form input survives a session expiry: drafts live in sessionStorage (this tab only) keyed
// by form id. Secrets never go in: any field whose name mentions a password, code or token is dropped.
const PREFIX = 'crumbtrail:draft:';
const SECRET = /password|passcode|secret|token|pin$/i;

function withoutSecrets(values: unknown): unknown {
  if (Array.isArray(values)) return values.map(withoutSecrets);
  if (values && typeof values === 'object') {
    return Object.fromEntries(Object.entries(values).filter(([k]) => !SECRET.test(k)).map(([k, v]) => [k, withoutSecrets(v)]));
  }
  return values;
}

export function saveDraft(formId: string, values: unknown): void {
  try {
    sessionStorage.setItem(PREFIX + formId, JSON.stringify(withoutSecrets(values)));
  } catch {
    // Storage full or blocked: drafts are a convenience, never required.
  }
}

export function readDraft<T>(formId: string): Partial<T> | undefined {
  try {
    const raw = sessionStorage.getItem(PREFIX + formId);
    return raw ? (JSON.parse(raw) as Partial<T>) : undefined;
  } catch {
    return undefined;
  }
}

export function clearDraft(formId: string): void {
  try {
    sessionStorage.removeItem(PREFIX + formId);
  } catch {
    // ignore
  }
}

/**
 * Keeps a react-hook-form's input as a draft while it is edited and restores it on mount.
 * Call `clearDraft(formId)` after a successful save.
 */
export function useFormDraft<T extends FieldValues>(formId: string, form: UseFormReturn<T>): void {
  const { reset, watch, getValues } = form;
  useEffect(() => {
    const draft = readDraft<T>(formId);
    if (draft) reset({ ...getValues(), ...draft }, { keepDefaultValues: true });
    const sub = watch((values) => saveDraft(formId, values));
    return () => sub.unsubscribe();
  }, [formId, reset, watch, getValues]);
}
