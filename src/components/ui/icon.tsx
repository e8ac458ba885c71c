import { cn } from '@/lib/cn';

// Our own simple line icons (24 × 24, stroke). Decorative by default: the word beside it carries meaning.
const PATHS = {
  board: 'M4 4h7v7H4zM13 4h7v4h-7zM13 10h7v10h-7zM4 13h7v7H4z',
  batch: 'M5 9h14l-1.5 10h-11zM8 9V6a4 4 0 0 1 8 0v3',
  recipe: 'M6 3h9l3 3v15H6zM9 9h6M9 13h6M9 17h4',
  ingredient: 'M8 3h8M9 3v4l-4 6v8h14v-8l-4-6V3M5 14h14',
  cleaning: 'M12 3v7M8 10h8l1 4H7zM7 14l-1 7M17 14l1 7M12 14v7',
  label: 'M3 12V4h8l10 10-8 8zM7.5 7.5h.01',
  records: 'M5 4h14v16H5zM9 8h6M9 12h6M9 16h3',
  trace: 'M11 4a7 7 0 1 0 0 14 7 7 0 0 0 0-14zM16 16l5 5',
  sales: 'M4 6h16v12H4zM4 10h16M8 15h3',
  team: 'M9 11a3 3 0 1 0 0-6 3 3 0 0 0 0 6zM3 20a6 6 0 0 1 12 0M16 5a3 3 0 0 1 0 6M18 14a5 5 0 0 1 3 6',
  settings: 'M12 9a3 3 0 1 0 0 6 3 3 0 0 0 0-6zM12 2v3M12 19v3M2 12h3M19 12h3M4.9 4.9l2.1 2.1M17 17l2.1 2.1M4.9 19.1 7 17M17 7l2.1-2.1',
  mail: 'M3 6h18v12H3zM3 6l9 7 9-7',
  account: 'M12 12a4 4 0 1 0 0-8 4 4 0 0 0 0 8zM4 21a8 8 0 0 1 16 0',
  menu: 'M4 6h16M4 12h16M4 18h16',
  close: 'M6 6l12 12M18 6 6 18',
  check: 'M5 12.5 10 17 19 7',
  clock: 'M12 3a9 9 0 1 0 0 18 9 9 0 0 0 0-18zM12 7v5l3 3',
  alert: 'M12 3 2 20h20zM12 10v4M12 17h.01',
  cross: 'M12 3a9 9 0 1 0 0 18 9 9 0 0 0 0-18zM9 9l6 6M15 9l-6 6',
  question: 'M12 3a9 9 0 1 0 0 18 9 9 0 0 0 0-18zM9.5 9.5a2.5 2.5 0 1 1 3.5 2.3c-.6.3-1 .9-1 1.6V14M12 17h.01',
  pen: 'M4 20h4L19 9l-4-4L4 16zM13 7l4 4',
  pause: 'M12 3a9 9 0 1 0 0 18 9 9 0 0 0 0-18zM10 9v6M14 9v6',
  release: 'M12 3a9 9 0 1 0 0 18 9 9 0 0 0 0-18zM8 12l3 3 5-6',
  bin: 'M4 7h16M9 7V4h6v3M6 7l1 13h10l1-13M10 11v6M14 11v6',
  progress: 'M12 3a9 9 0 1 0 9 9M12 3v9h9',
  recall: 'M12 3 2 20h20zM12 9v5M12 17h.01M7 20',
  empty: 'M4 8h16v12H4zM4 8l3-4h10l3 4M9 13h6',
  info: 'M12 3a9 9 0 1 0 0 18 9 9 0 0 0 0-18zM12 11v6M12 7.5h.01',
  soldOut: 'M4 6h16v12H4zM7 15 17 9',
  sort: 'M8 10l4-4 4 4M8 14l4 4 4-4',
  sortUp: 'M8 14l4-4 4 4',
  sortDown: 'M8 10l4 4 4-4',
  signOut: 'M10 4H5v16h5M14 8l4 4-4 4M18 12H9',
  search: 'M11 4a7 7 0 1 0 0 14 7 7 0 0 0 0-14zM16 16l5 5',
} as const;

export type IconName = keyof typeof PATHS;

export function Icon({ name, className, label }: { name: IconName; className?: string; label?: string }) {
  return (
    <svg
      viewBox="0 0 24 24"
      fill="none"
      stroke="currentColor"
      strokeWidth={2}
      strokeLinecap="round"
      strokeLinejoin="round"
      className={cn('size-5 shrink-0', className)}
      aria-hidden={label ? undefined : true}
      role={label ? 'img' : undefined}
      aria-label={label}
      focusable="false"
    >
      <path d={PATHS[name]} />
    </svg>
  );
}
