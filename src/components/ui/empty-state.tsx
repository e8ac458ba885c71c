import type { ReactNode } from 'react';
import { Icon, type IconName } from './icon';

/** What a list or screen shows when there is nothing in it yet, with the next step. */
export function EmptyState({ title, children, icon = 'empty', action }: { title: string; children?: ReactNode; icon?: IconName; action?: ReactNode }) {
  return (
    <section className="rounded-card border border-hairline bg-surface px-6 py-10 text-center" aria-label={title}>
      <Icon name={icon} className="mx-auto mb-3 size-10 text-muted" />
      <h2 className="text-xl font-bold">{title}</h2>
      {children ? <div className="mx-auto mt-2 max-w-prose text-muted">{children}</div> : null}
      {action ? <div className="mt-5 flex justify-center gap-3">{action}</div> : null}
    </section>
  );
}
