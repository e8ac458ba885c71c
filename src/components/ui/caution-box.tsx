import type { ReactNode } from 'react';
import { useId } from 'react';
import { Icon } from './icon';

/**
 * THE pattern for food-safety cautions and "local rules decide": honey-soft background, honey icon,
 * ink text, and a heading that says what the caution is about.
 */
export function CautionBox({ title, children, headingLevel = 2 }: { title: string; children: ReactNode; headingLevel?: 2 | 3 | 4 }) {
  const id = useId();
  const Heading = `h${headingLevel}` as 'h2' | 'h3' | 'h4';
  return (
    <aside aria-labelledby={id} className="flex gap-3 rounded-card border border-honey bg-honey-soft p-4 text-ink">
      <Icon name="alert" className="mt-0.5 size-6 text-honey" />
      <div className="min-w-0">
        <Heading id={id} className="font-bold">
          <span className="sr-only">Caution: </span>
          {title}
        </Heading>
        <div className="mt-1 space-y-2">{children}</div>
      </div>
    </aside>
  );
}
