import { cloneElement, isValidElement, useId, type InputHTMLAttributes, type ReactElement, type ReactNode, type Ref } from 'react';
import { cn } from '@/lib/cn';

export const controlClasses = cn(
  'block w-full min-h-10 rounded-control border border-edge bg-surface px-3 py-2 text-base text-ink',
  'placeholder:text-muted aria-[invalid=true]:border-cherry aria-[invalid=true]:border-2',
  'disabled:bg-flour disabled:text-muted',
);

export interface FieldShellProps {
  label: ReactNode;
  /** Units, format or example ("°C", "24 h time, e.g. 14:30"). */
  hint?: ReactNode;
  error?: string;
  isOptional?: boolean;
  className?: string;
  /** One form control; it receives id, aria-describedby and aria-invalid. */
  children: ReactElement<{ id?: string; 'aria-describedby'?: string; 'aria-invalid'?: boolean }>;
}

/** Label, hint and error for any control, tied together with id and aria-describedby. */
export function FieldShell({ label, hint, error, isOptional, className, children }: FieldShellProps) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(' ') || undefined;
  const control = isValidElement(children) ? cloneElement(children, { id, 'aria-describedby': describedBy, 'aria-invalid': error ? true : undefined }) : children;
  return (
    <div className={cn('space-y-1', className)}>
      <label htmlFor={id} className="block font-bold">
        {label}
        {isOptional ? <span className="font-normal text-muted"> (optional)</span> : null}
      </label>
      {hint ? (
        <p id={hintId} className="text-sm text-muted">
          {hint}
        </p>
      ) : null}
      {control}
      {error ? <FieldError id={errorId!}>{error}</FieldError> : null}
    </div>
  );
}

export function FieldError({ id, children }: { id: string; children: ReactNode }) {
  return (
    <p id={id} className="flex items-start gap-1 text-sm font-bold text-cherry">
      <span aria-hidden="true">✕</span>
      <span>
        <span className="sr-only">Error: </span>
        {children}
      </span>
    </p>
  );
}

export interface FieldProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'className'> {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  isOptional?: boolean;
  className?: string;
  inputClassName?: string;
  ref?: Ref<HTMLInputElement>;
}

/** A labelled text-like input; spread react-hook-form's `register('name')` into it. */
export function Field({ label, hint, error, isOptional, className, inputClassName, ref, ...input }: FieldProps) {
  return (
    <FieldShell label={label} hint={hint} error={error} isOptional={isOptional} className={className}>
      <input ref={ref} className={cn(controlClasses, inputClassName)} {...input} />
    </FieldShell>
  );
}

/** A form-level error summary (role=alert), for messages that belong to no single field. */
export function FormError({ message }: { message?: string }) {
  if (!message) return null;
  return (
    <div role="alert" className="flex gap-2 rounded-card border border-cherry bg-cherry-soft p-3 font-bold text-ink">
      <span aria-hidden="true" className="text-cherry">✕</span>
      <span>{message}</span>
    </div>
  );
}
