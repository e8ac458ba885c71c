import { Controller, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { ALLERGEN_SOURCES, type AllergenDecl, type AllergenSource } from '@shared/domain/allergens';
import { CreateIngredientInputSchema, KIND_REQUIRED_SOURCES, UpdateIngredientInputSchema, type CreateIngredientInput } from '@shared/contracts/ingredients';
import { applyServerErrors } from '@/lib/form-errors';
import { Field, FormError } from '@/components/ui/field';
import { Textarea } from '@/components/ui/textarea';
import { Checkbox } from '@/components/ui/checkbox';
import { Button } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { ALLERGEN_LABELS } from './allergen-names';

const EditSchema = UpdateIngredientInputSchema.extend(CreateIngredientInputSchema.shape).extend({ reason: UpdateIngredientInputSchema.shape.reason });
type Values = CreateIngredientInput & { reason?: string; baseVersion?: number };

const needsKind = (s: AllergenSource) => (KIND_REQUIRED_SOURCES as readonly string[]).includes(s);

/** Allergens as one checkbox per source; tree nut/fish/shellfish ask for the kind(s), comma-separated. */
function AllergenPicker({ value, onChange, errors }: { value: AllergenDecl[]; onChange: (v: AllergenDecl[]) => void; errors: Record<string, string> }) {
  const kindsOf = (s: AllergenSource) => value.filter((a) => a.source === s).map((a) => a.kind ?? '').join(', ');
  const setSource = (s: AllergenSource, on: boolean, kinds = '') => {
    const rest = value.filter((a) => a.source !== s);
    if (!on) return onChange(rest);
    const list = needsKind(s) ? kinds.split(',').map((k) => k.trim()) : [''];
    onChange([...rest, ...list.map((k) => (k ? { source: s, kind: k } : { source: s }))]);
  };
  return (
    <fieldset className="space-y-2">
      <legend className="font-bold">Allergens the package declares</legend>
      <p className="text-sm text-muted">Tick each one in the package's "Contains" statement or ingredient list. Name each tree nut, fish or shellfish.</p>
      <div className="grid gap-2 sm:grid-cols-2">
        {ALLERGEN_SOURCES.map((s) => {
          const on = value.some((a) => a.source === s);
          const idx = value.findIndex((a) => a.source === s);
          return (
            <div key={s} className="space-y-1">
              <Checkbox label={ALLERGEN_LABELS[s]} checked={on} onChange={(e) => setSource(s, e.target.checked, kindsOf(s))} />
              {on && needsKind(s) && (
                <Field
                  label={`Which ${s === 'tree_nut' ? 'tree nuts' : s === 'fish' ? 'fish' : 'shellfish'}?`}
                  hint="Separate several with commas, e.g. almond, pecan"
                  defaultValue={kindsOf(s)}
                  onBlur={(e) => setSource(s, true, e.target.value)}
                  error={errors[`allergens.${idx}.kind`]}
                />
              )}
            </div>
          );
        })}
      </div>
    </fieldset>
  );
}

export function IngredientForm({ initial, isEdit, onSave, submitLabel }: {
  initial?: Partial<Values>;
  isEdit?: boolean;
  onSave: (values: Values) => Promise<unknown>;
  submitLabel: string;
}) {
  const { register, control, handleSubmit, setError, formState, watch } = useForm<z.input<typeof EditSchema>, unknown, Values>({
    resolver: zodResolver(isEdit ? EditSchema : CreateIngredientInputSchema) as never,
    defaultValues: {
      labelName: '', subIngredients: [], allergens: [], allergensConfirmed: false, sulphitesMgPerKg: null, needsTimeTemperatureControl: false,
      supplierName: '', supplierItemCode: '', notes: '', ...initial,
    },
  });
  const errors = Object.fromEntries(Object.entries(formState.errors.allergens ?? {}).flatMap(([i, e]) => {
    const kind = (e as { kind?: { message?: string } } | undefined)?.kind?.message;
    return kind ? [[`allergens.${i}.kind`, kind]] : [];
  }));
  const onSubmit = handleSubmit((values) => onSave(values).catch((err) => applyServerErrors(err, setError)));
  const isTcs = watch('needsTimeTemperatureControl');
  return (
    <form onSubmit={onSubmit} noValidate className="max-w-2xl space-y-5">
      <FormError message={formState.errors.root?.server?.message} />
      <Field label="Name on the package" hint="Exactly as printed, e.g. All-purpose flour, enriched" error={formState.errors.labelName?.message} {...register('labelName')} />
      <Controller
        control={control}
        name="subIngredients"
        render={({ field, fieldState }) => (
          <Textarea
            label="Its ingredients, in package order"
            isOptional
            hint="For a compound ingredient: one per line, in the order the package lists them. Leave empty for a single ingredient."
            value={(field.value ?? []).join('\n')}
            onChange={(e) => field.onChange(e.target.value.split('\n').map((l) => l.trim()).filter((l, i, all) => l || i < all.length - 1))}
            onBlur={(e) => { field.onChange(e.target.value.split('\n').map((l) => l.trim()).filter(Boolean)); field.onBlur(); }}
            error={fieldState.error?.message ?? (formState.errors.subIngredients as unknown as Array<{ message?: string }> | undefined)?.find?.((x) => x?.message)?.message}
          />
        )}
      />
      <Controller control={control} name="allergens" render={({ field }) => <AllergenPicker value={(field.value ?? []) as AllergenDecl[]} onChange={field.onChange} errors={errors} />} />
      <Checkbox label="Allergens confirmed against the package" hint="Tick only with the package in hand." {...register('allergensConfirmed')} />
      <Field
        label="Sulphites (mg/kg)"
        isOptional
        inputMode="decimal"
        hint="Total sulphur dioxide, if the supplier states it. The EU/UK declare sulphites above 10 mg/kg (Reg. 1169/2011 Annex II)."
        error={formState.errors.sulphitesMgPerKg?.message}
        {...register('sulphitesMgPerKg', { setValueAs: (v) => (v === '' || v === null || v === undefined ? null : Number(String(v).replace(',', '.'))) })}
      />
      <Checkbox label="Needs time/temperature control for safety (TCS)" hint="For example cream cheese, fresh cream fillings, cut fruit." {...register('needsTimeTemperatureControl')} />
      {isTcs && (
        <CautionBox title="Cottage food rules usually forbid this" headingLevel={3}>
          Most cottage food laws only allow foods that do not need refrigeration for safety. Check your local rules and ask your local health authority before selling anything made with it.
        </CautionBox>
      )}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field label="Supplier" isOptional error={formState.errors.supplierName?.message} {...register('supplierName')} />
        <Field label="Supplier item code" isOptional error={formState.errors.supplierItemCode?.message} {...register('supplierItemCode')} />
      </div>
      <Textarea label="Notes" isOptional rows={2} error={formState.errors.notes?.message} {...register('notes')} />
      {isEdit && <Field label="Reason for the change" hint="Kept with the new version, e.g. Supplier changed the recipe" error={formState.errors.reason?.message} {...register('reason')} />}
      <Button type="submit" isBusy={formState.isSubmitting}>{submitLabel}</Button>
    </form>
  );
}
