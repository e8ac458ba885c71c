import { useState } from 'react';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router';
import { recipeQueries, useArchiveRecipe } from '@/features/recipes/api';
import { LabelTextPanel } from '@/features/recipes/components/label-text-panel';
import { VersionHistory } from '@/features/recipes/components/version-history';
import { businessQueries } from '@/features/settings/api';
import { useSession } from '@/features/auth/api';
import { PageHeader } from '@/components/ui/page-header';
import { Button, ButtonLink } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { Dialog } from '@/components/ui/dialog';
import { Field, FormError } from '@/components/ui/field';
import { LoadingBlock } from '@/components/ui/spinner';
import { isApiError } from '@/lib/api-client';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  await Promise.all([qc.ensureQueryData(recipeQueries.detail(params.id!)), qc.ensureQueryData(businessQueries.current())]);
  return null;
};

export function Component() {
  const { id } = useParams();
  const { user } = useSession();
  const detail = useQuery(recipeQueries.detail(id!));
  const business = useQuery(businessQueries.current());
  const archive = useArchiveRecipe();
  const [isArchiveOpen, setArchiveOpen] = useState(false);
  const [reason, setReason] = useState('');
  const [archiveError, setArchiveError] = useState<string>();
  if (!detail.data || !business.data) return <LoadingBlock />;
  const { recipe, current, labelText, labelChanges, versions, usedBy } = detail.data;
  const canEdit = user?.role === 'owner' || user?.role === 'baker';
  const g = (s: string | null) => (s === null ? '—' : `${s} g`);
  return (
    <>
      <PageHeader
        title={recipe.name}
        description={`${recipe.isSellable ? 'Product' : 'In-between recipe'} · version ${current.version}${current.isArchived ? ' · archived' : ''}`}
        actions={canEdit ? (
          <div className="flex gap-2">
            <ButtonLink variant="primary" to={`${paths.recipes}/${recipe.id}/edit`}>Edit (new version)</ButtonLink>
            <Button variant="secondary" onClick={() => setArchiveOpen(true)}>{current.isArchived ? 'Restore' : 'Archive'}</Button>
          </div>
        ) : null}
      />
      {labelChanges.length ? (
        <CautionBox title={`Label text changed since version ${current.version} — review and save a new version`}>
          <p>An ingredient or a sub-recipe was edited after this version was saved, so the label would now read differently:</p>
          <ul className="list-disc pl-5">{labelChanges.map((c) => <li key={c.field}>{c.label}{c.added.length ? `: now ${c.added.join('; ')}` : ''}{c.removed.length ? ` (was ${c.removed.join('; ')})` : ''}</li>)}</ul>
          {canEdit ? <Link className="font-bold text-berry underline" to={`${paths.recipes}/${recipe.id}/edit`}>Review and save a new version</Link> : null}
        </CautionBox>
      ) : null}
      <div className="mt-6 grid gap-6 lg:grid-cols-2">
        <section aria-labelledby="components-h" className="space-y-4">
          <h2 id="components-h" className="text-lg font-bold">Components</h2>
          <table className="w-full text-left">
            <thead><tr><th scope="col">Ingredient or recipe</th><th scope="col" className="text-right">As entered</th><th scope="col" className="text-right">Grams</th></tr></thead>
            <tbody>
              {current.components.map((c, i) => (
                <tr key={i} className="border-t border-hairline">
                  <th scope="row" className="py-1 font-normal">{c.kind === 'recipe' ? <Link className="text-berry underline" to={`${paths.recipes}/${c.recipeId}`}>{c.name}</Link> : c.name}{c.kind === 'recipe' ? ' (recipe)' : ''}</th>
                  <td className="py-1 text-right tabular-nums">{c.entered.amount} {c.entered.unit}</td>
                  <td className="py-1 text-right tabular-nums" title={`${c.grams} g exactly`}>{Math.round(Number(c.grams) * 10) / 10}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <dl className="grid grid-cols-2 gap-2 text-sm">
            <dt className="font-bold">Finished batch</dt><dd className="tabular-nums">{g(current.yieldGrams)}</dd>
            <dt className="font-bold">Pieces per batch</dt><dd>{current.yieldPieces ?? '—'}</dd>
            <dt className="font-bold">One piece</dt><dd className="tabular-nums">{g(current.pieceGrams)}</dd>
            <dt className="font-bold">Pieces per package</dt><dd>{current.piecesPerPackage ?? '—'}</dd>
            <dt className="font-bold">Net per package</dt><dd className="tabular-nums">{g(current.netGramsPerPackage)}</dd>
            <dt className="font-bold">Shelf life</dt><dd>{current.shelfLifeDays === null ? '—' : `${current.shelfLifeDays} days`}</dd>
            <dt className="font-bold">pH / water activity</dt><dd>{current.ph ?? 'unknown'} / {current.waterActivity ?? 'unknown'}</dd>
            <dt className="font-bold">Heat-treated and packaged</dt><dd>{current.isHeatTreatedAndPackaged ? 'Yes (Table A)' : 'No (Table B)'}</dd>
            <dt className="font-bold">Holding policy</dt><dd>{current.holdingPolicy ?? "The rule profile's"}</dd>
          </dl>
          {current.notes ? <p className="whitespace-pre-wrap">{current.notes}</p> : null}
          {usedBy.length ? <p>Used in: {usedBy.map((u, i) => <span key={u.id}>{i ? ', ' : ''}<Link className="text-berry underline" to={`${paths.recipes}/${u.id}`}>{u.name}</Link></span>)}</p> : null}
        </section>
        <section aria-labelledby="label-h" className="space-y-2">
          <h2 id="label-h" className="text-lg font-bold">Label text now ({business.data.ruleProfileName})</h2>
          <LabelTextPanel text={labelText} />
        </section>
      </div>
      <section aria-labelledby="history-h" className="mt-8">
        <h2 id="history-h" className="mb-2 text-lg font-bold">Version history</h2>
        <VersionHistory versions={versions} timeZone={business.data.timeZone} />
      </section>
      <Dialog isOpen={isArchiveOpen} onClose={() => setArchiveOpen(false)} title={current.isArchived ? 'Restore this recipe' : 'Archive this recipe'}
        actions={<Button isBusy={archive.isPending} onClick={async () => {
          try {
            await archive.mutateAsync({ id: recipe.id, reason, isArchived: !current.isArchived });
            setArchiveOpen(false);
          } catch (err) {
            setArchiveError(isApiError(err) ? err.fieldErrors.reason?.join(' ') ?? err.message : 'Something went wrong.');
          }
        }}>{current.isArchived ? 'Restore' : 'Archive'}</Button>}>
        <p>This is saved as a new version; batches that pinned earlier versions keep them.</p>
        <FormError message={archiveError} />
        <Field label="Reason" value={reason} onChange={(e) => setReason(e.target.value)} />
      </Dialog>
    </>
  );
}
