import { useMemo, useState } from 'react';
import { Link } from 'react-router';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { ALLERGEN_SOURCES, type AllergenSource } from '@shared/domain/allergens';
import type { Ingredient } from '@shared/contracts/ingredients';
import { ingredientQueries } from '@/features/ingredients/api';
import { IngredientBadges } from '@/features/ingredients/components/ingredient-badges';
import { ALLERGEN_LABELS, allergenText } from '@/features/ingredients/components/allergen-names';
import { useSession } from '@/features/auth/api';
import { businessLocalDate } from '@shared/domain/zoned-time';
import { PageHeader } from '@/components/ui/page-header';
import { DataTable, type ColumnDef } from '@/components/ui/data-table';
import { Select } from '@/components/ui/select';
import { ButtonLink } from '@/components/ui/button';
import { LoadingBlock } from '@/components/ui/spinner';
import { EmptyState } from '@/components/ui/empty-state';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async () => {
  await qc.ensureQueryData(ingredientQueries.list({}));
  return null;
};

const STATUS_OPTIONS = [
  { value: 'unverified', label: 'Not checked against package' },
  { value: 'recheck', label: 'Label re-check needed' },
  { value: 'tcs', label: 'Needs time/temperature control' },
];

export function Component() {
  const session = useSession();
  const tz = session.business?.timeZone ?? 'UTC';
  const canEdit = session.user?.role === 'owner' || session.user?.role === 'baker';
  const [allergen, setAllergen] = useState<AllergenSource | ''>('');
  const [status, setStatus] = useState<'' | 'unverified' | 'recheck' | 'tcs'>('');
  const list = useQuery(ingredientQueries.list({ allergen: allergen || undefined, status: status || undefined }));
  const columns = useMemo<ColumnDef<Ingredient, unknown>[]>(() => [
    { id: 'labelName', header: 'Name on package', accessorKey: 'labelName', cell: (c) => <Link className="font-bold text-berry underline" to={`${paths.ingredients}/${c.row.original.id}`}>{c.row.original.labelName}</Link> },
    { id: 'allergens', header: 'Allergens', accessorFn: (i) => i.allergens.map(allergenText).join(', ') || 'None declared' },
    { id: 'supplier', header: 'Supplier', accessorFn: (i) => [i.supplierName, i.supplierItemCode].filter(Boolean).join(' · ') },
    { id: 'status', header: 'Status', accessorFn: (i) => `${i.isVerified ? 'checked' : 'unverified'} ${i.needsLabelRecheck ? 're-check' : ''} ${i.needsTimeTemperatureControl ? 'tcs' : ''}`, cell: (c) => <IngredientBadges ingredient={c.row.original} /> },
    { id: 'updatedAt', header: 'Last change', accessorKey: 'updatedAt', cell: (c) => <span className="whitespace-nowrap tabular">{businessLocalDate(new Date(c.row.original.updatedAt), tz)}</span> },
  ], [tz]);
  return (
    <>
      <PageHeader
        title="Ingredients"
        description="Each ingredient as its own package declares it: name, its ingredients in order, allergens, supplier and the lots you received."
        actions={canEdit ? (
          <div className="flex gap-2">
            <ButtonLink variant="primary" to={`${paths.ingredients}/new`}>Add an ingredient</ButtonLink>
            <ButtonLink to={`${paths.ingredients}/import`}>Import from a spreadsheet</ButtonLink>
          </div>
        ) : undefined}
      />
      <div className="mb-4 flex flex-wrap gap-4">
        <Select label="Allergen" placeholder="Any allergen" options={ALLERGEN_SOURCES.map((s) => ({ value: s, label: ALLERGEN_LABELS[s] }))} value={allergen} onChange={(e) => setAllergen(e.target.value as AllergenSource | '')} />
        <Select label="Status" placeholder="Any status" options={STATUS_OPTIONS} value={status} onChange={(e) => setStatus(e.target.value as typeof status)} />
      </div>
      {list.isPending ? <LoadingBlock label="Loading ingredients…" /> : list.data && list.data.items.length === 0 && !allergen && !status ? (
        <EmptyState title="No ingredients yet" action={canEdit ? <ButtonLink variant="primary" to={`${paths.ingredients}/new`}>Add the first one</ButtonLink> : undefined}>
          Add each ingredient with its package in hand, or import your shelf from a spreadsheet.
        </EmptyState>
      ) : (
        <DataTable caption="Ingredients" isCaptionHidden columns={columns} data={list.data?.items ?? []} getRowId={(i) => i.id} searchLabel="Search ingredients" initialSorting={[{ id: 'labelName', desc: false }]} emptyMessage="No ingredient matches these filters." />
      )}
    </>
  );
}
