import { useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import {
  CleaningTemplateInputSchema, EQUIPMENT_KINDS, EquipmentInputSchema, SanitiserProductInputSchema, type CleaningTemplateInput, type EquipmentInput,
  type SanitiserProductInput,
} from '@shared/contracts/cleaning';
import { Button } from '@/components/ui/button';
import { Checkbox } from '@/components/ui/checkbox';
import { Field, FormError } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { applyServerErrors } from '@/lib/form-errors';
import { cleaningQueries, useCreateEquipment, useCreateProduct, useCreateTemplate, useUpdateEquipment, useUpdateTemplate } from '../api';

const KIND_OPTIONS = EQUIPMENT_KINDS.map((k) => ({ value: k, label: k[0]!.toUpperCase() + k.slice(1) }));
const asNumber = (v: unknown) => (v === '' || v == null ? undefined : Number(v));
const asNullableNumber = (v: unknown) => (v === '' || v == null ? null : Number(v));

function EquipmentSection() {
  const list = useQuery(cleaningQueries.equipment()).data ?? [];
  const create = useCreateEquipment();
  const update = useUpdateEquipment();
  const form = useForm<EquipmentInput>({ resolver: zodResolver(EquipmentInputSchema), defaultValues: { name: '', kind: 'utensil', isFoodContact: true, location: '' } });
  const { errors } = form.formState;
  const submit = form.handleSubmit(async (input) => {
    try {
      await create.run(input);
      form.reset({ name: '', kind: input.kind, isFoodContact: true, location: '' });
    } catch (err) {
      applyServerErrors(err, form.setError, ['name', 'kind', 'isFoodContact', 'location']);
    }
  });
  return (
    <section aria-labelledby="equipment-heading" className="space-y-3">
      <h3 id="equipment-heading" className="text-lg font-bold">Equipment</h3>
      <ul className="divide-y divide-hairline">
        {list.map((e) => (
          <li key={e.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
            <span className={e.archived ? 'text-muted line-through' : ''}>{e.name} <span className="text-sm text-muted">· {e.kind}{e.isFoodContact ? ' · food contact' : ''}{e.location ? ` · ${e.location}` : ''}</span></span>
            <Button variant="quiet" onClick={() => void update.run({ id: e.id, input: { archived: !e.archived } })}>{e.archived ? `Restore ${e.name}` : `Archive ${e.name}`}</Button>
          </li>
        ))}
      </ul>
      <form onSubmit={submit} noValidate className="grid gap-3 sm:grid-cols-2" aria-label="Add equipment">
        <FormError message={errors.root?.server?.message} />
        <Field label="Name" error={errors.name?.message} {...form.register('name')} />
        <Select label="Kind" options={KIND_OPTIONS} {...form.register('kind')} />
        <Field label="Location" isOptional error={errors.location?.message} {...form.register('location')} />
        <Checkbox label="Food touches it" {...form.register('isFoodContact')} />
        <div><Button type="submit" isBusy={create.isPending}>Add equipment</Button></div>
      </form>
    </section>
  );
}

const BASIC_STEPS = [{ kind: 'wash', label: 'Wash' }, { kind: 'rinse', label: 'Rinse' }, { kind: 'sanitise', label: 'Sanitise' }, { kind: 'air_dry', label: 'Air-dry' }] as const;

interface TemplateForm { name: string; frequency: 'daily' | 'per_batch'; kinds: string[]; custom: string; equipmentIds: string[] }

function TemplatesSection() {
  const templates = useQuery(cleaningQueries.templates()).data ?? [];
  const equipment = (useQuery(cleaningQueries.equipment()).data ?? []).filter((e) => !e.archived);
  const create = useCreateTemplate();
  const update = useUpdateTemplate();
  const form = useForm<TemplateForm>({ defaultValues: { name: '', frequency: 'daily', kinds: BASIC_STEPS.map((s) => s.kind), custom: '', equipmentIds: [] } });
  const { errors } = form.formState;
  const submit = form.handleSubmit(async (v) => {
    // Built here, checked with the same contract the server parses.
    const input: CleaningTemplateInput = {
      name: v.name, frequency: v.frequency, equipmentIds: v.equipmentIds,
      steps: [...BASIC_STEPS.filter((s) => v.kinds.includes(s.kind)).map((s) => ({ kind: s.kind })), ...(v.custom.trim() ? [{ kind: 'custom' as const, label: v.custom.trim() }] : [])],
    };
    const parsed = CleaningTemplateInputSchema.safeParse(input);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) form.setError(issue.path[0] === 'steps' ? 'kinds' : (issue.path[0] as 'name'), { message: issue.message });
      return;
    }
    try {
      await create.run(input);
      form.reset();
    } catch (err) {
      applyServerErrors(err, form.setError, ['name', 'frequency', 'equipmentIds']);
    }
  });
  return (
    <section aria-labelledby="templates-heading" className="space-y-3">
      <h3 id="templates-heading" className="text-lg font-bold">Checklists</h3>
      <ul className="divide-y divide-hairline">
        {templates.map((t) => (
          <li key={t.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
            <span className={t.archived ? 'text-muted line-through' : ''}>{t.name} <span className="text-sm text-muted">· {t.frequency === 'daily' ? 'per day' : 'per batch'} · {t.steps.map((s) => s.label).join(', ')}</span></span>
            <Button variant="quiet" onClick={() => void update.run({ id: t.id, input: { archived: !t.archived } })}>{t.archived ? `Restore ${t.name}` : `Archive ${t.name}`}</Button>
          </li>
        ))}
      </ul>
      <form onSubmit={submit} noValidate className="space-y-3" aria-label="Add a checklist">
        <FormError message={errors.root?.server?.message} />
        <div className="grid gap-3 sm:grid-cols-2">
          <Field label="Name" error={errors.name?.message} {...form.register('name')} />
          <Select label="How often" options={[{ value: 'daily', label: 'Per day' }, { value: 'per_batch', label: 'Per batch' }]} {...form.register('frequency')} />
        </div>
        <fieldset className="space-y-1">
          <legend className="font-bold">Steps</legend>
          {BASIC_STEPS.map((s) => <Checkbox key={s.kind} label={s.label} value={s.kind} {...form.register('kinds')} />)}
          {errors.kinds ? <p className="text-sm font-bold text-cherry">{errors.kinds.message}</p> : null}
        </fieldset>
        <Field label="Your own step" isOptional hint="e.g. Wipe handles and fridge door" {...form.register('custom')} />
        {equipment.length ? (
          <fieldset className="space-y-1">
            <legend className="font-bold">Equipment it covers</legend>
            {equipment.map((e) => <Checkbox key={e.id} label={e.name} value={e.id} {...form.register('equipmentIds')} />)}
          </fieldset>
        ) : null}
        <Button type="submit" isBusy={create.isPending}>Add checklist</Button>
      </form>
    </section>
  );
}

function ProductsSection() {
  const products = useQuery(cleaningQueries.products()).data ?? [];
  const create = useCreateProduct();
  const form = useForm<SanitiserProductInput>({ resolver: zodResolver(SanitiserProductInputSchema), defaultValues: { name: '', sanitiser: 'quaternary_ammonium' } });
  const { errors } = form.formState;
  const submit = form.handleSubmit(async (input) => {
    try {
      await create.run(input);
      form.reset();
    } catch (err) {
      applyServerErrors(err, form.setError, ['name', 'sanitiser', 'labelMinPpm', 'labelMaxPpm', 'labelMinTempC', 'labelContactSeconds', 'labelMaxHardnessPpm']);
    }
  });
  return (
    <section aria-labelledby="products-heading" className="space-y-3">
      <h3 id="products-heading" className="text-lg font-bold">Sanitiser products</h3>
      <ul className="divide-y divide-hairline">
        {products.map((p) => <li key={p.id} className="py-2">{p.name} <span className="text-sm text-muted">· label {p.labelMinPpm}–{p.labelMaxPpm} ppm{p.labelContactSeconds ? ` · ${p.labelContactSeconds} s` : ''}</span></li>)}
      </ul>
      <form onSubmit={submit} noValidate className="grid gap-3 sm:grid-cols-2" aria-label="Add a sanitiser product">
        <FormError message={errors.root?.server?.message} />
        <Field label="Product name" error={errors.name?.message} {...form.register('name')} />
        <Select label="Kind" options={[{ value: 'quaternary_ammonium', label: 'Quaternary ammonium' }, { value: 'chlorine', label: 'Chlorine' }, { value: 'iodine', label: 'Iodine' }, { value: 'label_product', label: 'Other' }]} {...form.register('sanitiser')} />
        <Field label="Label range: lowest" hint="ppm" inputMode="decimal" error={errors.labelMinPpm?.message} {...form.register('labelMinPpm', { setValueAs: asNumber })} />
        <Field label="Label range: highest" hint="ppm" inputMode="decimal" error={errors.labelMaxPpm?.message} {...form.register('labelMaxPpm', { setValueAs: asNumber })} />
        <Field label="Lowest water temperature" hint="°C, from the label" isOptional inputMode="decimal" error={errors.labelMinTempC?.message} {...form.register('labelMinTempC', { setValueAs: asNullableNumber })} />
        <Field label="Contact time" hint="seconds, from the label" isOptional inputMode="numeric" error={errors.labelContactSeconds?.message} {...form.register('labelContactSeconds', { setValueAs: asNullableNumber })} />
        <div><Button type="submit" isBusy={create.isPending}>Add product</Button></div>
      </form>
    </section>
  );
}

/** Equipment, checklists and products, for owners and bakers. */
export function CleaningSetupPanel() {
  return (
    <div className="grid gap-8 lg:grid-cols-3">
      <EquipmentSection />
      <TemplatesSection />
      <ProductsSection />
    </div>
  );
}
