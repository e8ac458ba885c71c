import { useQuery } from '@tanstack/react-query';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState } from '@/components/ui/empty-state';
import { LoadingBlock } from '@/components/ui/spinner';
import { mailQueries } from '@/features/mail/api';
import { SentMailMessage } from '@/features/mail/components/sent-mail-message';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  const { data, isPending } = useQuery(mailQueries.list());
  return (
    <div className="space-y-4">
      <PageHeader title="Sent mail" description="Every e-mail Crumbtrail sent for this business, exactly as it went out." />
      {isPending || !data ? <LoadingBlock label="Loading sent mail…" /> : (
        <>
          {!data.capturing && <p>Mail goes to your mail server; copies are not kept here.</p>}
          {data.pending.length > 0 && (
            <section aria-labelledby="pending-mail">
              <h2 id="pending-mail" className="text-lg font-bold">Waiting to send</h2>
              <ul className="list-disc pl-5">{data.pending.map((p) => <li key={p.id}>{p.subject} to {p.to}: {p.status === 'failed' ? 'could not be sent' : 'will be tried again'}{p.lastError ? ` (${p.lastError})` : ''}</li>)}</ul>
            </section>
          )}
          {data.messages.length === 0 ? <EmptyState title="No mail yet">Invites, inspector links and reminders appear here once sent.</EmptyState> : (
            <div className="space-y-3">{data.messages.map((m) => <SentMailMessage key={m.id} mail={m} />)}</div>
          )}
        </>
      )}
    </div>
  );
}
