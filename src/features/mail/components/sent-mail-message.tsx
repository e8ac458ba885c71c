import type { SentMail } from '@shared/contracts/mail';
import { formatZonedDateTime } from '@shared/domain/zoned-time';
import { useSession } from '@/features/auth/api';

/**
 * One captured message as it went out. HTML is shown only inside a sandboxed iframe (no scripts, no
 * same-origin access); otherwise the plain text is shown as text.
 */
export function SentMailMessage({ mail }: { mail: SentMail }) {
  const { business } = useSession();
  return (
    <article className="rounded border border-stone-300 bg-white p-4" aria-labelledby={`mail-${mail.id}`}>
      <h2 id={`mail-${mail.id}`} className="text-lg font-bold">{mail.subject}</h2>
      <dl className="mt-2 grid grid-cols-[6rem_1fr] gap-x-2 text-sm">
        <dt className="font-semibold">From</dt><dd>{mail.from}</dd>
        <dt className="font-semibold">To</dt><dd>{mail.to}</dd>
        <dt className="font-semibold">Date</dt><dd><time dateTime={mail.date}>{formatZonedDateTime(new Date(mail.date), business?.timeZone ?? 'UTC')}</time></dd>
      </dl>
      {mail.html ? (
        <iframe title={`Message: ${mail.subject}`} sandbox="" srcDoc={mail.html} className="mt-3 h-64 w-full rounded border border-stone-200" />
      ) : (
        <pre className="mt-3 whitespace-pre-wrap break-words rounded bg-stone-50 p-3 font-sans text-sm">{mail.text ?? ''}</pre>
      )}
      {mail.attachments.length > 0 && (
        <div className="mt-2 text-sm">
          <h3 className="font-semibold">Attachments</h3>
          <ul className="list-disc pl-5">{mail.attachments.map((a, i) => <li key={i}>{a.filename} ({a.contentType}, {Math.ceil(a.size / 1024)} KB)</li>)}</ul>
        </div>
      )}
    </article>
  );
}
