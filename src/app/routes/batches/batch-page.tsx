import { useId, useState, type ReactNode } from 'react';
import { useQuery, useSuspenseQuery, type QueryClient } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router';
import { formatZonedDateTime } from '@shared/domain/zoned-time';
import type { BatchInputRow } from '@shared/contracts/batches';
import { batchQueries } from '@/features/batches/api';
import { BatchStateBadge, BATCH_STATE_LABELS } from '@/features/batches/components/batch-state-badge';
import { BatchSections } from '@/features/batches/components/batch-sections';
// Fills the batch page's holding section.
import '@/features/holding/components/batch-holding-section';
// Fills the batch page's cleanings section.
import '@/features/cleaning/components/batch-cleaning-section';
// Fills the batch page's labels and sales sections.
import '@/features/labels/components/batch-labels-section';
import '@/features/sales/components/batch-sales-section';
import { StateChangeDialog } from '@/features/batches/components/state-change-dialog';
import { CorrectionForm } from '@/features/batches/components/batch-form';
import { useSession } from '@/features/auth/api';
import { teamQueries } from '@/features/team/api';
import { PageHeader } from '@/components/ui/page-header';
import { Button, ButtonLink } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { useToast } from '@/components/ui/toast';
import { batchPath, paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  await qc.ensureQueryData(batchQueries.detail(params.batchId!));
  return null;
};

function InputLine({ input }: { input: BatchInputRow }) {
  if (input.kind === 'batch') {
    return <li>{input.subRecipeName}: from batch <Link className="font-mono text-berry underline" to={batchPath(input.sourceBatchId)}>{input.sourceLotCode}</Link></li>;
  }
  return (
    <li>
      {input.ingredientName}:{' '}
      {input.supplierLotCode ? <span className="font-mono">{input.supplierLotCode}</span> : <strong className="text-cherry">no supplier lot recorded</strong>}
      {input.receivedOn ? <span className="text-muted"> (received {input.receivedOn})</span> : null}
    </li>
  );
}

function Card({ title, children }: { title: string; children: ReactNode }) {
  const id = useId();
  return (
    <section aria-labelledby={id} className="rounded-card border border-hairline bg-surface p-4 sm:p-6">
      <h2 id={id} className="text-xl font-bold">{title}</h2>
      <div className="mt-3">{children}</div>
    </section>
  );
}

export function Component() {
  const { batchId } = useParams();
  const { data: batch } = useSuspenseQuery(batchQueries.detail(batchId!));
  const { user, business } = useSession();
  const tz = business?.timeZone ?? 'UTC';
  const canWrite = user?.role === 'owner' || user?.role === 'baker';
  const [isChanging, setIsChanging] = useState(false);
  const [isCorrecting, setIsCorrecting] = useState(false);
  const members = useQuery({ ...teamQueries.members(), enabled: isCorrecting });
  const toast = useToast();
  const cur = batch.current;
  const when = (iso: string) => formatZonedDateTime(new Date(iso), tz);
  return (
    <div className="space-y-6">
      <PageHeader
        title={`Batch ${batch.lotCode}`}
        description={<>{batch.recipeName}, recipe version {batch.recipeVersion}. Made on {batch.madeOn}{cur.bestBy ? `, best by ${cur.bestBy}` : ''}.</>}
        actions={
          <>
            <ButtonLink to={paths.batches}>All batches</ButtonLink>
            {canWrite && batch.allowedTransitions.length > 0 ? <Button onClick={() => setIsChanging(true)}>Change state</Button> : null}
            {canWrite && !isCorrecting ? <Button variant="secondary" onClick={() => setIsCorrecting(true)}>Correct</Button> : null}
          </>
        }
      />
      <p className="flex items-center gap-2">State: <BatchStateBadge state={batch.state} /></p>
      {batch.warnings.length > 0 ? (
        <CautionBox title="Records missing for this batch">
          <ul className="list-disc pl-5">{batch.warnings.map((w) => <li key={`${w.code}-${w.ingredientId}`}>{w.message}</li>)}</ul>
          <p>Without the supplier lot, a supplier recall cannot be traced to this batch. Add it with a correction if you can find it.</p>
        </CautionBox>
      ) : null}
      {isCorrecting ? (
        <Card title="Correct this batch">
          <CorrectionForm
            batch={batch}
            members={(members.data?.members ?? []).map((m) => ({ value: m.userId, label: m.displayName }))}
            onDone={() => {
              setIsCorrecting(false);
              toast.showToast('Correction saved as a new version.');
            }}
          />
        </Card>
      ) : null}
      <Card title="Details">
        <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-[auto_1fr]">
          <dt className="font-bold">Made by</dt><dd>{cur.madeByName ?? '—'}</dd>
          <dt className="font-bold">Quantity</dt><dd>{cur.quantityPieces ?? '—'} pieces, {cur.quantityPackages ?? '—'} packages</dd>
          <dt className="font-bold">Shelf life</dt><dd>{cur.shelfLifeDays != null ? `${cur.shelfLifeDays} days` : '—'}</dd>
          <dt className="font-bold">Notes</dt><dd>{cur.notes || '—'}</dd>
          <dt className="font-bold">Version</dt><dd>{cur.version}</dd>
        </dl>
      </Card>
      <Card title="What went in">
        {cur.inputs.length ? <ul className="list-disc space-y-1 pl-5">{cur.inputs.map((i, n) => <InputLine key={n} input={i} />)}</ul> : <p className="text-muted">This recipe version lists no ingredients.</p>}
      </Card>
      <Card title="State history">
        <ol className="space-y-2">
          {batch.stateHistory.map((s, n) => (
            <li key={n}>
              <strong>{BATCH_STATE_LABELS[s.toState]}</strong> — {when(s.changedAt)} by {s.changedByName}. <span className="text-muted">{s.reason}</span>
            </li>
          ))}
        </ol>
      </Card>
      <Card title="Version history">
        <ol className="space-y-2">
          {batch.versions.map((v) => (
            <li key={v.version}>
              <strong>Version {v.version}</strong> — {when(v.createdAt)}{v.createdByName ? ` by ${v.createdByName}` : ''}: {v.quantityPieces ?? '—'} pieces, {v.quantityPackages ?? '—'} packages.
              {v.reason ? <span> Reason: {v.reason}</span> : <span className="text-muted"> First record.</span>}
            </li>
          ))}
        </ol>
      </Card>
      <BatchSections batch={batch} />
      {canWrite ? <StateChangeDialog key={batch.state} batch={batch} isOpen={isChanging} onClose={() => setIsChanging(false)} /> : null}
    </div>
  );
}
