import { useState } from 'react';
import { Link } from 'react-router';
import type { ImportPreview } from '@shared/contracts/ingredients';
import { INGREDIENT_CSV_COLUMNS } from '@shared/domain/ingredient-csv';
import { useImportConfirm, useImportPreview } from '@/features/ingredients/api';
import { allergenText } from '@/features/ingredients/components/allergen-names';
import { isApiError } from '@/lib/api-client';
import { PageHeader } from '@/components/ui/page-header';
import { Textarea } from '@/components/ui/textarea';
import { Button } from '@/components/ui/button';
import { FormError } from '@/components/ui/field';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  const [csv, setCsv] = useState('');
  const [preview, setPreview] = useState<ImportPreview | null>(null);
  const [error, setError] = useState<string>();
  const [done, setDone] = useState<string>();
  const previewing = useImportPreview();
  const confirming = useImportConfirm();
  const fail = (err: unknown) => setError(isApiError(err) ? err.message : 'Something went wrong. Try again.');
  const runPreview = () => { setError(undefined); setDone(undefined); previewing.mutateAsync(csv).then(setPreview, fail); };
  const runConfirm = () => confirming.mutateAsync(csv).then((r) => { setDone(`Imported ${r.created.length} ingredient${r.created.length === 1 ? '' : 's'}; ${r.skipped.length} row${r.skipped.length === 1 ? ' was' : 's were'} skipped.`); setPreview(null); setCsv(''); }, fail);
  return (
    <>
      <PageHeader title="Import ingredients from a spreadsheet" description="Export your sheet as CSV (UTF-8), check the preview, then import the rows without errors. Nothing is saved until you confirm." />
      <div className="space-y-6">
        <section aria-labelledby="columns" className="rounded-card border border-hairline bg-surface p-4">
          <h2 id="columns" className="text-lg font-bold">Columns</h2>
          <p>The first row names the columns. Only <code>label_name</code> is required.</p>
          <table className="mt-2 text-left">
            <caption className="sr-only">Spreadsheet columns</caption>
            <thead><tr><th scope="col">Column</th><th scope="col">What to put in it</th></tr></thead>
            <tbody>{INGREDIENT_CSV_COLUMNS.map((c) => <tr key={c.column}><th scope="row" className="pr-4 font-mono">{c.column}</th><td>{c.help}</td></tr>)}</tbody>
          </table>
          <p className="mt-2 text-sm text-muted">Imported ingredients start as "not checked against the package": check each one with its package in hand.</p>
        </section>
        <div className="space-y-2">
          <label className="block font-bold" htmlFor="csv-file">Choose a CSV file</label>
          <input id="csv-file" type="file" accept=".csv,text/csv" onChange={async (e) => { const f = e.target.files?.[0]; if (f) setCsv(await f.text()); }} />
          <Textarea label="Or paste the CSV text" rows={8} value={csv} onChange={(e) => setCsv(e.target.value)} />
          <FormError message={error} />
          {done && <p role="status" className="font-bold">{done} <Link className="text-berry underline" to={paths.ingredients}>See ingredients</Link></p>}
          <Button onClick={runPreview} disabled={!csv.trim()} isBusy={previewing.isPending}>Preview</Button>
        </div>
        {preview && (
          <section aria-labelledby="preview" className="space-y-3">
            <h2 id="preview" className="text-xl font-bold">Preview</h2>
            {preview.fileErrors.map((e) => <p key={e} role="alert" className="font-bold text-cherry">{e}</p>)}
            <p role="status">{preview.validCount} row{preview.validCount === 1 ? '' : 's'} ready, {preview.errorCount} with errors.</p>
            <table className="w-full text-left">
              <caption className="sr-only">Rows in the file</caption>
              <thead><tr><th scope="col">Row</th><th scope="col">Name</th><th scope="col">Allergens</th><th scope="col">Problems</th></tr></thead>
              <tbody>
                {preview.rows.map((r) => (
                  <tr key={r.rowNumber} className="border-t border-hairline align-top">
                    <th scope="row">{r.rowNumber}</th>
                    <td>{r.ingredient?.labelName ?? '—'}</td>
                    <td>{r.ingredient ? r.ingredient.allergens.map(allergenText).join(', ') || 'None' : '—'}</td>
                    <td>{r.errors.length ? <ul>{r.errors.map((e, k) => <li key={k} className="text-cherry"><span className="font-mono">{e.field}</span>: {e.message}</li>)}</ul> : 'Ready'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <Button onClick={runConfirm} disabled={preview.validCount === 0} isBusy={confirming.isPending}>Import {preview.validCount} ingredient{preview.validCount === 1 ? '' : 's'}</Button>
          </section>
        )}
      </div>
    </>
  );
}
