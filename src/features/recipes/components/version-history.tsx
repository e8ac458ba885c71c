import type { RecipeVersionMeta } from '@shared/contracts/recipes';

/** Every version, newest first, with how its saved label text differed from the one before. */
export function VersionHistory({ versions, timeZone }: { versions: RecipeVersionMeta[]; timeZone: string }) {
  const fmt = new Intl.DateTimeFormat('en-US', { dateStyle: 'medium', timeStyle: 'short', timeZone });
  return (
    <ol className="space-y-4" aria-label="Versions, newest first">
      {[...versions].reverse().map((v) => (
        <li key={v.version} className="rounded-card border border-edge bg-surface p-4">
          <p className="font-bold">Version {v.version}{v.isArchived ? ' (archived)' : ''} — {fmt.format(new Date(v.createdAt))}{v.createdBy ? `, ${v.createdBy}` : ''}</p>
          <p className="text-sm">{v.reason ? `Reason: ${v.reason}` : 'First version'}</p>
          {v.version > 1 && v.changes.length === 0 ? <p className="mt-1 text-sm text-muted">The label text did not change.</p> : null}
          {v.changes.length ? (
            <dl className="mt-2 space-y-2">
              {v.changes.map((c) => (
                <div key={c.field}>
                  <dt className="font-bold">{c.label} changed</dt>
                  <dd className="text-sm">
                    {c.added.length ? <p><span className="font-bold">Added:</span> {c.added.join('; ')}</p> : null}
                    {c.removed.length ? <p><span className="font-bold">Removed:</span> {c.removed.join('; ')}</p> : null}
                    {!c.added.length && !c.removed.length ? <p>Order or wording changed.</p> : null}
                    <details className="mt-1"><summary className="cursor-pointer text-berry">Before and after</summary>
                      <p><span className="font-bold">Before:</span> <del>{c.before || '(none)'}</del></p>
                      <p><span className="font-bold">After:</span> <ins>{c.after || '(none)'}</ins></p>
                    </details>
                  </dd>
                </div>
              ))}
            </dl>
          ) : null}
        </li>
      ))}
    </ol>
  );
}
