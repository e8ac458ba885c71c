import type { ReactNode } from 'react';
import type { InspectorRecords } from '@shared/contracts/inspector';
import { DOCUMENT_KIND_LABELS } from '@shared/contracts/documents';
import { BATCH_STATES, type BatchState } from '@shared/domain/batch-states';
import { formatZonedDateTime } from '@shared/domain/zoned-time';
import { StatusBadge } from '@/components/ui/status-badge';
import { BatchStateBadge } from '@/features/batches/components/batch-state-badge';
import { inspectorDocumentUrl } from '../api';

// Food Code 2022 sections as the holding feature cites them.
const POLICY_WORDS: Record<string, string> = {
  none: 'No limit (timer only)',
  custom: 'Own quality limit (not a food-safety limit)',
  tphc_4h: 'Time as a public health control, 4 hours (FDA Food Code 2022 3-501.19(B))',
  tphc_6h: 'Time as a public health control, 6 hours, cold food (FDA Food Code 2022 3-501.19(C))',
  cooling: 'Cooling (FDA Food Code 2022 3-501.14)',
};
const KIND_WORDS: Record<string, string> = { resting: 'Resting', cooling: 'Cooling', setting: 'Setting', display: 'On display', custom: 'Other' };
const ACTION_WORDS: Record<string, string> = { discarded: 'Discarded', reheated: 'Reheated', reason: 'Closed with a reason' };
const RUN_STATUS_WORDS: Record<string, string> = { in_progress: 'In progress', ready_to_sign: 'Not signed yet', signed: 'Signed', signature_invalid: 'Signature invalid' };

const cell = 'border border-edge p-2 align-top';
const head = 'border border-edge p-2 text-left';

function Section({ id, title, count, children }: { id: string; title: string; count: number; children: ReactNode }) {
  return (
    <section aria-labelledby={id} className="space-y-2 break-inside-avoid-page">
      <h2 id={id} className="text-xl font-bold">
        {title} <span className="text-base font-normal text-muted">({count})</span>
      </h2>
      {count === 0 ? <p className="text-muted">None in this date range.</p> : <div className="relative overflow-x-auto">{children}</div>}
    </section>
  );
}

const minutes = (m: number | null) => (m == null ? 'No limit' : m % 60 === 0 ? `${m / 60} h` : `${Math.floor(m / 60)} h ${m % 60} min`);
const isBatchState = (s: string): s is BatchState => (BATCH_STATES as readonly string[]).includes(s);

/** The records of the link's range as plain, printable tables (read only: no controls). */
export function InspectorRecordsView({ records, timeZone }: { records: InspectorRecords; timeZone: string }) {
  const at = (iso: string) => formatZonedDateTime(new Date(iso), timeZone);
  return (
    <div className="space-y-8">
      <Section id="insp-batches" title="Batches" count={records.batches.length}>
        <table className="min-w-full border-collapse">
          <caption className="sr-only">Batches made in the date range, with their current state</caption>
          <thead><tr><th scope="col" className={head}>Lot</th><th scope="col" className={head}>Product</th><th scope="col" className={head}>Made on</th><th scope="col" className={head}>State</th></tr></thead>
          <tbody>
            {records.batches.map((b) => (
              <tr key={b.id}>
                <th scope="row" className={`${cell} text-left font-bold tabular whitespace-nowrap`}>{b.lotCode}</th>
                <td className={cell}>{b.productName}</td>
                <td className={`${cell} tabular`}>{b.madeOn}</td>
                <td className={cell}>{isBatchState(b.state) ? <BatchStateBadge state={b.state} /> : b.state}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>

      <Section id="insp-holding" title="Holding periods" count={records.holdingPeriods.length}>
        <table className="min-w-full border-collapse">
          <caption className="sr-only">Holding periods started in the date range, with their time limit and any corrective action</caption>
          <thead><tr><th scope="col" className={head}>Lot</th><th scope="col" className={head}>What</th><th scope="col" className={head}>Limit</th><th scope="col" className={head}>Started</th><th scope="col" className={head}>Ended</th><th scope="col" className={head}>Corrective actions</th></tr></thead>
          <tbody>
            {records.holdingPeriods.map((h) => (
              <tr key={h.id}>
                <th scope="row" className={`${cell} text-left font-bold tabular whitespace-nowrap`}>{h.lotCode}</th>
                <td className={cell}>{KIND_WORDS[h.kind] ?? h.kind}</td>
                <td className={cell}>{minutes(h.limitMinutes)}<span className="block text-sm text-muted">{POLICY_WORDS[h.policy] ?? h.policy}</span></td>
                <td className={`${cell} tabular`}>{at(h.startedAt)}<span className="block text-sm text-muted">by {h.startedByName}</span></td>
                <td className={`${cell} tabular`}>{h.stoppedAt ? at(h.stoppedAt) : 'Not ended'}</td>
                <td className={cell}>
                  {h.actions.length === 0 ? <span className="text-muted">None</span> : (
                    <ul className="space-y-1">
                      {h.actions.map((a, i) => <li key={i}><strong>{ACTION_WORDS[a.action] ?? a.action}</strong>{a.reason ? `: ${a.reason}` : ''} <span className="text-sm text-muted">({at(a.recordedAt)}, {a.recordedByName})</span></li>)}
                    </ul>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>

      <Section id="insp-cleaning" title="Cleaning and sanitising" count={records.cleaningRuns.length}>
        <table className="min-w-full border-collapse">
          <caption className="sr-only">Cleaning runs in the date range with their signatures</caption>
          <thead><tr><th scope="col" className={head}>Checklist</th><th scope="col" className={head}>Date</th><th scope="col" className={head}>Status</th><th scope="col" className={head}>Signature</th></tr></thead>
          <tbody>
            {records.cleaningRuns.map((r) => (
              <tr key={r.id}>
                <th scope="row" className={`${cell} text-left font-bold`}>{r.templateName}{r.batchLotCode ? <span className="block text-sm font-normal text-muted">for lot {r.batchLotCode}</span> : null}</th>
                <td className={`${cell} tabular`}>{r.runDate}</td>
                <td className={cell}>
                  {r.status === 'signed' ? <StatusBadge status="signed" /> : r.status === 'signature_invalid' ? <StatusBadge status="failed" label="Signature invalid" /> : <StatusBadge status="in-progress" label={RUN_STATUS_WORDS[r.status] ?? r.status} />}
                </td>
                <td className={cell}>
                  {r.signature ? <>{r.signature.printedName}, {r.signature.meaning}<span className="block text-sm text-muted tabular">{r.signature.signedAtLocal} · {r.signature.validityText}</span></> : <span className="text-muted">Not signed</span>}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>

      <Section id="insp-documents" title="Permits and certificates" count={records.documents.length}>
        <table className="min-w-full border-collapse">
          <caption className="sr-only">The business's current documents, with downloads</caption>
          <thead><tr><th scope="col" className={head}>Document</th><th scope="col" className={head}>Kind</th><th scope="col" className={head}>Issued</th><th scope="col" className={head}>Expires</th></tr></thead>
          <tbody>
            {records.documents.map((d) => (
              <tr key={d.versionId}>
                <th scope="row" className={`${cell} text-left`}>
                  <a className="font-bold text-berry underline print:text-black print:no-underline" href={inspectorDocumentUrl(d.documentId, d.versionId)} download>
                    {d.title}<span className="sr-only"> (download)</span>
                  </a>
                </th>
                <td className={cell}>{DOCUMENT_KIND_LABELS[d.kind as keyof typeof DOCUMENT_KIND_LABELS] ?? d.kind}</td>
                <td className={`${cell} tabular`}>{d.issuedOn}</td>
                <td className={`${cell} tabular`}>{d.expiresOn ?? 'Does not expire'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Section>

      <Section id="insp-history" title="Record history" count={records.recordEvents.length}>
        <details className="rounded-card border border-hairline bg-surface p-3 print:border-0 print:p-0" open={records.recordEvents.length <= 20}>
          <summary className="cursor-pointer font-bold" data-print="hide">Every recorded change in the range, oldest first</summary>
          <table className="mt-2 min-w-full border-collapse text-sm">
            <caption className="sr-only">Recorded changes in the date range</caption>
            <thead><tr><th scope="col" className={head}>No.</th><th scope="col" className={head}>When</th><th scope="col" className={head}>Record</th><th scope="col" className={head}>Change</th><th scope="col" className={head}>By</th></tr></thead>
            <tbody>
              {records.recordEvents.map((e) => (
                <tr key={e.seq}>
                  <th scope="row" className={`${cell} text-left font-normal tabular`}>{e.seq}</th>
                  <td className={`${cell} tabular`}>{at(e.occurredAt)}</td>
                  <td className={cell}>{e.entityType.replaceAll('_', ' ')}</td>
                  <td className={cell}>{e.action.replaceAll('_', ' ')}</td>
                  <td className={cell}>{e.actorName}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </details>
      </Section>
    </div>
  );
}
