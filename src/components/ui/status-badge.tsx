import { cn } from '@/lib/cn';
import { Icon, type IconName } from './icon';

export const STATUSES = [
  'within-limit',
  'due-soon',
  'over-limit',
  'needs-review',
  'unverified',
  'signed',
  'failed',
  'recalled',
  'held',
  'released',
  'discarded',
  'in-progress',
  'sold-out',
] as const;
export type Status = (typeof STATUSES)[number];

type Tone = 'good' | 'attention' | 'bad' | 'neutral' | 'info';
const TONES: Record<Tone, string> = {
  good: 'bg-pistachio-soft text-pistachio border-pistachio',
  attention: 'bg-honey-soft text-honey border-honey',
  bad: 'bg-cherry-soft text-cherry border-cherry',
  neutral: 'bg-surface text-muted border-edge',
  info: 'bg-surface text-blueberry border-blueberry',
};

// Word + icon + colour, always all three (never colour alone).
const STATUS_STYLE: Record<Status, { label: string; icon: IconName; tone: Tone }> = {
  'within-limit': { label: 'Within limit', icon: 'check', tone: 'good' },
  'due-soon': { label: 'Due soon', icon: 'clock', tone: 'attention' },
  'over-limit': { label: 'Over limit', icon: 'alert', tone: 'bad' },
  'needs-review': { label: 'Needs review', icon: 'question', tone: 'attention' },
  unverified: { label: 'Unverified', icon: 'question', tone: 'attention' },
  signed: { label: 'Signed', icon: 'pen', tone: 'good' },
  failed: { label: 'Failed', icon: 'cross', tone: 'bad' },
  recalled: { label: 'Recalled', icon: 'recall', tone: 'bad' },
  held: { label: 'Held', icon: 'pause', tone: 'attention' },
  released: { label: 'Released', icon: 'release', tone: 'good' },
  discarded: { label: 'Discarded', icon: 'bin', tone: 'bad' },
  'in-progress': { label: 'In progress', icon: 'progress', tone: 'info' },
  'sold-out': { label: 'Sold out', icon: 'soldOut', tone: 'neutral' },
};

/** A state shown as word, icon and colour; `label` overrides the word ("Over limit by 12 min"). */
export function StatusBadge({ status, label, size = 'md', className }: { status: Status; label?: string; size?: 'md' | 'board'; className?: string }) {
  const style = STATUS_STYLE[status];
  return (
    <span
      className={cn(
        'inline-flex items-center gap-1.5 rounded-full border font-bold whitespace-nowrap',
        size === 'board' ? 'px-3 py-1.5 text-board' : 'px-2.5 py-0.5 text-sm',
        TONES[style.tone],
        className,
      )}
    >
      <Icon name={style.icon} className={size === 'board' ? 'size-6' : 'size-4'} />
      {label ?? style.label}
    </span>
  );
}
