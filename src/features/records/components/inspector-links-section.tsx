import { useState } from 'react';
import { formatZonedDateTime } from '@shared/domain/zoned-time';
import { useSession } from '@/features/auth/api';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { Button } from '@/components/ui/button';
import { CreateInspectorLinkInputSchema, type CreateInspectorLinkInput } from '@shared/contracts/inspector';
import { recordsQueries, useCreateInspectorLink, useRevokeInspectorLink } from '../api';

const todayIso = () => new Date().toISOString().slice(0, 10);
const input = 'block w-full rounded border border-stone-400 px-2 py-1';

/** What an inspector's logged request was, in words; the stored path stays the evidence. */
function viewLabel(path: string): string {
  if (path === '/inspect') return 'opened the link';
  if (path === '/api/inspector/records') return 'read the records';
  if (path === '/api/inspector/allergen-matrix') return 'read the allergen matrix';
  if (path.startsWith('/api/inspector/documents/')) return 'downloaded a document';
  return path;
}

export function InspectorLinksSection() {
  const { business } = useSession();
  const when = (iso: string) => formatZonedDateTime(new Date(iso), business?.timeZone ?? 'UTC');
  const { data } = useQuery(recordsQueries.links());
  const create = useCreateInspectorLink();
  const revoke = useRevokeInspectorLink();
  const [lastUrl, setLastUrl] = useState<string | null>(null);
  const form = useForm<CreateInspectorLinkInput>({ resolver: zodResolver(CreateInspectorLinkInputSchema) as never, defaultValues: { inspectorName: '', inspectorEmail: '', rangeFrom: todayIso(), rangeTo: todayIso(), validDays: 7 } });
  const errors = form.formState.errors;
  const onSubmit = form.handleSubmit(async (values) => {
    const created = await create.mutateAsync(values);
    setLastUrl(created.url);
    form.reset();
  });
  return (
    <section aria-labelledby="inspector-links" className="space-y-3">
      <h2 id="inspector-links" className="text-lg font-bold">Inspector links</h2>
      <p className="text-sm">A read-only link to your records for a date range. Anyone with the link can read them until it expires, so send it only to the inspector.</p>
      <form onSubmit={onSubmit} className="grid gap-2 sm:grid-cols-2" noValidate>
        <label>Inspector or office<input className={input} {...form.register('inspectorName')} aria-invalid={Boolean(errors.inspectorName)} />{errors.inspectorName && <span role="alert" className="text-sm text-red-800">{errors.inspectorName.message}</span>}</label>
        <label>E-mail the link to (optional)<input type="email" className={input} {...form.register('inspectorEmail')} />{errors.inspectorEmail && <span role="alert" className="text-sm text-red-800">{errors.inspectorEmail.message}</span>}</label>
        <label>Records from<input type="date" className={input} {...form.register('rangeFrom')} /></label>
        <label>Records to<input type="date" className={input} {...form.register('rangeTo')} />{errors.rangeTo && <span role="alert" className="text-sm text-red-800">{errors.rangeTo.message}</span>}</label>
        <label>Link works for (days, at most 30)<input type="number" min={1} max={30} className={input} {...form.register('validDays')} />{errors.validDays && <span role="alert" className="text-sm text-red-800">{errors.validDays.message}</span>}</label>
        <div className="self-end"><Button type="submit" isBusy={create.isPending}>Create link</Button></div>
      </form>
      {lastUrl && <p role="status" className="break-all rounded bg-stone-100 p-2 text-sm">New link (shown once): <code>{lastUrl}</code></p>}
      <ul className="space-y-2">
        {data?.links.map((l) => (
          <li key={l.id} className="rounded border border-stone-300 p-2 text-sm">
            <strong>{l.inspectorName}</strong> · {l.rangeFrom} to {l.rangeTo} · {l.status === 'active' ? `works until ${when(l.expiresAt)}` : l.status}
            {' '}· {l.views.length} {l.views.length === 1 ? 'view' : 'views'}
            {l.status === 'active' && <Button variant="quiet" className="ml-2" onClick={() => revoke.mutate(l.id)}>Revoke</Button>}
            {l.views.length > 0 && <ul className="mt-1 list-disc pl-5">{l.views.slice(0, 10).map((v, i) => <li key={i}>{when(v.at)}: {viewLabel(v.path)} (visitor {v.visitor})</li>)}</ul>}
          </li>
        ))}
      </ul>
    </section>
  );
}
