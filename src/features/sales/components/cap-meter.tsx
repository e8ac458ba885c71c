import type { SalesCapView } from '@shared/contracts/sales';
import { formatCents } from '@shared/domain/sales-cap';
import { StatusBadge } from '@/components/ui/status-badge';

const LEVEL_WORDS = { ok: 'Below 75 %', warn_75: 'Past 75 %', warn_90: 'Past 90 %', over: 'Over the cap' } as const;

/** The year's sales against the cap: word, figure and bar (never colour alone), with the cap's source. */
export function CapMeter({ view }: { view: SalesCapView }) {
  const cap = view.cap;
  if (!cap) {
    return (
      <section aria-labelledby="cap-heading" className="rounded-card border border-hairline bg-surface p-4">
        <h2 id="cap-heading" className="text-lg font-bold">Annual sales cap</h2>
        <p>Your rule profile ({view.profileName}) sets no sales cap: {view.noCapReason}</p>
      </section>
    );
  }
  const pct = Math.min(100, cap.permille / 10);
  const status = cap.level === 'ok' ? 'within-limit' : cap.level === 'over' ? 'over-limit' : 'due-soon';
  return (
    <section aria-labelledby="cap-heading" className="rounded-card border border-hairline bg-surface p-4" data-testid="cap-meter">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id="cap-heading" className="text-lg font-bold">Annual sales cap, {cap.periodYear}</h2>
        <StatusBadge status={status} label={LEVEL_WORDS[cap.level]} />
      </div>
      <p className="mt-2 text-xl tabular">
        {formatCents(cap.totalCents)} of {formatCents(cap.capCents)} ({Math.floor(cap.permille / 10)}.{cap.permille % 10} %)
      </p>
      <div className="relative mt-2 h-4 overflow-hidden rounded-full border border-edge bg-flour" aria-hidden="true">
        <div className={cap.level === 'ok' ? 'h-full bg-pistachio' : cap.level === 'over' ? 'h-full bg-cherry' : 'h-full bg-honey'} style={{ width: `${pct}%` }} />
        {/* Marks at the warning points. */}
        <div className="absolute inset-y-0 left-[75%] w-0.5 bg-ink" />
        <div className="absolute inset-y-0 left-[90%] w-0.5 bg-ink" />
      </div>
      <progress className="sr-only" value={Math.min(cap.totalCents, cap.capCents)} max={cap.capCents} aria-label={`Sales this year: ${Math.floor(cap.permille / 10)} % of the cap`} />
      <p className="mt-2">{cap.message}</p>
      <p className="mt-1 text-sm text-muted">
        Source: {cap.source.citation}{cap.figureYear ? ` (figure for ${cap.figureYear})` : ''}.{' '}
        {cap.source.verified ? null : <StatusBadge status="unverified" />}
        {cap.source.note ? <span className="block">{cap.source.note}</span> : null}
      </p>
      <p className="mt-1 text-sm text-muted">Counted {cap.periodStartDate} to {cap.periodEndDate} in your business’s time zone, from the sales recorded here. Your local rules decide what counts; check with your local health authority.</p>
    </section>
  );
}
