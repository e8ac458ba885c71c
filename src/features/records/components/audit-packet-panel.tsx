import { useRef, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { Button } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { Field, FormError } from '@/components/ui/field';
import { api, isApiError } from '@/lib/api-client';
import { applyServerErrors } from '@/lib/form-errors';
import { AuditPacketInputSchema, type AuditPacketInput } from '@shared/contracts/audit-packet';

const pad = (n: number) => String(n).padStart(2, '0');
const ymd = (d: Date) => `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;

/** The calendar month before today's: the range inspectors ask for most. */
export function lastMonth(today = new Date()): AuditPacketInput {
  return { from: ymd(new Date(today.getFullYear(), today.getMonth() - 1, 1)), to: ymd(new Date(today.getFullYear(), today.getMonth(), 0)) };
}

const kib = (n: number) => (n < 1024 * 1024 ? `${Math.max(1, Math.round(n / 1024))} KB` : `${(n / 1024 / 1024).toFixed(1)} MB`);

function saveFile(blob: Blob, name: string) {
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 60_000);
}

/** Records screen: pick a range and download the audit packet zip, with progress as it streams. */
export function AuditPacketPanel() {
  const [received, setReceived] = useState(0);
  const [saved, setSaved] = useState<string | null>(null);
  const abort = useRef<AbortController | null>(null);
  const form = useForm<AuditPacketInput>({ resolver: zodResolver(AuditPacketInputSchema), defaultValues: lastMonth() });
  const download = useMutation({
    mutationFn: async (range: AuditPacketInput) => {
      abort.current = new AbortController();
      setReceived(0);
      setSaved(null);
      const { blob, headers } = await api.postForDownload('/api/audit-packets', range, setReceived, abort.current.signal);
      const name = /filename="([^"]+)"/.exec(headers.get('Content-Disposition') ?? '')?.[1] ?? `audit-packet-${range.from}-to-${range.to}.zip`;
      saveFile(blob, name);
      return { name, bytes: blob.size };
    },
    onSuccess: (r) => setSaved(`${r.name} (${kib(r.bytes)}) is in your downloads.`),
    onError: (err) => {
      if (isApiError(err)) applyServerErrors(err, form.setError, ['from', 'to']);
    },
  });
  const errors = form.formState.errors;
  const failure = download.error && !(download.error instanceof DOMException) ? download.error.message : undefined;
  return (
    <section aria-labelledby="audit-packet" className="space-y-3">
      <h2 id="audit-packet" className="text-lg font-bold">Audit packet</h2>
      <p className="text-sm">
        One zip for a date range: a PDF report (batches, holding times, cleaning with signatures, allergens, labels, corrections and the record-chain check), the records as CSV files,
        and a manifest with a SHA-256 fingerprint of every file. Customer contact details are never included.
      </p>
      <form onSubmit={form.handleSubmit((v) => download.mutate(v))} className="grid gap-3 sm:grid-cols-3 sm:items-end" noValidate>
        <Field label="Records from" type="date" hint="First day included" {...form.register('from')} error={errors.from?.message} />
        <Field label="Records to" type="date" hint="Last day included" {...form.register('to')} error={errors.to?.message} />
        <div className="flex gap-2">
          <Button type="submit" isBusy={download.isPending}>Download packet</Button>
          {download.isPending && <Button variant="quiet" onClick={() => abort.current?.abort()}>Cancel</Button>}
        </div>
      </form>
      {download.isPending && (
        <div role="status" aria-live="polite" className="space-y-1 text-sm">
          <p>Making the packet… {kib(received)} received</p>
          {/* The size is unknown until the end (the zip is made as it streams): the bar shows activity, the text shows bytes. */}
          <progress className="h-3 w-full" aria-label="Audit packet download" value={received > 0 ? undefined : 0} />
        </div>
      )}
      {saved && <p role="status" className="text-sm font-bold">Done: {saved}</p>}
      <FormError message={failure && !errors.from && !errors.to ? failure : undefined} />
      <CautionBox title="Local rules decide" headingLevel={3}>
        <p className="text-sm">The packet is a copy of what you recorded here. Your state or local health authority decides which records you must keep and show; ask them when in doubt.</p>
      </CautionBox>
    </section>
  );
}
