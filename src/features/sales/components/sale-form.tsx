import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { CreateSaleInputSchema, type CreateSaleInput, type SalesCapView } from '@shared/contracts/sales';
import { applyServerErrors } from '@/lib/form-errors';
import { Button } from '@/components/ui/button';
import { Checkbox } from '@/components/ui/checkbox';
import { Field, FormError } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { useToast } from '@/components/ui/toast';
import { CHANNEL_LABELS, dollarsToCents, salesQueries, useCreateSale } from '../api';

type CustomerMode = 'none' | 'saved' | 'new';
type SaleFormValues = z.input<typeof CreateSaleInputSchema>;

/** Record one sale: batch, date, quantity, amount, channel (only those the profile allows), optional customer. */
export function SaleForm({ cap, isOwner, today }: { cap: SalesCapView; isOwner: boolean; today: string }) {
  const batches = useQuery(salesQueries.sellable());
  const customers = useQuery({ ...salesQueries.customers(), enabled: isOwner });
  const create = useCreateSale();
  const toast = useToast();
  const [mode, setMode] = useState<CustomerMode>('none');
  const [amountText, setAmountText] = useState('');
  const defaults: Partial<SaleFormValues> = { soldOn: today, quantity: 1, unit: 'packages', channel: cap.allowedChannels[0] };
  const { register, handleSubmit, setError, setValue, formState, reset, unregister } = useForm<SaleFormValues, unknown, CreateSaleInput>({ resolver: zodResolver(CreateSaleInputSchema), defaultValues: defaults });
  const errors = formState.errors;
  const pickMode = (m: CustomerMode) => {
    setMode(m);
    if (m !== 'saved') unregister('customerId');
    if (m !== 'new') unregister('newCustomer');
  };
  const onSubmit = handleSubmit((input) =>
    create.mutateAsync(input).then(
      (sale) => {
        toast.showToast(`Sale recorded: ${sale.productName}, lot ${sale.lotCode}.`);
        reset(defaults);
        setAmountText('');
        pickMode('none');
      },
      (err) => applyServerErrors(err, setError, ['batchId', 'soldOn', 'quantity', 'unit', 'amountCents', 'channel', 'customerId', 'newCustomer.name', 'newCustomer.email', 'newCustomer.phone']),
    ),
  );
  return (
    <form onSubmit={onSubmit} noValidate aria-labelledby="sale-form-heading" className="space-y-4 rounded-card border border-hairline bg-surface p-4" data-print="hide">
      <h2 id="sale-form-heading" className="text-lg font-bold">Record a sale</h2>
      <FormError message={errors.root?.server?.message} />
      <div className="grid gap-4 sm:grid-cols-2">
        <Select
          label="Batch" placeholder={batches.isPending ? 'Loading batches…' : 'Choose a released batch'} error={errors.batchId?.message}
          options={(batches.data ?? []).map((b) => ({ value: b.id, label: `${b.lotCode} — ${b.recipeName} (${b.madeOn})` }))}
          {...register('batchId')}
        />
        <Field label="Sale date" type="date" max={today} error={errors.soldOn?.message} {...register('soldOn')} />
        <Field label="Quantity" type="number" min={1} inputMode="numeric" error={errors.quantity?.message} {...register('quantity', { valueAsNumber: true })} />
        <Select label="Counted in" options={[{ value: 'packages', label: 'Packages' }, { value: 'pieces', label: 'Pieces' }]} error={errors.unit?.message} {...register('unit')} />
        <Field
          label="Amount (US dollars)" inputMode="decimal" placeholder="0.00" value={amountText} error={errors.amountCents ? 'Enter the amount as dollars and cents, like 18.00' : undefined}
          hint="Whole dollars and cents, e.g. 24.50"
          onChange={(e) => { setAmountText(e.target.value); setValue('amountCents', dollarsToCents(e.target.value)); }}
        />
        <Select
          label="Channel" error={errors.channel?.message}
          hint={`Your rule profile allows: ${cap.allowedChannels.map((c) => CHANNEL_LABELS[c]?.toLowerCase() ?? c).join(', ')} (${cap.channelSource}).`}
          options={cap.allowedChannels.map((c) => ({ value: c, label: CHANNEL_LABELS[c] ?? c }))}
          {...register('channel')}
        />
      </div>
      <fieldset className="space-y-3">
        <legend className="font-bold">Customer (optional)</legend>
        <div className="flex flex-wrap gap-4">
          {(['none', ...(isOwner ? ['saved'] : []), 'new'] as CustomerMode[]).map((m) => (
            <label key={m} className="flex items-center gap-2">
              <input type="radio" name="customer-mode" checked={mode === m} onChange={() => pickMode(m)} className="size-5 accent-berry" />
              {m === 'none' ? 'No customer' : m === 'saved' ? 'A saved customer' : 'A new customer'}
            </label>
          ))}
        </div>
        {mode === 'saved' ? (
          <Select
            label="Saved customer" placeholder="Choose a customer" error={errors.customerId?.message}
            options={(customers.data?.items ?? []).filter((c) => c.contact).map((c) => ({ value: c.id, label: `${c.contact!.name}${c.contact!.recallConsent ? ' (recall notices: yes)' : ''}` }))}
            {...register('customerId')}
          />
        ) : null}
        {mode === 'new' ? (
          <div className="grid gap-4 sm:grid-cols-3">
            <Field label="Name" autoComplete="off" error={errors.newCustomer?.name?.message} {...register('newCustomer.name')} />
            <Field label="E-mail" type="email" isOptional autoComplete="off" error={errors.newCustomer?.email?.message} {...register('newCustomer.email')} />
            <Field label="Phone" type="tel" isOptional autoComplete="off" error={errors.newCustomer?.phone?.message} {...register('newCustomer.phone')} />
            <Checkbox className="sm:col-span-3" label="The customer agrees to be told (by e-mail or phone) if something they bought is recalled" {...register('newCustomer.recallConsent')} />
          </div>
        ) : null}
        <p className="text-sm text-muted">
          Privacy: contact details are kept apart from your records and only the owner can see them. Ask before you write them down, use them only to tell
          the customer about a recall, and erase them when the customer asks (Customers, below).
        </p>
      </fieldset>
      <Button type="submit" isBusy={create.isPending}>Record sale</Button>
    </form>
  );
}
