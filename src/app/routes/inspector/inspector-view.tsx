import { useEffect, type ReactNode } from 'react';
import { useQuery } from '@tanstack/react-query';
import { formatZonedDateTime } from '@shared/domain/zoned-time';
import { isApiError } from '@/lib/api-client';
import { Button } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { LoadingBlock } from '@/components/ui/spinner';
import { inspectorQueries } from '@/features/inspector/api';
import { InspectorRecordsView } from '@/features/inspector/components/inspector-records';
import { AllergenMatrixTable } from '@/features/recipes/components/allergen-matrix-table';
import type { AllergenMatrix } from '@shared/contracts/recipes';
import { InspectorPacketButton } from '@/features/inspector/components/inspector-packet-button';

import { RouteErrorBoundary, StandaloneFrame } from '../../route-error';

export function ErrorBoundary() {
  return <StandaloneFrame><RouteErrorBoundary /></StandaloneFrame>;
}

/** The inspector's own frame: no member navigation, a permanent read-only label. */
function InspectorFrame({ children }: { children: ReactNode }) {
  return (
    <div className="min-h-screen">
      <a href="#main" className="skip-link sr-only focus:not-sr-only focus:absolute focus:left-4 focus:top-4 focus:z-50 focus:rounded-control focus:bg-surface focus:p-3">
        Skip to main content
      </a>
      <header className="border-b border-hairline bg-surface">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-4 gap-y-1 px-4 py-3">
          <span className="flex items-center gap-2">
            <span aria-hidden="true" className="inline-block size-3 rounded-full bg-berry" />
            <span className="text-xl font-black tracking-tight">Crumbtrail</span>
          </span>
          <p className="rounded-full border border-blueberry px-3 py-0.5 text-sm font-bold text-blueberry">Inspector view — read only</p>
        </div>
      </header>
      <main id="main" tabIndex={-1} className="mx-auto max-w-6xl px-4 py-6 sm:py-8">
        {children}
      </main>
    </div>
  );
}

/** The link expired, was revoked, or its session ended: say so plainly, with no way further in. */
function LinkEnded() {
  return (
    <section aria-labelledby="link-ended" className="max-w-prose space-y-3">
      <h1 id="link-ended" className="text-2xl font-bold">This link has expired or was revoked</h1>
      <p>The records it opened are no longer available from this browser.</p>
      <p>If you still need them, ask the business for a new inspection link.</p>
    </section>
  );
}

function NotAnInspector() {
  return (
    <section aria-labelledby="not-inspector" className="max-w-prose space-y-3">
      <h1 id="not-inspector" className="text-2xl font-bold">This page opens from an inspection link</h1>
      <p>Open the link the business sent you. Members of the business see their records from the Records screen.</p>
    </section>
  );
}

const isEnded = (err: unknown) => isApiError(err) && (err.status === 401 || err.status === 410);

/** GET /inspector: what an inspector's link shows, for its date range only. */
export function Component() {
  const session = useQuery({ ...inspectorQueries.session(), retry: false });
  const isActive = session.isSuccess;
  const records = useQuery({ ...inspectorQueries.records(), enabled: isActive, retry: false });
  const matrix = useQuery({ ...inspectorQueries.allergenMatrix(), enabled: isActive, retry: false });

  useEffect(() => {
    document.title = session.data ? `${session.data.businessName} records (inspector view) · Crumbtrail` : 'Inspector view · Crumbtrail';
  }, [session.data]);

  if (session.isPending) return <InspectorFrame><LoadingBlock label="Opening the records…" /></InspectorFrame>;
  if (isEnded(session.error) || isEnded(records.error) || isEnded(matrix.error)) return <InspectorFrame><LinkEnded /></InspectorFrame>;
  if (session.isError) {
    if (isApiError(session.error) && session.error.status === 403) return <InspectorFrame><NotAnInspector /></InspectorFrame>;
    throw session.error;
  }
  const s = session.data;
  const expires = formatZonedDateTime(new Date(s.expiresAt), s.timeZone);
  return (
    <InspectorFrame>
      <div className="space-y-6">
        <div className="flex flex-wrap items-end justify-between gap-4">
          <div className="min-w-0">
            <h1 className="text-2xl font-bold sm:text-3xl">{s.businessName}</h1>
            <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1">
              {s.businessAddress ? <><dt className="font-bold">Address</dt><dd>{s.businessAddress}</dd></> : null}
              {s.registrationNumber ? <><dt className="font-bold">Registration</dt><dd className="tabular">{s.registrationNumber}</dd></> : null}
              <dt className="font-bold">Records from</dt><dd className="tabular">{s.rangeFrom} to {s.rangeTo}</dd>
              <dt className="font-bold">Shared with</dt><dd>{s.inspectorName}</dd>
              <dt className="font-bold">Link works until</dt><dd className="tabular">{expires} ({s.timeZone})</dd>
            </dl>
          </div>
          <div className="flex flex-wrap gap-3" data-print="hide">
            {s.packetAvailable ? <InspectorPacketButton /> : null}
            <Button variant="secondary" onClick={() => window.print()}>Print these records</Button>
          </div>
        </div>

        <CautionBox title="Local rules decide">
          <p>
            These are the business's own records, shown as kept in Crumbtrail. Whether they meet the requirements is for the local
            rules and the local health authority to decide; Crumbtrail does not certify compliance.
          </p>
        </CautionBox>

        {records.isPending || matrix.isPending ? <LoadingBlock label="Loading the records…" /> : null}
        {records.isError && !isEnded(records.error) ? <p role="alert">The records could not be loaded. Reload the page to try again.</p> : null}
        {records.data ? <InspectorRecordsView records={records.data} timeZone={s.timeZone} /> : null}
        {matrix.data ? <InspectorAllergenMatrix matrix={matrix.data} /> : null}
        {matrix.isError && !isEnded(matrix.error) ? <p role="alert">The allergen matrix could not be loaded. Reload the page to try again.</p> : null}
      </div>
    </InspectorFrame>
  );
}

/** Products × allergens for the inspector: read only, no links into member screens. */
function InspectorAllergenMatrix({ matrix }: { matrix: AllergenMatrix }) {
  return (
    <section aria-labelledby="insp-allergens" className="space-y-2">
      <h2 id="insp-allergens" className="text-xl font-bold">Allergen matrix</h2>
      <p className="text-sm text-muted">
        Current version of every product, allergens as listed for {matrix.regime.code} rules of {matrix.regime.ruleSetDate}.
      </p>
      {matrix.products.length === 0 ? <p className="text-muted">No products for sale.</p> : (
        <AllergenMatrixTable matrix={matrix} testId="inspector-allergen-matrix" warningLabel="Not yet confirmed:" productCell={(p) => <span className="font-bold">{p.name}</span>} />
      )}
    </section>
  );
}
