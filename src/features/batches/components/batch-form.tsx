import { useEffect, useState } from 'react';
import { useForm, type FieldErrors, type UseFormRegister } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import {
  CorrectBatchInputSchema, CreateBatchInputSchema, type BatchDetail, type CorrectBatchInput, type CreateBatchInput, type LotCandidates,
} from '@shared/contracts/batches';
import { applyServerErrors } from '@/lib/form-errors';
import { ApiError, isApiError } from '@/lib/api-client';
import { Field, FormError } from '@/components/ui/field';
import { Select, type SelectOption } from '@/components/ui/select';
import { Textarea } from '@/components/ui/textarea';
import { Button } from '@/components/ui/button';
import { LoadingBlock } from '@/components/ui/spinner';
import { batchQueries, newIdempotencyKey, useCorrectBatch, useCreateBatch } from '../api';
import { LotPickers, lotFormDefaults, lotPayload, type LotFormValues } from './lot-pickers';

const numberOrNull = (v: unknown) => (v === '' || v === null || v === undefined ? null : Number(v));

/** Sends with remapped lot field errors, so they land on the right picker. */
async function withRemappedErrors<T>(run: () => Promise<T>, remap: (e: Record<string, string[]>) => Record<string, string[]>): Promise<T> {
  try {
    return await run();
  } catch (err) {
    if (isApiError(err)) throw new ApiError(err.status, err.code, err.message, remap(err.fieldErrors), err.requestId);
    throw err;
  }
}

function DetailsFields({ register, errors, members }: { register: UseFormRegister<CorrectBatchInput>; errors: FieldErrors<CorrectBatchInput>; members: SelectOption[] }) {
  return (
    <div className="grid gap-4 md:grid-cols-2">
      <Select label="Made by" options={members} error={errors.madeByUserId?.message} {...register('madeByUserId')} />
      <Field label="Shelf life" hint="Days; the day of making is day 0. Defaults to the recipe’s." type="number" min={0} inputMode="numeric" isOptional error={errors.shelfLifeDays?.message} {...register('shelfLifeDays', { setValueAs: numberOrNull })} />
      <Field label="Pieces" type="number" min={0} inputMode="numeric" isOptional error={errors.quantityPieces?.message} {...register('quantityPieces', { setValueAs: numberOrNull })} />
      <Field label="Packages" type="number" min={0} inputMode="numeric" isOptional error={errors.quantityPackages?.message} {...register('quantityPackages', { setValueAs: numberOrNull })} />
      <Textarea className="md:col-span-2" label="Notes" isOptional rows={3} error={errors.notes?.message} {...register('notes')} />
    </div>
  );
}

const FIELDS = ['recipeVersionId', 'madeOn', 'madeByUserId', 'quantityPieces', 'quantityPackages', 'shelfLifeDays', 'notes', 'reason'];

/** New batch: recipe → version, made-on (today in the business zone), quantities, and per-ingredient lots. */
export function NewBatchForm({ today, members, currentUserId, onSaved }: { today: string; members: SelectOption[]; currentUserId: string; onSaved: (b: BatchDetail) => void }) {
  const create = useCreateBatch();
  const [key] = useState(newIdempotencyKey);
  const [recipeId, setRecipeId] = useState('');
  const options = useQuery(batchQueries.recipeOptions());
  const form = useForm<CreateBatchInput>({
    resolver: zodResolver(CreateBatchInputSchema),
    defaultValues: { recipeVersionId: '', madeOn: today, madeByUserId: currentUserId, notes: '', quantityPieces: null, quantityPackages: null, lots: [], subRecipeBatches: [] },
  });
  const { register, handleSubmit, setError, setValue, watch, formState } = form;
  const recipe = options.data?.recipes.find((r) => r.recipeId === recipeId);
  const recipeVersionId = watch('recipeVersionId');
  const candidates = useQuery({ ...batchQueries.lotCandidates(recipeVersionId), enabled: !!recipeVersionId });
  useEffect(() => {
    setValue('recipeVersionId', recipe?.versions[0]?.id ?? '');
  }, [recipe, setValue]);
  useEffect(() => {
    if (!candidates.data) return;
    const d = lotFormDefaults(candidates.data);
    setValue('lots', d.lots);
    setValue('subRecipeBatches', d.subRecipeBatches);
  }, [candidates.data, setValue]);

  const onSubmit = handleSubmit(async (input) => {
    const c = candidates.data as LotCandidates;
    const { lots, subRecipeBatches, remap } = lotPayload(c, input);
    const shelfLifeDays = input.shelfLifeDays ?? undefined;
    await withRemappedErrors(() => create.mutateAsync({ ...input, shelfLifeDays, lots, subRecipeBatches, key }), remap).then(onSaved, (err) =>
      applyServerErrors(err, setError, [...FIELDS, ...Object.keys(isApiError(err) ? err.fieldErrors : {}).filter((k) => k.startsWith('lots.') || k.startsWith('subRecipeBatches.'))]),
    );
  });

  if (options.isPending) return <LoadingBlock label="Loading recipes…" />;
  const recipes = options.data?.recipes ?? [];
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6">
      <FormError message={formState.errors.root?.server?.message} />
      <div className="grid gap-4 md:grid-cols-2">
        <Select label="Recipe" placeholder="Choose a recipe" options={recipes.map((r) => ({ value: r.recipeId, label: r.isSellable ? r.name : `${r.name} (made for other recipes)` }))} value={recipeId} onChange={(e) => setRecipeId(e.target.value)} error={!recipeId ? formState.errors.recipeVersionId?.message : undefined} />
        <Select label="Recipe version" options={(recipe?.versions ?? []).map((v) => ({ value: v.id, label: `Version ${v.version}${v.shelfLifeDays != null ? ` (shelf life ${v.shelfLifeDays} days)` : ''}` }))} placeholder={recipe ? undefined : 'Choose a recipe first'} disabled={!recipe} error={recipeId ? formState.errors.recipeVersionId?.message : undefined} {...register('recipeVersionId')} />
        <Field label="Made on" type="date" max={today} hint="In the business’s time zone." error={formState.errors.madeOn?.message} {...register('madeOn')} />
      </div>
      <DetailsFields register={register as unknown as UseFormRegister<CorrectBatchInput>} errors={formState.errors as FieldErrors<CorrectBatchInput>} members={members} />
      {candidates.data ? (
        <LotPickers candidates={candidates.data} register={register as unknown as UseFormRegister<LotFormValues>} errors={formState.errors as FieldErrors<LotFormValues>} subChoices={watch('subRecipeBatches')} />
      ) : recipeVersionId ? <LoadingBlock label="Loading lots…" /> : null}
      <Button type="submit" isBusy={create.isPending} disabled={!candidates.data}>Record batch</Button>
    </form>
  );
}

/** A correction: a new version of the batch with a reason; the original stays in the history. */
export function CorrectionForm({ batch, members, onDone }: { batch: BatchDetail; members: SelectOption[]; onDone: () => void }) {
  const correct = useCorrectBatch();
  const [key] = useState(newIdempotencyKey);
  const candidates = useQuery(batchQueries.lotCandidates(batch.recipeVersionId));
  const cur = batch.current;
  const form = useForm<CorrectBatchInput>({
    resolver: zodResolver(CorrectBatchInputSchema),
    defaultValues: {
      madeByUserId: cur.madeByUserId ?? undefined, quantityPieces: cur.quantityPieces, quantityPackages: cur.quantityPackages, shelfLifeDays: cur.shelfLifeDays,
      notes: cur.notes, reason: '', lots: [], subRecipeBatches: [],
    },
  });
  const { register, handleSubmit, setError, setValue, watch, formState } = form;
  useEffect(() => {
    if (!candidates.data) return;
    const d = lotFormDefaults(candidates.data, {
      lots: cur.inputs.flatMap((i) => (i.kind === 'ingredient' ? [{ ingredientId: i.ingredientId, supplierLotId: i.supplierLotId }] : [])),
      subs: cur.inputs.flatMap((i) => (i.kind === 'batch' ? [{ recipeId: i.subRecipeId, sourceBatchId: i.sourceBatchId }] : [])),
    });
    setValue('lots', d.lots);
    setValue('subRecipeBatches', d.subRecipeBatches);
  }, [candidates.data, cur, setValue]);
  const onSubmit = handleSubmit(async (input) => {
    const { lots, subRecipeBatches, remap } = lotPayload(candidates.data as LotCandidates, input);
    await withRemappedErrors(() => correct.mutateAsync({ ...input, madeByUserId: input.madeByUserId || undefined, lots, subRecipeBatches, id: batch.id, key }), remap).then(onDone, (err) =>
      applyServerErrors(err, setError, [...FIELDS, ...Object.keys(isApiError(err) ? err.fieldErrors : {}).filter((k) => k.startsWith('lots.') || k.startsWith('subRecipeBatches.'))]),
    );
  });
  return (
    <form onSubmit={onSubmit} noValidate className="space-y-6" aria-label="Correct this batch">
      <FormError message={formState.errors.root?.server?.message} />
      <p className="text-muted">The lot code, recipe version and made-on date stay. Version {cur.version} stays in the history.</p>
      <DetailsFields register={register} errors={formState.errors} members={members} />
      {candidates.data ? (
        <LotPickers candidates={candidates.data} register={register as unknown as UseFormRegister<LotFormValues>} errors={formState.errors as FieldErrors<LotFormValues>} subChoices={watch('subRecipeBatches')} />
      ) : <LoadingBlock label="Loading lots…" />}
      <Textarea label="Reason for the correction" rows={2} error={formState.errors.reason?.message} {...register('reason')} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" isBusy={correct.isPending}>Save correction</Button>
        <Button variant="secondary" onClick={onDone}>Cancel</Button>
      </div>
    </form>
  );
}
