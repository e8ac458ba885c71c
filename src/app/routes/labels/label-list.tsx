import { useEffect, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import { useSearchParams } from 'react-router';
import { PrintLabelsInputSchema, type PrintLabelsFormInput, type PrintLabelsInput, type PrintRun } from '@shared/contracts/labels';
import { formatZonedDateTime } from '@shared/domain/zoned-time';
import { LABEL_TEMPLATES, getLabelTemplate, sheetLayout } from '@shared/domain/label-templates';
import { batchQueries } from '@/features/batches/api';
import { labelQueries, usePreviewLabels, usePrintLabels } from '@/features/labels/api';
import { useSession } from '@/features/auth/api';
import { applyServerErrors } from '@/lib/form-errors';
import { isApiError } from '@/lib/api-client';
import { PageHeader } from '@/components/ui/page-header';
import { CautionBox } from '@/components/ui/caution-box';
import { Select } from '@/components/ui/select';
import { Field, FormError } from '@/components/ui/field';
import { Checkbox } from '@/components/ui/checkbox';
import { Button } from '@/components/ui/button';
import { DataTable, type ColumnDef } from '@/components/ui/data-table';
import { LoadingBlock } from '@/components/ui/spinner';
import { StatusBadge } from '@/components/ui/status-badge';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async () => {
  // Print history is for owners and bakers only, so it loads with the screen rather than here.
  await qc.ensureQueryData(batchQueries.list({ state: 'released' }));
  return null;
};

const PAPERS = [
  { value: 'letter', label: 'US Letter sheet (8.5 × 11 in)' },
  { value: 'a4', label: 'A4 sheet (210 × 297 mm)' },
  { value: 'roll', label: 'Label printer (one label per page)' },
];

const historyColumns = (timeZone: string): ColumnDef<PrintRun, unknown>[] => [
  { id: 'printedAt', header: 'Printed', accessorFn: (r) => r.printedAt, cell: ({ row }) => formatZonedDateTime(new Date(row.original.printedAt), timeZone) },
  { id: 'product', header: 'Product', accessorFn: (r) => r.productName },
  { id: 'lot', header: 'Lot', accessorFn: (r) => r.lotCode },
  { id: 'size', header: 'Label size', accessorFn: (r) => r.templateName },
  { id: 'count', header: 'Labels', accessorFn: (r) => r.count, meta: { isNumeric: true } },
  { id: 'pages', header: 'Pages', accessorFn: (r) => r.pages, meta: { isNumeric: true } },
  { id: 'by', header: 'Printed by', accessorFn: (r) => r.printedByName },
];

/** The label check: every problem at once, then the text as it will print with its sizes. */
function CheckPanel({ batchId, templateId, confirm }: { batchId: string; templateId: string; confirm: boolean }) {
  const check = useQuery({ ...labelQueries.check(batchId, templateId, confirm), enabled: Boolean(batchId && templateId) });
  if (!batchId) return <p className="text-muted">Choose a batch to run the label check.</p>;
  if (check.isPending) return <LoadingBlock label="Checking the label…" />;
  if (check.isError) return <FormError message={check.error.message} />;
  const c = check.data;
  return (
    <section aria-labelledby="check-heading" className="space-y-3">
      <h2 id="check-heading" className="text-lg font-bold">
        Label check{' '}
        <StatusBadge status={c.ok ? 'signed' : 'failed'} label={c.ok ? 'Ready to print' : `${c.problems.length} to fix`} />
      </h2>
      {c.problems.length > 0 && (
        <div role="alert" className="rounded-card border border-cherry bg-cherry-soft p-4">
          <p className="font-bold">These labels cannot be printed yet:</p>
          <ul className="mt-1 list-disc space-y-1 pl-5">{c.problems.map((p) => <li key={p.code + p.message}>{p.message}</li>)}</ul>
        </div>
      )}
      {c.warnings.length > 0 && (
        <div className="rounded-card border border-honey bg-honey-soft p-4">
          <p className="font-bold">Check these:</p>
          <ul className="mt-1 list-disc space-y-1 pl-5">{c.warnings.map((p) => <li key={p.code + p.message}>{p.message}</li>)}</ul>
        </div>
      )}
      {c.printed.length > 0 && (
        <table className="w-full text-sm">
          <caption className="text-left font-bold">What the label will say</caption>
          <thead><tr><th scope="col" className="text-left">Text</th><th scope="col" className="text-right">Size</th></tr></thead>
          <tbody>
            {c.printed.map((b) => (
              <tr key={b.key} className="border-t border-hairline align-top">
                <td className="py-1 pr-2">{b.text}</td>
                <td className="py-1 text-right tabular-nums whitespace-nowrap">{b.sizePt} pt</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <p className="text-sm text-muted">The QR code opens the lot&rsquo;s public page: <span className="break-all">{c.lotUrl}</span></p>
    </section>
  );
}

export function Component() {
  const { user, business } = useSession();
  const [search] = useSearchParams();
  const canPrint = user?.role === 'owner' || user?.role === 'baker';
  const batches = useQuery(batchQueries.list({ state: 'released' }));
  const history = useQuery({ ...labelQueries.printRuns(), enabled: canPrint });
  const preview = usePreviewLabels();
  const printer = usePrintLabels();
  const [previewUrl, setPreviewUrl] = useState<string | null>(null);
  const [formError, setFormError] = useState<string | undefined>();
  const [done, setDone] = useState<string | null>(null);
  const form = useForm<PrintLabelsFormInput, unknown, PrintLabelsInput>({
    resolver: zodResolver(PrintLabelsInputSchema),
    defaultValues: {
      batchId: search.get('batchId') ?? '', templateId: 'rect-3x2in', count: 12, includeProofPage: false, confirmNeedsReview: false,
      sheet: { paper: 'letter', marginTopMm: 12.7, marginLeftMm: 12.7, marginRightMm: 12.7, marginBottomMm: 12.7, gutterXMm: 3, gutterYMm: 3 },
    },
  });
  const v = useWatch({ control: form.control });
  useEffect(() => () => { if (previewUrl) URL.revokeObjectURL(previewUrl); }, [previewUrl]);
  const template = getLabelTemplate(v.templateId ?? '');
  const parsedSheet = PrintLabelsInputSchema.shape.sheet.safeParse(v.sheet);
  const layout = template && parsedSheet.success ? sheetLayout(template, parsedSheet.data) : null;
  const check = useQuery({ ...labelQueries.check(v.batchId ?? '', v.templateId ?? '', Boolean(v.confirmNeedsReview)), enabled: canPrint && Boolean(v.batchId) });
  const errors = form.formState.errors;

  const fail = (err: unknown) => {
    const message = applyServerErrors(err, form.setError, ['batchId', 'templateId', 'count', 'sheet']);
    setFormError(isApiError(err) && err.status === 422 ? 'The label check found problems: see the list above.' : message);
  };
  const onPreview = form.handleSubmit(async (input) => {
    setFormError(undefined);
    try {
      setPreviewUrl(await preview.mutateAsync(input));
    } catch (err) { fail(err); }
  });
  const onPrint = form.handleSubmit(async (input) => {
    setFormError(undefined);
    setDone(null);
    try {
      await printer.mutateAsync(input);
      setDone(`${input.count} label${input.count === 1 ? '' : 's'} saved as a PDF and recorded. Print it at 100 % ("actual size").`);
    } catch (err) { fail(err); }
  });

  return (
    <>
      <PageHeader title="Labels" description="Print labels for a batch from its recorded data, after the label check." />
      <div className="mb-6">
        <CautionBox title="Rules differ by place">
          <p>Labelling rules differ by state, county and country, and they change. Check with your local health authority before you sell.</p>
          {/* The chosen batch's rule profile may add its own words. */}
          {check.data?.caution ? <p className="mt-2">{check.data.caution}</p> : null}
        </CautionBox>
      </div>
      <div className="grid gap-8 lg:grid-cols-2">
        <form noValidate aria-label="Print labels" className="space-y-4" onSubmit={onPrint}>
          <Select
            label="Batch"
            placeholder={batches.isPending ? 'Loading batches…' : 'Choose a released batch'}
            options={(batches.data?.items ?? []).map((b) => ({ value: b.id, label: `${b.recipeName} — lot ${b.lotCode} (made ${b.madeOn})` }))}
            error={errors.batchId?.message}
            {...form.register('batchId')}
          />
          <Select label="Label size" options={LABEL_TEMPLATES.map((t) => ({ value: t.id, label: t.name }))} error={errors.templateId?.message} {...form.register('templateId')} />
          <Field label="How many labels" type="number" inputMode="numeric" min={1} max={1000} error={errors.count?.message} {...form.register('count')} />
          <fieldset className="space-y-3 rounded-card border border-hairline p-4">
            <legend className="px-1 font-bold">Paper and layout</legend>
            <Select label="Paper" options={PAPERS} error={errors.sheet?.paper?.message} {...form.register('sheet.paper')} />
            {v.sheet?.paper !== 'roll' && (
              <div className="grid grid-cols-2 gap-3">
                <Field label="Top margin (mm)" type="number" step="0.1" error={errors.sheet?.marginTopMm?.message} {...form.register('sheet.marginTopMm')} />
                <Field label="Bottom margin (mm)" type="number" step="0.1" error={errors.sheet?.marginBottomMm?.message} {...form.register('sheet.marginBottomMm')} />
                <Field label="Left margin (mm)" type="number" step="0.1" error={errors.sheet?.marginLeftMm?.message} {...form.register('sheet.marginLeftMm')} />
                <Field label="Right margin (mm)" type="number" step="0.1" error={errors.sheet?.marginRightMm?.message} {...form.register('sheet.marginRightMm')} />
                <Field label="Gap between columns (mm)" type="number" step="0.1" error={errors.sheet?.gutterXMm?.message} {...form.register('sheet.gutterXMm')} />
                <Field label="Gap between rows (mm)" type="number" step="0.1" error={errors.sheet?.gutterYMm?.message} {...form.register('sheet.gutterYMm')} />
              </div>
            )}
            <p aria-live="polite" className="text-sm">
              {layout ? (layout.perPage === 0 ? 'This label does not fit on the paper with these margins.' : `${layout.columns} × ${layout.rows} = ${layout.perPage} labels per page.`) : ''}
            </p>
            {errors.sheet?.message && <FormError message={errors.sheet.message} />}
          </fieldset>
          <Checkbox label="Add a proof page (caution, size ruler and one outlined label); do not print it on label stock" {...form.register('includeProofPage')} />
          {check.data?.needsOwnerConfirmation && user?.role === 'owner' && (
            <Checkbox
              label="I have checked this batch: it was made while the product's safety assessment said &ldquo;needs review&rdquo;"
              hint="Only the owner can confirm this."
              {...form.register('confirmNeedsReview')}
            />
          )}
          <p className="rounded-card border border-edge bg-surface p-3 text-sm">
            <strong>Print at 100 % (&ldquo;actual size&rdquo;).</strong> Turn off &ldquo;fit to page&rdquo; or the labels will not match the stock.
          </p>
          <FormError message={formError} />
          {done && <p role="status" className="font-bold text-pistachio">{done}</p>}
          <div className="flex flex-wrap gap-3">
            <Button variant="secondary" onClick={onPreview} isBusy={preview.isPending} disabled={check.data ? !check.data.ok : false}>Preview</Button>
            <Button type="submit" isBusy={printer.isPending} disabled={check.data ? !check.data.ok : false}>Print labels (download PDF)</Button>
          </div>
        </form>
        <div className="space-y-6">
          <CheckPanel batchId={v.batchId ?? ''} templateId={v.templateId ?? ''} confirm={Boolean(v.confirmNeedsReview)} />
          {previewUrl && (
            <section aria-labelledby="preview-heading">
              <h2 id="preview-heading" className="mb-2 text-lg font-bold">Preview</h2>
              <iframe title="Label preview (PDF)" src={previewUrl} className="h-[32rem] w-full rounded-card border border-edge bg-surface" />
            </section>
          )}
        </div>
      </div>
      <section aria-labelledby="history-heading" className="mt-10">
        <h2 id="history-heading" className="mb-2 text-lg font-bold">Print history</h2>
        <DataTable caption="Label print runs, newest first" isCaptionHidden columns={historyColumns(business?.timeZone ?? 'UTC')} data={history.data ?? []} getRowId={(r) => r.id} emptyMessage="No labels printed yet." />
      </section>
    </>
  );
}
