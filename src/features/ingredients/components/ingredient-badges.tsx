import { StatusBadge } from '@/components/ui/status-badge';
import type { Ingredient } from '@shared/contracts/ingredients';

/** Unverified / label re-check needed / TCS / archived, always as words (never colour alone). */
export function IngredientBadges({ ingredient }: { ingredient: Pick<Ingredient, 'isVerified' | 'needsLabelRecheck' | 'needsTimeTemperatureControl' | 'isArchived' | 'allergensConfirmed'> }) {
  return (
    <span className="inline-flex flex-wrap gap-1">
      {!ingredient.isVerified && <StatusBadge status="unverified" label="Not checked against package" />}
      {ingredient.isVerified && !ingredient.allergensConfirmed && <StatusBadge status="needs-review" label="Allergens not confirmed" />}
      {ingredient.needsLabelRecheck && <StatusBadge status="needs-review" label="Label re-check needed" />}
      {ingredient.needsTimeTemperatureControl && <StatusBadge status="due-soon" label="TCS" />}
      {ingredient.isArchived && <StatusBadge status="discarded" label="Archived" />}
    </span>
  );
}
