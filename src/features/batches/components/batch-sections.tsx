import type { ComponentType } from 'react';
import type { BatchDetail } from '@shared/contracts/batches';

/** A section of the batch page that another feature fills (holding times, cleanings, labels, sales). */
export interface BatchSection {
  id: string;
  title: string;
  /** Lower comes first. */
  order: number;
  Component: ComponentType<{ batch: BatchDetail }>;
}

function Placeholder({ text }: { text: string }) {
  return <p className="text-muted">{text}</p>;
}

const placeholder = (id: string, title: string, order: number, text: string): BatchSection => ({
  id, title, order, Component: () => <Placeholder text={text} />,
});

/**
 * The batch page's extra sections. A feature replaces its placeholder by calling registerBatchSection
 * with the same id from a module its screens import (e.g. src/features/holding/components/...).
 */
export const BATCH_SECTIONS: BatchSection[] = [
  placeholder('holding', 'Holding times', 10, 'Holding times for this batch will show here.'),
  placeholder('cleanings', 'Cleanings', 20, 'Cleanings logged around this batch will show here.'),
  placeholder('labels', 'Labels', 30, 'Labels printed for this batch will show here.'),
  placeholder('sales', 'Sales', 40, 'Sales of this batch will show here.'),
];

/** Adds a section, or replaces the one with the same id. */
export function registerBatchSection(section: BatchSection): void {
  const i = BATCH_SECTIONS.findIndex((s) => s.id === section.id);
  if (i >= 0) BATCH_SECTIONS[i] = section;
  else BATCH_SECTIONS.push(section);
}

/** Renders every registered section in order. */
export function BatchSections({ batch }: { batch: BatchDetail }) {
  return (
    <>
      {[...BATCH_SECTIONS].sort((a, b) => a.order - b.order).map(({ id, title, Component }) => (
        <section key={id} aria-labelledby={`batch-section-${id}`} className="rounded-card border border-hairline bg-surface p-4 sm:p-6">
          <h2 id={`batch-section-${id}`} className="text-xl font-bold">{title}</h2>
          <div className="mt-3"><Component batch={batch} /></div>
        </section>
      ))}
    </>
  );
}
