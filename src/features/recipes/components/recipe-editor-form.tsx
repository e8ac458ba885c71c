import { useId, useMemo, useState } from 'react';
import { useFieldArray, useForm, useWatch, type Resolver } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { RECIPE_HOLDING_POLICIES, RecipeVersionInputSchema, SaveRecipeVersionInputSchema, type RecipeVersion } from '@shared/contracts/recipes';
import type { RecipeComponent } from '@shared/domain/recipe-flatten';
import type { RecipeVersionForLabel } from '@shared/domain/recipe-label';
import { editableWeight, toGrams, WEIGHT_UNITS, type WeightUnit } from '@shared/domain/weight-units';
import { Button } from '@/components/ui/button';
import { Checkbox } from '@/components/ui/checkbox';
import { Field, FormError } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { Textarea } from '@/components/ui/textarea';
import { applyServerErrors } from '@/lib/form-errors';
import { recipeQueries } from '../api';
import { LiveLabelPreview } from './live-label-preview';

interface WeightField { amount: string; unit: WeightUnit }
interface ComponentField { kind: 'ingredient' | 'recipe'; refId: string; name: string; amount: string; unit: WeightUnit }
export interface RecipeFormValues {
  name: string;
  isSellable: boolean;
  components: ComponentField[];
  yieldWeight: WeightField;
  yieldPieces: string;
  pieceWeight: WeightField;
  piecesPerPackage: string;
  shelfLifeDays: string;
  ph: string;
  waterActivity: string;
  isHeatTreatedAndPackaged: boolean;
  holdingPolicy: string;
  notes: string;
  reason: string;
}

const UNIT_OPTIONS = WEIGHT_UNITS.map((u) => ({ value: u, label: u }));
const intOrNull = (s: string) => (s.trim() === '' ? null : Number(s));
const weightOrNull = (w: WeightField) => (w.amount.trim() === '' ? null : { amount: w.amount.trim(), unit: w.unit });

/** The contract body from the form (empty optional fields become null). */
export function toRecipeBody(v: RecipeFormValues) {
  return {
    name: v.name,
    isSellable: v.isSellable,
    components: v.components.map((c) => (c.kind === 'ingredient' ? { kind: 'ingredient' as const, ingredientId: c.refId, amount: c.amount.trim(), unit: c.unit } : { kind: 'recipe' as const, recipeId: c.refId, amount: c.amount.trim(), unit: c.unit })),
    yieldWeight: weightOrNull(v.yieldWeight),
    yieldPieces: intOrNull(v.yieldPieces),
    pieceWeight: weightOrNull(v.pieceWeight),
    piecesPerPackage: intOrNull(v.piecesPerPackage),
    shelfLifeDays: intOrNull(v.shelfLifeDays),
    ph: intOrNull(v.ph),
    waterActivity: intOrNull(v.waterActivity),
    isHeatTreatedAndPackaged: v.isHeatTreatedAndPackaged,
    holdingPolicy: (v.holdingPolicy || null) as (typeof RECIPE_HOLDING_POLICIES)[number] | null,
    notes: v.notes,
    ...(v.reason.trim() ? { reason: v.reason } : {}),
  };
}

const gramsOr = (w: WeightField | { amount: string; unit: WeightUnit }) => {
  try {
    return w.amount.trim() ? toGrams(w.amount, w.unit) : null;
  } catch {
    return null;
  }
};

/** The draft the live preview computes from; components with a weight that cannot be read yet are left out. */
function toDraft(recipeId: string, v: RecipeFormValues): RecipeVersionForLabel {
  const components: RecipeComponent[] = (v.components ?? []).flatMap((c): RecipeComponent[] => {
    const grams = gramsOr(c);
    if (grams === null) return [];
    return c.kind === 'ingredient' ? [{ kind: 'ingredient', ingredientId: c.refId, grams }] : [{ kind: 'recipe', recipeId: c.refId, grams }];
  });
  const num = (s: string) => (s.trim() === '' || Number.isNaN(Number(s)) ? null : Number(s));
  return {
    recipeId, name: v.name || 'This recipe', isSellable: v.isSellable, components,
    yieldGrams: gramsOr(v.yieldWeight), pieceGrams: gramsOr(v.pieceWeight), piecesPerPackage: num(v.piecesPerPackage),
    ph: num(v.ph), waterActivity: num(v.waterActivity), isHeatTreatedAndPackaged: v.isHeatTreatedAndPackaged,
  };
}

function initialValues(current: RecipeVersion | null): RecipeFormValues {
  const w = (g: string | null): WeightField => (g === null ? { amount: '', unit: 'g' } : editableWeight(g));
  const s = (n: number | null) => (n === null ? '' : String(n));
  return {
    name: current?.name ?? '',
    isSellable: current?.isSellable ?? true,
    components: (current?.components ?? []).map((c) => ({ kind: c.kind, refId: (c.ingredientId ?? c.recipeId)!, name: c.name, amount: c.entered.amount, unit: c.entered.unit })),
    yieldWeight: w(current?.yieldGrams ?? null),
    yieldPieces: s(current?.yieldPieces ?? null),
    pieceWeight: w(current?.pieceGrams ?? null),
    piecesPerPackage: s(current?.piecesPerPackage ?? null),
    shelfLifeDays: s(current?.shelfLifeDays ?? null),
    ph: s(current?.ph ?? null),
    waterActivity: s(current?.waterActivity ?? null),
    isHeatTreatedAndPackaged: current?.isHeatTreatedAndPackaged ?? true,
    holdingPolicy: current?.holdingPolicy ?? '',
    notes: current?.notes ?? '',
    reason: '',
  };
}

// Field names differ from the contract only for components (refId); map the contract's errors back onto the form.
const errorKey = (k: string) => k.replace(/\.(ingredientId|recipeId)$/, '.refId');

/** The recipe editor: components with a unit each, add by search, figures for the label, and the live preview. */
export function RecipeEditorForm({ current, businessProfileId, onSave }: {
  current: RecipeVersion | null;
  businessProfileId: string;
  onSave: (body: ReturnType<typeof toRecipeBody>) => Promise<unknown>;
}) {
  const schema = current ? SaveRecipeVersionInputSchema : RecipeVersionInputSchema;
  const resolver: Resolver<RecipeFormValues> = async (values, ctx, options) => {
    const body = { ...toRecipeBody(values), ...(current ? { basedOnVersion: current.version } : {}) };
    const result = await zodResolver(schema as typeof RecipeVersionInputSchema)(body as never, ctx, options as never);
    const errors: Record<string, unknown> = {};
    for (const [k, e] of Object.entries(result.errors)) errors[k] = k === 'components' && Array.isArray(e) ? e.map((c) => (c && 'ingredientId' in c ? { ...c, refId: c.ingredientId } : c && 'recipeId' in c ? { ...c, refId: c.recipeId } : c)) : e;
    return { values: Object.keys(errors).length ? {} : values, errors } as never;
  };
  const form = useForm<RecipeFormValues>({ defaultValues: initialValues(current), resolver });
  const { register, control, handleSubmit, setError, formState } = form;
  const components = useFieldArray({ control, name: 'components' });
  const watched = useWatch({ control }) as RecipeFormValues;
  const recipeId = current?.recipeId ?? 'draft-recipe';
  const draft = useMemo(() => toDraft(recipeId, watched), [recipeId, watched]);
  const [serverMessage, setServerMessage] = useState<string>();

  const submit = handleSubmit(async (values) => {
    setServerMessage(undefined);
    try {
      await onSave(toRecipeBody(values));
    } catch (err) {
      const mapped = err && typeof err === 'object' && 'fieldErrors' in err
        ? Object.assign(err, { fieldErrors: Object.fromEntries(Object.entries((err as { fieldErrors: Record<string, string[]> }).fieldErrors).map(([k, v]) => [errorKey(k), v])) })
        : err;
      setServerMessage(applyServerErrors(mapped, setError));
    }
  });
  const e = formState.errors;

  return (
    <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      <form onSubmit={submit} noValidate className="space-y-6" aria-label="Recipe">
        <FormError message={serverMessage} />
        <Field label="Name" {...register('name')} error={e.name?.message} />
        <Checkbox label="Sellable product (gets labels and batches)" hint="Leave unticked for an in-between recipe such as a frosting or filling." {...register('isSellable')} />

        <fieldset className="space-y-3">
          <legend className="text-lg font-bold">Components</legend>
          {e.components?.message || e.components?.root?.message ? <p className="text-cherry font-bold">{e.components?.message ?? e.components?.root?.message}</p> : null}
          <table className="w-full text-left">
            <thead><tr><th scope="col">Ingredient or recipe</th><th scope="col">Weight</th><th scope="col">Unit</th><th scope="col"><span className="sr-only">Remove</span></th></tr></thead>
            <tbody>
              {components.fields.map((f, i) => (
                <tr key={f.id} className="align-top">
                  <th scope="row" className="py-2 pr-2 font-normal">
                    {f.name} <span className="text-sm text-muted">({f.kind === 'recipe' ? 'recipe' : 'ingredient'})</span>
                    {e.components?.[i]?.refId ? <p className="text-sm font-bold text-cherry">{e.components[i]?.refId?.message}</p> : null}
                  </th>
                  <td className="py-2 pr-2"><Field label={`Weight of ${f.name}`} hint="" className="[&_label]:sr-only" inputMode="decimal" {...register(`components.${i}.amount`)} error={e.components?.[i]?.amount?.message} /></td>
                  <td className="min-w-24 py-2 pr-2"><Select label={`Unit for ${f.name}`} className="[&_label]:sr-only" options={UNIT_OPTIONS} {...register(`components.${i}.unit`)} error={e.components?.[i]?.unit?.message} /></td>
                  <td className="py-2"><Button variant="quiet" onClick={() => components.remove(i)} aria-label={`Remove ${f.name}`}>Remove</Button></td>
                </tr>
              ))}
            </tbody>
          </table>
          <ComponentSearch selfId={current?.recipeId} onPick={(c) => components.append({ ...c, amount: '', unit: 'g' })} />
        </fieldset>

        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="col-span-full text-lg font-bold">Yield and package</legend>
          <WeightPair label="Finished batch weight" hint="After baking; leave empty to use the sum of the components." amount={register('yieldWeight.amount')} unit={register('yieldWeight.unit')} error={e.yieldWeight?.amount?.message ?? e.yieldWeight?.message} />
          <Field label="Pieces per batch" inputMode="numeric" isOptional {...register('yieldPieces')} error={e.yieldPieces?.message} />
          <WeightPair label="Weight of one piece" amount={register('pieceWeight.amount')} unit={register('pieceWeight.unit')} error={e.pieceWeight?.amount?.message ?? e.pieceWeight?.message} />
          <Field label="Pieces per package" inputMode="numeric" {...register('piecesPerPackage')} error={e.piecesPerPackage?.message} />
          <Field label="Shelf life (days)" inputMode="numeric" isOptional {...register('shelfLifeDays')} error={e.shelfLifeDays?.message} />
        </fieldset>

        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="col-span-full text-lg font-bold">Finished product (for the TCS assessment)</legend>
          <Field label="pH" hint="From a lab report or a calibrated meter; leave empty if unknown." inputMode="decimal" isOptional {...register('ph')} error={e.ph?.message} />
          <Field label="Water activity (aw)" hint="0 to 1, from a lab report; leave empty if unknown." inputMode="decimal" isOptional {...register('waterActivity')} error={e.waterActivity?.message} />
          <div className="col-span-full"><Checkbox label="Heat-treated (baked) and then packaged" hint="Food Code 1-201.10(B): Table A applies when both are true, Table B otherwise." {...register('isHeatTreatedAndPackaged')} /></div>
          <Select label="Holding policy for this recipe" isOptional placeholder="Use the rule profile's policy" options={[
            { value: 'none', label: 'No limit (timer only)' }, { value: 'tphc_4h', label: 'Time as a control, 4 hours (Food Code 3-501.19(B))' },
            { value: 'tphc_6h', label: 'Time as a control, 6 hours, cold food (3-501.19(C))' }, { value: 'cooling', label: 'Cooling (3-501.14)' },
          ]} {...register('holdingPolicy')} />
        </fieldset>

        <Textarea label="Notes" isOptional {...register('notes')} error={e.notes?.message} />
        {current ? <Field label="Why are you changing it?" hint={`Saved as version ${current.version + 1}; version ${current.version} stays as it is.`} {...register('reason')} error={e.reason?.message} /> : null}
        <Button type="submit" isBusy={formState.isSubmitting}>{current ? 'Save new version' : 'Save recipe'}</Button>
      </form>
      <div className="lg:sticky lg:top-4 lg:self-start"><LiveLabelPreview draft={draft} businessProfileId={businessProfileId} /></div>
    </div>
  );
}

function WeightPair({ label, hint, amount, unit, error }: { label: string; hint?: string; amount: ReturnType<ReturnType<typeof useForm<RecipeFormValues>>['register']>; unit: ReturnType<ReturnType<typeof useForm<RecipeFormValues>>['register']>; error?: string }) {
  return (
    <div className="flex items-end gap-2">
      <Field label={label} hint={hint} isOptional inputMode="decimal" className="min-w-0 flex-1" {...amount} error={error} />
      {/* The unit's label is read out but not shown: the amount's label above says what it is. */}
      <Select label={`${label}: unit`} className="w-24 shrink-0 [&_label]:sr-only" options={UNIT_OPTIONS} {...unit} />
    </div>
  );
}

/** Find an ingredient or another recipe by name and add it (keyboard: type, Tab to a result, Enter). */
function ComponentSearch({ selfId, onPick }: { selfId?: string; onPick: (c: { kind: 'ingredient' | 'recipe'; refId: string; name: string }) => void }) {
  const id = useId();
  const [q, setQ] = useState('');
  const inputs = useQuery(recipeQueries.labelInputs());
  const needle = q.trim().toLowerCase();
  const hits = needle
    ? [
        ...(inputs.data?.ingredients ?? []).filter((i) => !i.isArchived && i.labelName.toLowerCase().includes(needle)).map((i) => ({ kind: 'ingredient' as const, refId: i.id, name: i.labelName })),
        ...(inputs.data?.recipes ?? []).filter((r) => !r.isArchived && r.recipeId !== selfId && r.name.toLowerCase().includes(needle)).map((r) => ({ kind: 'recipe' as const, refId: r.recipeId, name: r.name })),
      ].slice(0, 8)
    : [];
  return (
    <div className="space-y-2">
      <label htmlFor={id} className="block font-bold">Add an ingredient or a recipe</label>
      <input id={id} type="search" value={q} onChange={(ev) => setQ(ev.target.value)} placeholder="Type part of a name" className="w-full rounded-control border border-edge bg-surface p-2" aria-describedby={`${id}-n`} />
      <p id={`${id}-n`} className="sr-only" aria-live="polite">{needle ? `${hits.length} matches` : ''}</p>
      {hits.length ? (
        <ul className="space-y-1" aria-label="Matches">
          {hits.map((h) => (
            <li key={`${h.kind}:${h.refId}`}>
              <Button variant="secondary" onClick={() => { onPick(h); setQ(''); }}>Add {h.name} ({h.kind})</Button>
            </li>
          ))}
        </ul>
      ) : needle ? <p className="text-sm text-muted">Nothing matches “{q}”.</p> : null}
    </div>
  );
}
