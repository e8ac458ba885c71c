import { useId, useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { RuleProfile } from '@shared/contracts/rule-profiles';
import type { RecipeInput } from '@shared/domain/recipe-flatten';
import { labelTextForRecipe, recipeInputOf, type RecipeVersionForLabel } from '@shared/domain/recipe-label';
import { LoadingBlock } from '@/components/ui/spinner';
import { recipeQueries, ruleProfileQueries } from '../api';
import { LabelTextPanel } from './label-text-panel';

/**
 * Label text computed in the browser on every change, with the same shared function the server uses, from
 * the ingredients and recipes loaded through the API. The business's profile by default; any other on request.
 */
export function LiveLabelPreview({ draft, businessProfileId }: { draft: RecipeVersionForLabel; businessProfileId: string }) {
  const selectId = useId();
  const [profileId, setProfileId] = useState(businessProfileId);
  const inputs = useQuery(recipeQueries.labelInputs());
  const profiles = useQuery(ruleProfileQueries.list());
  const profile = useQuery(ruleProfileQueries.detail(profileId));
  const lookups = useMemo(() => {
    if (!inputs.data) return null;
    const recipes = new Map<string, RecipeInput>(inputs.data.recipes.filter((r) => r.recipeId !== draft.recipeId).map((r) => [r.recipeId, recipeInputOf(r)]));
    return { recipes, ingredients: new Map(inputs.data.ingredients.map((i) => [i.id, i])) };
  }, [inputs.data, draft.recipeId]);
  const text = useMemo(
    () => (lookups && profile.data ? labelTextForRecipe(draft, lookups.recipes, lookups.ingredients, profile.data.profile as RuleProfile) : null),
    [draft, lookups, profile.data],
  );
  return (
    <section aria-labelledby={`${selectId}-h`} className="space-y-3 rounded-card border border-edge bg-surface p-4" data-testid="live-preview">
      <h2 id={`${selectId}-h`} className="text-lg font-bold">Live label preview</h2>
      <div>
        <label htmlFor={selectId} className="block text-sm font-bold">Rule profile</label>
        <select id={selectId} className="mt-1 w-full rounded-control border border-edge bg-surface p-2" value={profileId} onChange={(e) => setProfileId(e.target.value)}>
          {(profiles.data?.profiles ?? []).map((p) => (
            <option key={p.id} value={p.id}>{p.name}{p.id === businessProfileId ? ' (yours)' : ''}</option>
          ))}
        </select>
      </div>
      {text ? <LabelTextPanel text={text} /> : <LoadingBlock label="Working out the label text…" />}
    </section>
  );
}
