import { cn } from '@/lib/cn';

/** A turning ring; decorative unless given a label. */
export function Spinner({ size = 'md', label, className }: { size?: 'sm' | 'md' | 'lg'; label?: string; className?: string }) {
  const dims = { sm: 'size-4 border-2', md: 'size-6 border-[3px]', lg: 'size-10 border-4' }[size];
  return (
    <span role={label ? 'status' : undefined} className={cn('inline-flex items-center gap-2', className)}>
      <span aria-hidden="true" className={cn('inline-block animate-spin rounded-full border-current border-r-transparent motion-reduce:animate-none', dims)} />
      {label ? <span>{label}</span> : null}
    </span>
  );
}

/** A full-width loading state for a screen or panel. */
export function LoadingBlock({ label = 'Loading…' }: { label?: string }) {
  return (
    <div className="flex min-h-40 items-center justify-center text-muted">
      <Spinner size="md" label={label} />
    </div>
  );
}

/** A determinate progress bar with its value in words. */
export function ProgressBar({ value, max = 100, label }: { value: number; max?: number; label: string }) {
  const pct = Math.max(0, Math.min(100, (value / max) * 100));
  return (
    <div>
      <div className="mb-1 flex justify-between text-sm">
        <span>{label}</span>
        <span className="tabular">{Math.round(pct)}%</span>
      </div>
      <progress className="sr-only" value={value} max={max} aria-label={label} />
      <div aria-hidden="true" className="h-2 overflow-hidden rounded-full border border-edge bg-surface">
        <div className="h-full bg-berry" style={{ width: `${pct}%` }} />
      </div>
    </div>
  );
}
