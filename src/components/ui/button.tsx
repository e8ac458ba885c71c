import type { ButtonHTMLAttributes, ReactNode } from 'react';
import { Link, type LinkProps } from 'react-router';
import { cn } from '@/lib/cn';
import { Spinner } from './spinner';

export type ButtonVariant = 'primary' | 'secondary' | 'danger' | 'quiet';
export type ButtonSize = 'md' | 'board';

const VARIANTS: Record<ButtonVariant, string> = {
  primary: 'bg-berry text-white border border-berry hover:bg-[#7a243d]',
  secondary: 'bg-surface text-ink border border-edge hover:bg-berry-soft',
  danger: 'bg-cherry text-white border border-cherry hover:bg-[#9a1f18]',
  quiet: 'bg-transparent text-berry border border-transparent hover:bg-berry-soft underline-offset-2',
};
// md: 40 px tall (≥ 24 px target); board: 48 px for the Kitchen board (≥ 44 px).
const SIZES: Record<ButtonSize, string> = {
  md: 'min-h-10 px-4 text-base',
  board: 'min-h-12 px-5 text-board',
};

export function buttonClasses(variant: ButtonVariant = 'primary', size: ButtonSize = 'md', className?: string): string {
  return cn(
    'inline-flex items-center justify-center gap-2 rounded-control font-bold no-underline transition-colors',
    'disabled:cursor-not-allowed disabled:opacity-60 aria-disabled:cursor-not-allowed aria-disabled:opacity-60',
    VARIANTS[variant],
    SIZES[size],
    className,
  );
}

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: ButtonVariant;
  size?: ButtonSize;
  /** Shows a spinner and blocks repeat clicks while a request is running. */
  isBusy?: boolean;
  icon?: ReactNode;
}

export function Button({ variant = 'primary', size = 'md', isBusy, icon, className, children, type = 'button', disabled, ...rest }: ButtonProps) {
  return (
    <button type={type} className={buttonClasses(variant, size, className)} disabled={disabled || isBusy} aria-busy={isBusy || undefined} {...rest}>
      {isBusy ? <Spinner size="sm" /> : icon}
      {children}
    </button>
  );
}

/** A link that looks like a button (navigation, not an action). */
export function ButtonLink({ variant = 'secondary', size = 'md', className, ...rest }: LinkProps & { variant?: ButtonVariant; size?: ButtonSize }) {
  return <Link className={buttonClasses(variant, size, className)} {...rest} />;
}
