import type { ReactNode, Ref, SelectHTMLAttributes } from 'react';
import { cn } from '@/lib/cn';
import { controlClasses, FieldShell } from './field';

export interface SelectOption {
  value: string;
  label: string;
}

export interface SelectProps extends Omit<SelectHTMLAttributes<HTMLSelectElement>, 'className'> {
  label: ReactNode;
  options: readonly SelectOption[];
  hint?: ReactNode;
  error?: string;
  isOptional?: boolean;
  /** A first, empty choice ("Choose a role"). */
  placeholder?: string;
  className?: string;
  ref?: Ref<HTMLSelectElement>;
}

/** A labelled native select; spread react-hook-form's `register('name')` into it. */
export function Select({ label, options, hint, error, isOptional, placeholder, className, ref, ...select }: SelectProps) {
  return (
    <FieldShell label={label} hint={hint} error={error} isOptional={isOptional} className={className}>
      <select ref={ref} className={cn(controlClasses, 'pr-8')} {...select}>
        {placeholder ? <option value="">{placeholder}</option> : null}
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </FieldShell>
  );
}
