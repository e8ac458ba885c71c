import { useState } from 'react';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { Link } from 'react-router';
import { recipeQueries, ruleProfileQueries } from '@/features/recipes/api';
import { PageHeader } from '@/components/ui/page-header';
import { Button } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { LoadingBlock } from '@/components/ui/spinner';
import { Select } from '@/components/ui/select';
import { AllergenMatrixTable } from '@/features/recipes/components/allergen-matrix-table';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async () => {
  await Promise.all([qc.ensureQueryData(recipeQueries.matrix()), qc.ensureQueryData(ruleProfileQueries.list())]);
  return null;
};

/** Products × allergens, printable: a ✓ and the word "Contains" (never colour alone). */
export function Component() {
  const [profileId, setProfileId] = useState<string>();
  const matrix = useQuery(recipeQueries.matrix(profileId));
  const profiles = useQuery(ruleProfileQueries.list());
  if (!matrix.data) return <LoadingBlock />;
  const m = matrix.data;
  const profileName = profiles.data?.profiles.find((p) => p.id === m.profileId)?.name ?? m.profileId;
  return (
    <>
      <PageHeader title="Allergen matrix" description={`Current version of every product, allergens as listed by: ${profileName}.`}
        actions={<Button data-print="hide" onClick={() => window.print()}>Print</Button>} />
      <div data-print="hide" className="mb-4 max-w-md">
        <Select label="Rule profile" value={m.profileId} onChange={(e) => setProfileId(e.target.value)} options={(profiles.data?.profiles ?? []).map((p) => ({ value: p.id, label: p.name }))} />
      </div>
      <CautionBox title="Cross-contact in a home kitchen">
        <p>These marks show what the recipes contain. A home kitchen may have cross-contact with other allergens: ask the baker before buying for someone with an allergy.</p>
      </CautionBox>
      <div className="mt-4">
        <AllergenMatrixTable matrix={m} testId="allergen-matrix" warningLabel="Check:" productCell={(p) => (
          <Link className="font-bold text-berry underline print:text-black print:no-underline" to={`${paths.recipes}/${p.recipeId}`}>{p.name}</Link>
        )} />
        {m.products.length === 0 ? <p className="mt-2">No sellable products yet.</p> : null}
      </div>
      <p className="mt-4 text-sm">Rules differ by place; your local rules and your local health authority decide what a label must say.</p>
    </>
  );
}
