import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { Link } from 'react-router';
import { UpdateBusinessInputSchema, type Business, type UpdateBusinessInput } from '@shared/contracts/business';
import { formatLotCode, validateLotCodeTemplate } from '@shared/domain/lot-codes';
import { businessLocalDate, isValidTimeZone } from '@shared/domain/zoned-time';
import { businessQueries, useUpdateBusiness } from '@/features/settings/api';
import { ruleProfileQueries } from '@/features/recipes/api';
import { PageHeader } from '@/components/ui/page-header';
import { Button } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { Field, FormError } from '@/components/ui/field';
import { Select } from '@/components/ui/select';
import { LoadingBlock } from '@/components/ui/spinner';
import { useToast } from '@/components/ui/toast';
import { applyServerErrors } from '@/lib/form-errors';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async () => {
  await Promise.all([qc.ensureQueryData(businessQueries.current()), qc.ensureQueryData(ruleProfileQueries.list())]);
  return null;
};

type FormValues = Required<UpdateBusinessInput>;
const FIELDS = ['name', 'addressLine', 'city', 'region', 'postalCode', 'country', 'phone', 'email', 'registrationNumber', 'registrationAuthority', 'timeZone', 'ruleProfileId', 'lotCodePrefix', 'lotCodeTemplate'] as const;

function pick(b: Business): FormValues {
  return Object.fromEntries(FIELDS.map((k) => [k, b[k]])) as FormValues;
}

/** A lot code made with the template today, or why it cannot be made. */
function lotExample(template: string, prefix: string, timeZone: string): string {
  if (validateLotCodeTemplate(template).length) return 'Fix the template to see an example.';
  try {
    const today = businessLocalDate(new Date(), isValidTimeZone(timeZone) ? timeZone : 'UTC');
    return `${formatLotCode(template, { prefix, madeOn: today, seq: 1 })} (first batch today), ${formatLotCode(template, { prefix, madeOn: today, seq: 2 })} (second)`;
  } catch (err) {
    return (err as Error).message;
  }
}

export function Component() {
  const business = useQuery(businessQueries.current());
  const profiles = useQuery(ruleProfileQueries.list());
  if (!business.data || !profiles.data) return <LoadingBlock />;
  return <SettingsForm business={business.data} profileOptions={profiles.data.profiles.map((p) => ({ value: p.id, label: `${p.name}${p.isCustom ? ' (your copy)' : ''}` }))} />;
}

function SettingsForm({ business, profileOptions }: { business: Business; profileOptions: { value: string; label: string }[] }) {
  const toast = useToast();
  const update = useUpdateBusiness();
  const [message, setMessage] = useState<string>();
  const { register, handleSubmit, setError, control, formState: { errors, isSubmitting } } = useForm<FormValues>({ defaultValues: pick(business), resolver: zodResolver(UpdateBusinessInputSchema) as never });
  const [template, prefix, timeZone] = useWatch({ control, name: ['lotCodeTemplate', 'lotCodePrefix', 'timeZone'] });
  const submit = handleSubmit(async (values) => {
    setMessage(undefined);
    try {
      await update.mutateAsync(values);
      toast.showToast('Business settings saved.');
    } catch (err) {
      setMessage(applyServerErrors(err, setError, FIELDS));
    }
  });
  const f = (name: (typeof FIELDS)[number], label: string, extra: Record<string, unknown> = {}) => <Field label={label} {...register(name)} error={errors[name]?.message} {...extra} />;
  return (
    <>
      <PageHeader title="Settings" description="The business profile printed on labels, the rule profile, and the lot-code scheme. Every change is recorded." />
      <form onSubmit={submit} noValidate className="max-w-3xl space-y-8" aria-label="Business settings">
        <FormError message={message} />
        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="col-span-full text-lg font-bold">Business profile</legend>
          {f('name', 'Business name')}
          {f('phone', 'Phone', { isOptional: true })}
          {f('addressLine', 'Street address', { isOptional: true })}
          {f('city', 'Town or city', { isOptional: true })}
          {f('region', 'State or region', { isOptional: true })}
          {f('postalCode', 'Postal code', { isOptional: true })}
          <Select label="Country" options={[{ value: 'US', label: 'United States' }, { value: 'GB', label: 'United Kingdom' }, { value: 'EU', label: 'European Union' }]} {...register('country')} error={errors.country?.message} />
          {f('email', 'E-mail', { type: 'email', isOptional: true })}
          {f('registrationNumber', 'Registration or permit number', { isOptional: true })}
          {f('registrationAuthority', 'Issued by (authority)', { isOptional: true })}
          {f('timeZone', 'Time zone', { hint: 'An IANA name such as America/Chicago. Dates on records and lot codes use it.' })}
        </fieldset>
        <fieldset className="space-y-3">
          <legend className="text-lg font-bold">Rule profile</legend>
          <Select label="Rules your labels and checks follow" options={profileOptions} {...register('ruleProfileId')} error={errors.ruleProfileId?.message} />
          <p><Link className="font-bold text-berry underline" to={`${paths.settings}/rule-profiles`}>See every profile's values and sources, or make your own copy</Link></p>
          <CautionBox title="Local rules decide" headingLevel={3}><p>Rule profiles are starting points taken from published sources. Your local rules and your local health authority decide; check them before you label or sell.</p></CautionBox>
        </fieldset>
        <fieldset className="grid gap-4 sm:grid-cols-2">
          <legend className="col-span-full text-lg font-bold">Lot codes</legend>
          {f('lotCodePrefix', 'Prefix', { hint: '1 to 8 capital letters or digits.' })}
          {f('lotCodeTemplate', 'Template', { hint: 'Tokens: {PREFIX} {YYYY} {YY} {DDD} {MM} {DD} {GGGG} {WW} {D} {SEQ}.' })}
          <p className="col-span-full" aria-live="polite">Example: <strong data-testid="lot-example" className="tabular-nums">{lotExample(template ?? '', prefix ?? '', timeZone ?? '')}</strong></p>
        </fieldset>
        <Button type="submit" isBusy={isSubmitting}>Save settings</Button>
      </form>
    </>
  );
}
