/** Placeholder: the audit packet download is added here by the records packet feature. */
export function AuditPacketSection() {
  return (
    <section aria-labelledby="audit-packet" className="rounded border border-dashed border-stone-300 p-4">
      <h2 id="audit-packet" className="text-lg font-bold">Audit packet</h2>
      <p className="text-sm">A printable packet of your records for a date range will be available here.</p>
    </section>
  );
}
