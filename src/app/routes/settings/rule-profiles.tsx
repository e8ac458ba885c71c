import { useState } from 'react';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router';
import type { LabelElementKey, RuleProfile, RuleSource } from '@shared/contracts/rule-profiles';
import { ELEMENT_NAMES } from '@shared/domain/label-check';
import { holdingPolicyName } from '@shared/domain/holding-rules';
import { ruleProfileQueries } from '@/features/recipes/api';
import { useCopyRuleProfile, useSaveRuleProfileVersion } from '@/features/settings/api';
import { useSession } from '@/features/auth/api';
import { PageHeader } from '@/components/ui/page-header';
import { Button } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { Field, FormError } from '@/components/ui/field';
import { LoadingBlock } from '@/components/ui/spinner';
import { StatusBadge } from '@/components/ui/status-badge';
import { useToast } from '@/components/ui/toast';
import { isApiError } from '@/lib/api-client';

/** "the product name" → "Product name", for a list. */
const elementName = (key: LabelElementKey) => {
  const words = ELEMENT_NAMES[key].replace(/^the /, '');
  return words.charAt(0).toUpperCase() + words.slice(1);
};

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async () => {
  await qc.ensureQueryData(ruleProfileQueries.list());
  return null;
};

function Source({ source }: { source: RuleSource }) {
  return (
    <span className="block text-sm text-muted">
      {source.verified ? null : <StatusBadge status="unverified" className="mr-1" />}
      Source: {source.url ? <a className="text-blueberry underline" href={source.url} rel="noreferrer noopener" target="_blank">{source.citation}</a> : source.citation}
      {source.checkedOn ? ` (checked ${source.checkedOn})` : ''}{source.note ? `. ${source.note}` : ''}
    </span>
  );
}

function ProfileValues({ p }: { p: RuleProfile }) {
  const row = (label: string, value: string, source: RuleSource) => (
    <div className="border-t border-hairline py-2"><dt className="font-bold">{label}</dt><dd>{value}<Source source={source} /></dd></div>
  );
  return (
    <dl>
      {row('In force', `${p.effectiveFrom} to ${p.effectiveTo ?? 'now'}`, p.effectiveSource)}
      {row('Allergen list', `${p.allergenRegime.value.regime}, rule set of ${p.allergenRegime.value.ruleSetDate}`, p.allergenRegime.source)}
      {row('Home-kitchen statement', p.homeKitchenStatement.value ? `“${p.homeKitchenStatement.value.text}”${p.homeKitchenStatement.value.minPoints ? ` (at least ${p.homeKitchenStatement.value.minPoints} pt)` : ''}` : 'None', p.homeKitchenStatement.source)}
      {row('Safe-handling statement (TCS foods)', p.tcsStatement.value ? `“${p.tcsStatement.value.text}”` : 'None', p.tcsStatement.source)}
      {row('Net quantity', `${p.netQuantity.value.units === 'us-dual' ? 'US customary and metric' : 'Metric'}, ${p.netQuantity.value.rounding}`, p.netQuantity.source)}
      {row('Annual sales cap', p.salesCap.value ? `${p.salesCap.value.amount.toLocaleString('en-US')} ${p.salesCap.value.currency}${p.salesCap.value.year ? ` (${p.salesCap.value.year})` : ''}` : 'None', p.salesCap.source)}
      {row('Sales channels', p.salesChannels.value.join(', '), p.salesChannels.source)}
      {row('Foods needing time/temperature control', p.allowsTcsFoods.value ? 'Allowed' : 'Not allowed', p.allowsTcsFoods.source)}
      {row('Holding policy', holdingPolicyName(p.holdingPolicy.value.kind, p.holdingPolicy.value.customLimitMinutes), p.holdingPolicy.source)}
      {row('Sanitisers', `${p.sanitisers.value.length} rule(s)`, p.sanitisers.source)}
      <div className="border-t border-hairline py-2">
        <dt className="font-bold">Required on the label</dt>
        <dd><ul className="list-disc pl-5">{[...p.requiredLabelElements.map((e) => ({ ...e, id: e.key, name: elementName(e.key) })), ...p.tcsRequiredLabelElements.map((e) => ({ ...e, id: `${e.key}-tcs`, name: `${elementName(e.key)} (TCS foods)` }))].map((e) => <li key={e.id}>{e.name}<Source source={e.source} /></li>)}</ul></dd>
      </div>
    </dl>
  );
}

/** Owner edit of a custom profile's commonly changed values; each edited value takes the source the owner gives. */
function EditProfile({ id, profile, version }: { id: string; profile: RuleProfile; version: number }) {
  const save = useSaveRuleProfileVersion();
  const toast = useToast();
  const [name, setName] = useState(profile.name);
  const [cap, setCap] = useState(profile.salesCap.value ? String(profile.salesCap.value.amount) : '');
  const [home, setHome] = useState(profile.homeKitchenStatement.value?.text ?? '');
  const [citation, setCitation] = useState('');
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string>();
  const today = new Date().toISOString().slice(0, 10);
  const submit = async () => {
    setError(undefined);
    const source: RuleSource = { citation: citation || 'Edited by the owner', verified: false, checkedOn: today };
    const next: RuleProfile = structuredClone(profile);
    next.name = name;
    if (cap !== (profile.salesCap.value ? String(profile.salesCap.value.amount) : '')) {
      next.salesCap = { value: cap.trim() ? { amount: Number(cap), currency: profile.salesCap.value?.currency ?? 'USD', year: profile.salesCap.value?.year ?? null, period: profile.salesCap.value?.period ?? 'calendar-year' } : null, source };
    }
    if (home !== (profile.homeKitchenStatement.value?.text ?? '')) {
      next.homeKitchenStatement = { value: home.trim() ? { text: home, minPoints: profile.homeKitchenStatement.value?.minPoints ?? null } : null, source };
    }
    try {
      await save.mutateAsync({ id, profile: next, reason, basedOnVersion: version });
      toast.showToast(`Saved version ${version + 1} of the profile.`);
      setReason('');
    } catch (err) {
      setError(isApiError(err) ? [err.message, ...Object.entries(err.fieldErrors).map(([k, v]) => `${k}: ${v.join(' ')}`)].join(' ') : 'Something went wrong.');
    }
  };
  return (
    <section aria-labelledby="edit-h" className="mt-6 space-y-3 rounded-card border border-edge bg-surface p-4">
      <h3 id="edit-h" className="text-lg font-bold">Edit this copy (saved as version {version + 1})</h3>
      <FormError message={error} />
      <Field label="Name" value={name} onChange={(e) => setName(e.target.value)} />
      <Field label="Annual sales cap" inputMode="decimal" isOptional value={cap} onChange={(e) => setCap(e.target.value)} />
      <Field label="Home-kitchen statement" isOptional value={home} onChange={(e) => setHome(e.target.value)} />
      <Field label="Source for the values you change" hint="Changed values are marked unverified until you confirm them in writing." value={citation} onChange={(e) => setCitation(e.target.value)} />
      <Field label="Why are you changing it?" value={reason} onChange={(e) => setReason(e.target.value)} />
      <Button isBusy={save.isPending} onClick={submit}>Save new version</Button>
    </section>
  );
}

export function Component() {
  const { user } = useSession();
  const isOwner = user?.role === 'owner';
  const [params, setParams] = useSearchParams();
  const list = useQuery(ruleProfileQueries.list());
  const selected = params.get('id') ?? list.data?.profiles.find((p) => p.isInUse)?.id ?? list.data?.profiles[0]?.id;
  const detail = useQuery({ ...ruleProfileQueries.detail(selected ?? ''), enabled: !!selected });
  const copy = useCopyRuleProfile();
  const [copyName, setCopyName] = useState('');
  const [copyError, setCopyError] = useState<string>();
  if (!list.data) return <LoadingBlock />;
  return (
    <>
      <PageHeader title="Rule profiles" description="What each profile asks of your labels and records, with the source and date of every value." />
      <CautionBox title="Local rules decide">
        <p>Rules differ by country, state and county, and they change. These profiles name their sources; your local rules and your local health authority decide. A value marked “unverified” could not be checked in a published text.</p>
      </CautionBox>
      <div className="mt-6 grid gap-6 lg:grid-cols-[minmax(0,1fr)_minmax(0,2fr)]">
        <nav aria-label="Profiles">
          <ul className="space-y-1">
            {list.data.profiles.map((p) => (
              <li key={p.id}>
                <button type="button" aria-current={p.id === selected ? 'true' : undefined} onClick={() => setParams({ id: p.id })}
                  className={`w-full rounded-control border p-2 text-left ${p.id === selected ? 'border-berry bg-berry-soft' : 'border-edge bg-surface'}`}>
                  <span className="font-bold">{p.name}</span>
                  <span className="block text-sm">{p.isCustom ? `Your copy, version ${p.version}` : 'Shipped'}{p.isInUse ? ' · in use' : ''} · {p.unverifiedCount} unverified</span>
                </button>
              </li>
            ))}
          </ul>
        </nav>
        <section aria-labelledby="profile-h">
          {!detail.data ? <LoadingBlock /> : (
            <>
              <h2 id="profile-h" className="text-xl font-bold">{detail.data.profile.name}</h2>
              <p className="text-sm text-muted">{detail.data.profile.isCustom ? `Your copy of ${detail.data.profile.basedOnId}, version ${detail.data.version}` : 'Shipped with Crumbtrail'}{detail.data.isInUse ? ' · the profile your business uses' : ''}</p>
              <ProfileValues p={detail.data.profile} />
              {detail.data.versions.length > 1 ? (
                <details className="mt-2"><summary className="cursor-pointer font-bold">Versions</summary>
                  <ol className="list-decimal pl-5">{detail.data.versions.map((v) => <li key={v.version}>{v.createdAt.slice(0, 10)}{v.createdBy ? `, ${v.createdBy}` : ''}: {v.reason}</li>)}</ol>
                </details>
              ) : null}
              {isOwner ? (
                <section aria-labelledby="copy-h" className="mt-6 space-y-2 rounded-card border border-edge bg-surface p-4">
                  <h3 id="copy-h" className="text-lg font-bold">Make your own copy</h3>
                  <FormError message={copyError} />
                  <Field label="Name of the copy" value={copyName} onChange={(e) => setCopyName(e.target.value)} />
                  <Button isBusy={copy.isPending} onClick={async () => {
                    setCopyError(undefined);
                    try {
                      const made = await copy.mutateAsync({ basedOnId: detail.data.profile.id, name: copyName });
                      setParams({ id: made.profile.id });
                      setCopyName('');
                    } catch (err) {
                      setCopyError(isApiError(err) ? err.fieldErrors.name?.join(' ') ?? err.message : 'Something went wrong.');
                    }
                  }}>Copy this profile</Button>
                </section>
              ) : null}
              {isOwner && detail.data.profile.isCustom && detail.data.version ? <EditProfile key={`${detail.data.profile.id}-${detail.data.version}`} id={detail.data.profile.id} profile={detail.data.profile} version={detail.data.version} /> : null}
            </>
          )}
        </section>
      </div>
    </>
  );
}
