import type { FieldErrors, UseFormRegister } from 'react-hook-form';
import type { IngredientLotChoice, LotCandidates, SubRecipeBatchChoice } from '@shared/contracts/batches';
import { Select } from '@/components/ui/select';

export interface LotFormValues {
  lots?: IngredientLotChoice[];
  subRecipeBatches?: SubRecipeBatchChoice[];
}

const orNull = (v: string) => (v === '' ? null : v);

/** The ingredient ids that need a supplier lot, given which sub-recipes come from another batch. */
export function neededIngredientIds(c: LotCandidates, subs: SubRecipeBatchChoice[] = []): Set<string> {
  // An ingredient is still needed when used directly or by any sub-recipe made fresh.
  const fromFresh = new Set(c.subRecipes.filter((_s, i) => !subs[i]?.sourceBatchId).flatMap((s) => s.ingredientIds));
  return new Set(c.ingredients.filter((i) => i.isDirect || fromFresh.has(i.ingredientId)).map((i) => i.ingredientId));
}

/** Form values aligned with the candidates (one entry per ingredient and per sub-recipe), from saved choices. */
export function lotFormDefaults(c: LotCandidates, saved: { lots?: IngredientLotChoice[]; subs?: SubRecipeBatchChoice[] } = {}): Required<LotFormValues> {
  return {
    lots: c.ingredients.map((i) => ({ ingredientId: i.ingredientId, supplierLotId: saved.lots?.find((l) => l.ingredientId === i.ingredientId)?.supplierLotId ?? null })),
    subRecipeBatches: c.subRecipes.map((s) => ({ recipeId: s.recipeId, sourceBatchId: saved.subs?.find((x) => x.recipeId === s.recipeId)?.sourceBatchId ?? null })),
  };
}

/**
 * What the server receives: only the lots still needed. `remap` turns the server's field-error keys
 * (indexes into the sent list) back into this form's field names.
 */
export function lotPayload(c: LotCandidates, v: LotFormValues) {
  const needed = neededIngredientIds(c, v.subRecipeBatches);
  const formIndexes = (v.lots ?? []).flatMap((l, i) => (needed.has(l.ingredientId) ? [i] : []));
  const lots = formIndexes.map((i) => v.lots![i]!);
  const remap = (fieldErrors: Record<string, string[]>) =>
    Object.fromEntries(Object.entries(fieldErrors).map(([k, m]) => {
      const hit = /^lots\.(\d+)\.(.+)$/.exec(k);
      return [hit ? `lots.${formIndexes[Number(hit[1])]}.${hit[2]}` : k, m];
    }));
  return { lots, subRecipeBatches: v.subRecipeBatches ?? [], remap };
}

/** Per sub-recipe a batch picker, per ingredient still needed a supplier-lot picker. */
export function LotPickers({ candidates, register, errors, subChoices }: {
  candidates: LotCandidates;
  register: UseFormRegister<LotFormValues>;
  errors: FieldErrors<LotFormValues>;
  subChoices: SubRecipeBatchChoice[] | undefined;
}) {
  const needed = neededIngredientIds(candidates, subChoices);
  return (
    <fieldset className="space-y-4">
      <legend className="text-lg font-bold">What went in</legend>
      <p className="text-muted">Pick the supplier lot you opened for each ingredient. If it was not written down, leave it empty: the batch is saved with a warning.</p>
      {candidates.subRecipes.map((s, i) => (
        <Select
          key={s.recipeId}
          label={`${s.name} (made in its own batch?)`}
          hint={s.batches.length ? 'Choose the batch you used, or list its ingredients’ lots below.' : 'No batches of this recipe yet: list its ingredients’ lots below.'}
          placeholder="Made fresh: list its ingredients’ lots"
          options={s.batches.map((b) => ({ value: b.id, label: `${b.lotCode}, made ${b.madeOn}${b.bestBy ? `, best by ${b.bestBy}` : ''}` }))}
          error={errors.subRecipeBatches?.[i]?.sourceBatchId?.message}
          {...register(`subRecipeBatches.${i}.sourceBatchId`, { setValueAs: orNull })}
        />
      ))}
      {candidates.ingredients.map((ing, i) =>
        needed.has(ing.ingredientId) ? (
          <Select
            key={ing.ingredientId}
            label={`Supplier lot of ${ing.name}`}
            hint={ing.lots.length ? undefined : `No lots of ${ing.name} have been received yet.`}
            placeholder="Not recorded"
            options={ing.lots.map((l) => ({ value: l.id, label: `${l.lotCode}, received ${l.receivedOn}${l.bestBy ? `, best by ${l.bestBy}` : ''}` }))}
            error={errors.lots?.[i]?.supplierLotId?.message ?? errors.lots?.[i]?.ingredientId?.message}
            {...register(`lots.${i}.supplierLotId`, { setValueAs: orNull })}
          />
        ) : null,
      )}
    </fieldset>
  );
}
