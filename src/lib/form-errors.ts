import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { isApiError } from './api-client';

/**
 * Puts a server error onto a react-hook-form: each fieldErrors key (equal to the form field name)
 * becomes that field's error; anything else becomes a form-level message under `root.server`.
 * Returns the form-level message, if any, to show above the form.
 */
export function applyServerErrors<T extends FieldValues>(err: unknown, setError: UseFormSetError<T>, fieldNames?: readonly string[]): string | undefined {
  if (!isApiError(err)) {
    setError('root.server' as Path<T>, { type: 'server', message: 'Something went wrong. Try again.' });
    return 'Something went wrong. Try again.';
  }
  let unplaced = false;
  let first = true;
  for (const [name, messages] of Object.entries(err.fieldErrors)) {
    if (fieldNames && !fieldNames.includes(name)) {
      unplaced = true;
      continue;
    }
    setError(name as Path<T>, { type: 'server', message: messages.join(' ') }, { shouldFocus: first });
    first = false;
  }
  const hasFieldErrors = Object.keys(err.fieldErrors).length > 0;
  if (!hasFieldErrors || unplaced || err.code !== 'validation_failed') {
    setError('root.server' as Path<T>, { type: 'server', message: err.message });
    return err.message;
  }
  return undefined;
}
