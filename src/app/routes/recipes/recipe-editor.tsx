import { useQuery, type QueryClient } from '@tanstack/react-query';
import { useNavigate, useParams, type LoaderFunctionArgs } from 'react-router';
import { recipeQueries, useCreateRecipe, useSaveRecipeVersion } from '@/features/recipes/api';
import { RecipeEditorForm } from '@/features/recipes/components/recipe-editor-form';
import { useSession } from '@/features/auth/api';
import { PageHeader } from '@/components/ui/page-header';
import { LoadingBlock } from '@/components/ui/spinner';
import { useToast } from '@/components/ui/toast';
import { businessQueries } from '@/features/settings/api';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  await Promise.all([qc.ensureQueryData(businessQueries.current()), qc.ensureQueryData(recipeQueries.labelInputs()), params.id ? qc.ensureQueryData(recipeQueries.detail(params.id)) : null]);
  return null;
};

export function Component() {
  const { id } = useParams();
  const navigate = useNavigate();
  const toast = useToast();
  useSession();
  const business = useQuery(businessQueries.current());
  const detail = useQuery({ ...recipeQueries.detail(id ?? ''), enabled: !!id });
  const create = useCreateRecipe();
  const save = useSaveRecipeVersion();
  if (!business.data || (id && !detail.data)) return <LoadingBlock />;
  const current = detail.data?.current ?? null;
  return (
    <>
      <PageHeader title={current ? `Edit ${current.name}` : 'New recipe'} description="Weights in g, kg, oz or lb are kept exactly in grams. Saving makes a new version; earlier versions never change." />
      <RecipeEditorForm
        current={current}
        businessProfileId={business.data.ruleProfileId}
        onSave={async (body) => {
          const saved = current
            ? await save.mutateAsync({ ...body, reason: body.reason ?? '', basedOnVersion: current.version, id: current.recipeId })
            : await create.mutateAsync(body);
          toast.showToast(`Saved version ${saved.current.version}.`);
          navigate(`${paths.recipes}/${saved.recipe.id}`);
        }}
      />
    </>
  );
}
