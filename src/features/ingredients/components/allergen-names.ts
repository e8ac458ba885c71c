import type { AllergenSource } from '@shared/domain/allergens';

/** Plain names for the allergen picker and badges. */
export const ALLERGEN_LABELS: Record<AllergenSource, string> = {
  milk: 'Milk', egg: 'Egg', fish: 'Fish', crustacean_shellfish: 'Crustacean shellfish', mollusc: 'Molluscs', tree_nut: 'Tree nuts',
  peanut: 'Peanuts', wheat: 'Wheat', rye: 'Rye', barley: 'Barley', oats: 'Oats', soy: 'Soy', sesame: 'Sesame', celery: 'Celery',
  mustard: 'Mustard', lupin: 'Lupin', sulphites: 'Sulphites',
};

export const allergenText = (a: { source: AllergenSource; kind?: string | null }) => (a.kind ? `${ALLERGEN_LABELS[a.source]}: ${a.kind}` : ALLERGEN_LABELS[a.source]);
