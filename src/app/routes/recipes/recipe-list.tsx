import { useQuery, type QueryClient } from '@tanstack/react-query';
import { Link } from 'react-router';
import type { RecipeSummary } from '@shared/contracts/recipes';
import { recipeQueries } from '@/features/recipes/api';
import { useSession } from '@/features/auth/api';
import { PageHeader } from '@/components/ui/page-header';
import { ButtonLink } from '@/components/ui/button';
import { DataTable, type ColumnDef } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { LoadingBlock } from '@/components/ui/spinner';
import { StatusBadge } from '@/components/ui/status-badge';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async () => {
  await qc.ensureQueryData(recipeQueries.list());
  return null;
};

const columns: ColumnDef<RecipeSummary, unknown>[] = [
  { id: 'name', header: 'Recipe', accessorKey: 'name', cell: ({ row }) => <Link className="font-bold text-berry underline" to={`${paths.recipes}/${row.original.id}`}>{row.original.name}</Link> },
  { id: 'kind', header: 'Kind', accessorFn: (r) => (r.isSellable ? 'Product' : 'In-between') },
  { id: 'version', header: 'Version', accessorKey: 'version', meta: { isNumeric: true } },
  { id: 'allergens', header: 'Allergens', accessorFn: (r) => r.allergens.join(', ') || 'None' },
  { id: 'tcs', header: 'TCS', accessorFn: (r) => r.tcsResult, cell: ({ row }) => (row.original.tcsResult === 'non_tcs' ? 'Not TCS by table' : <StatusBadge status="needs-review" />) },
  { id: 'label', header: 'Label text', accessorFn: (r) => (r.isLabelChanged ? 'changed' : 'matches'), cell: ({ row }) => (row.original.isLabelChanged ? <StatusBadge status="needs-review" label="Changed since saved" /> : 'Matches the saved version') },
];

export function Component() {
  const { user } = useSession();
  const list = useQuery(recipeQueries.list());
  const canEdit = user?.role === 'owner' || user?.role === 'baker';
  return (
    <>
      <PageHeader
        title="Recipes"
        description="Products and in-between recipes with their label text, allergens and versions."
        actions={<div className="flex gap-2"><ButtonLink to={`${paths.recipes}/allergen-matrix`}>Allergen matrix</ButtonLink>{canEdit ? <ButtonLink variant="primary" to={`${paths.recipes}/new`}>New recipe</ButtonLink> : null}</div>}
      />
      {!list.data ? <LoadingBlock /> : list.data.recipes.length === 0 ? (
        <EmptyState title="No recipes yet" icon="recipe">{canEdit ? <p>Add your first recipe: pick ingredients, enter weights, and see the label text as you go.</p> : <p>An owner or baker adds recipes.</p>}</EmptyState>
      ) : (
        <DataTable caption="Recipes" isCaptionHidden columns={columns} data={list.data.recipes} getRowId={(r) => r.id} searchLabel="Search recipes" />
      )}
    </>
  );
}
