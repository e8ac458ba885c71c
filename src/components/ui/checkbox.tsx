import { useId, type InputHTMLAttributes, type ReactNode, type Ref } from 'react';
import { cn } from '@/lib/cn';
import { FieldError } from './field';

export interface CheckboxProps extends Omit<InputHTMLAttributes<HTMLInputElement>, 'type' | 'className'> {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  className?: string;
  ref?: Ref<HTMLInputElement>;
}

/** A checkbox with its label beside it (the whole row is the target); works with `register`. */
export function Checkbox({ label, hint, error, className, ref, ...input }: CheckboxProps) {
  const id = useId();
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  return (
    <div className={cn('space-y-1', className)}>
      <div className="flex items-start gap-3">
        <input
          ref={ref}
          id={id}
          type="checkbox"
          aria-describedby={[hintId, errorId].filter(Boolean).join(' ') || undefined}
          aria-invalid={error ? true : undefined}
          className="mt-0.5 size-6 shrink-0 accent-berry"
          {...input}
        />
        <label htmlFor={id} className="min-h-6 cursor-pointer">
          {label}
        </label>
      </div>
      {hint ? (
        <p id={hintId} className="pl-9 text-sm text-muted">
          {hint}
        </p>
      ) : null}
      {error ? (
        <div className="pl-9">
          <FieldError id={errorId!}>{error}</FieldError>
        </div>
      ) : null}
    </div>
  );
}
