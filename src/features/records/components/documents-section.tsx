import { useQuery } from '@tanstack/react-query';
import { useState, type FormEvent } from 'react';
import { Button } from '@/components/ui/button';
import { StatusBadge } from '@/components/ui/status-badge';
import { DOCUMENT_KINDS, DOCUMENT_KIND_LABELS } from '@shared/contracts/documents';
import { isApiError } from '@/lib/api-client';
import { recordsQueries, useUploadDocument } from '../api';

const input = 'block w-full rounded border border-stone-400 px-2 py-1';

export function DocumentsSection() {
  const { data } = useQuery(recordsQueries.documents());
  const upload = useUploadDocument();
  const [error, setError] = useState<string | null>(null);
  const onSubmit = async (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    setError(null);
    try {
      await upload.mutateAsync(new FormData(e.currentTarget));
      e.currentTarget.reset();
    } catch (err) {
      setError(isApiError(err) ? err.message : 'The upload did not work. Try again.');
    }
  };
  return (
    <section aria-labelledby="documents" className="space-y-3">
      <h2 id="documents" className="text-lg font-bold">Documents</h2>
      {data && data.documents.length === 0 ? <p className="text-muted">No documents yet. Upload your permit or registration and training certificates so their expiry dates are watched.</p> : null}
      <ul className="space-y-1">
        {data?.documents.map((d) => (
          <li key={d.id} className="flex flex-wrap items-center gap-2 text-sm">
            <a className="text-berry underline" href={`/api/documents/${d.id}/versions/${d.current.id}/download`}>{d.current.title}</a>
            {/* Demo and typical titles already name the kind and holder; say them only when they add something. */}
            {d.current.title.toLowerCase().startsWith(DOCUMENT_KIND_LABELS[d.kind].toLowerCase()) ? null : <span>({DOCUMENT_KIND_LABELS[d.kind]}{d.holder ? `, ${d.holder.displayName}` : ''})</span>}
            {d.expiryStatus === 'expired' && <StatusBadge status="over-limit" label="Expired" />}
            {d.expiryStatus === 'expiring_soon' && <StatusBadge status="due-soon" label={`Expires in ${d.daysLeft} days`} />}
            {d.expiryStatus === 'valid' && <StatusBadge status="within-limit" label={`Valid to ${d.current.expiresOn}`} />}
            {d.expiryStatus === 'no_expiry' && <span className="text-muted">issued {d.current.issuedOn}, no expiry</span>}
          </li>
        ))}
      </ul>
      <h3 className="pt-2 font-bold">Add a document</h3>
      <form onSubmit={onSubmit} className="grid gap-2 sm:grid-cols-2">
        <label>Kind<select name="kind" className={input} defaultValue="registration">{DOCUMENT_KINDS.map((k) => <option key={k} value={k}>{DOCUMENT_KIND_LABELS[k]}</option>)}</select></label>
        <label>Title<input name="title" required className={input} /></label>
        <label>Issued on<input name="issuedOn" type="date" required className={input} /></label>
        <label>Expires on (if it does)<input name="expiresOn" type="date" className={input} /></label>
        <label>File (PDF, JPEG or PNG, up to 10 MB)<input name="file" type="file" accept=".pdf,.jpg,.jpeg,.png" required className={input} /></label>
        <div className="self-end"><Button type="submit" isBusy={upload.isPending}>Upload</Button></div>
        {error && <p role="alert" className="text-sm text-red-800 sm:col-span-2">{error}</p>}
      </form>
    </section>
  );
}
