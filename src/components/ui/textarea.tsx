import type { ReactNode, Ref, TextareaHTMLAttributes } from 'react';
import { cn } from '@/lib/cn';
import { controlClasses, FieldShell } from './field';

export interface TextareaProps extends Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, 'className'> {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  isOptional?: boolean;
  className?: string;
  ref?: Ref<HTMLTextAreaElement>;
}

/** A labelled multi-line input; spread react-hook-form's `register('name')` into it. */
export function Textarea({ label, hint, error, isOptional, className, ref, rows = 4, ...textarea }: TextareaProps) {
  return (
    <FieldShell label={label} hint={hint} error={error} isOptional={isOptional} className={className}>
      <textarea ref={ref} rows={rows} className={cn(controlClasses, 'min-h-24')} {...textarea} />
    </FieldShell>
  );
}
