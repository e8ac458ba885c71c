import { useNavigate } from 'react-router';
import { useCreateIngredient } from '@/features/ingredients/api';
import { IngredientForm } from '@/features/ingredients/components/ingredient-form';
import { PageHeader } from '@/components/ui/page-header';
import { useToast } from '@/components/ui/toast';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  const create = useCreateIngredient();
  const navigate = useNavigate();
  const { showToast } = useToast();
  return (
    <>
      <PageHeader title="Add an ingredient" description="Copy what the package says, with the package in hand. You can add a photo of the label next." />
      <IngredientForm
        submitLabel="Save ingredient"
        onSave={async (values) => {
          const created = await create.mutateAsync(values);
          showToast(`${created.labelName} saved.`);
          navigate(`${paths.ingredients}/${created.id}`);
        }}
      />
    </>
  );
}
