import { useRef, useState } from 'react';
import { Link, useParams } from 'react-router';
import { useQuery, type QueryClient } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router';
import type { IngredientDetail } from '@shared/contracts/ingredients';
import { MAX_LABEL_FILES_PER_INGREDIENT } from '@shared/contracts/ingredients';
import { ingredientQueries, labelFileUrl, useArchiveIngredient, useUpdateIngredient, useUploadLabelFile, useVerifyIngredient } from '@/features/ingredients/api';
import { IngredientForm } from '@/features/ingredients/components/ingredient-form';
import { IngredientBadges } from '@/features/ingredients/components/ingredient-badges';
import { LabelCheckForm, ReceiveLotForm } from '@/features/ingredients/components/lot-forms';
import { allergenText } from '@/features/ingredients/components/allergen-names';
import { useSession } from '@/features/auth/api';
import { formatZonedDateTime } from '@shared/domain/zoned-time';
import { isApiError } from '@/lib/api-client';
import { PageHeader } from '@/components/ui/page-header';
import { Button } from '@/components/ui/button';
import { CautionBox } from '@/components/ui/caution-box';
import { LoadingBlock } from '@/components/ui/spinner';
import { FormError } from '@/components/ui/field';
import { Dialog } from '@/components/ui/dialog';
import { Field } from '@/components/ui/field';
import { useToast } from '@/components/ui/toast';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export const loader = (qc: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  await qc.ensureQueryData(ingredientQueries.detail(params.ingredientId!));
  return null;
};

/** Times in the business zone with its offset, like every other record screen. */
function useWhen() {
  const { business } = useSession();
  return (iso: string) => formatZonedDateTime(new Date(iso), business?.timeZone ?? 'UTC');
}
const CHANGE_WORDS = { create: 'Created', edit: 'Edited', verify: 'Checked against package', archive: 'Archived', restore: 'Restored' } as const;

function Section({ id, title, children }: { id: string; title: string; children: React.ReactNode }) {
  return (
    <section aria-labelledby={id} className="rounded-card border border-hairline bg-surface p-4 sm:p-6">
      <h2 id={id} className="text-xl font-bold">{title}</h2>
      <div className="mt-3 space-y-3">{children}</div>
    </section>
  );
}

function Declared({ i }: { i: IngredientDetail }) {
  const when = useWhen();
  return (
    <dl className="grid gap-x-6 gap-y-2 sm:grid-cols-[12rem_1fr]">
      <dt className="font-bold">Its ingredients</dt><dd>{i.subIngredients.length ? i.subIngredients.join(', ') : 'A single ingredient'}</dd>
      <dt className="font-bold">Allergens</dt><dd>{i.allergens.length ? i.allergens.map(allergenText).join(', ') : 'None declared'} {i.allergensConfirmed ? '(marked as read off the package when entered)' : '(not yet marked as read off the package)'}</dd>
      <dt className="font-bold">Sulphites</dt><dd>{i.sulphitesMgPerKg === null ? 'Not stated' : `${i.sulphitesMgPerKg} mg/kg`}</dd>
      <dt className="font-bold">Time/temperature control</dt><dd>{i.needsTimeTemperatureControl ? 'Needed (TCS)' : 'Not needed'}</dd>
      <dt className="font-bold">Supplier</dt><dd>{[i.supplierName, i.supplierItemCode && `item ${i.supplierItemCode}`].filter(Boolean).join(', ') || 'Not recorded'}</dd>
      <dt className="font-bold">Checked against package</dt><dd>{i.verifiedBy && i.verifiedAt ? `${i.verifiedBy.name}, ${when(i.verifiedAt)}` : 'Not yet'}</dd>
      {i.notes && (<><dt className="font-bold">Notes</dt><dd>{i.notes}</dd></>)}
    </dl>
  );
}

function LabelFiles({ i, canEdit }: { i: IngredientDetail; canEdit: boolean }) {
  const when = useWhen();
  const upload = useUploadLabelFile(i.id);
  const input = useRef<HTMLInputElement>(null);
  const [error, setError] = useState<string>();
  const { showToast } = useToast();
  const onPick = async (file: File | undefined) => {
    if (!file) return;
    setError(undefined);
    try {
      await upload.mutateAsync(file);
      showToast(`${file.name} added.`);
    } catch (err) {
      setError(isApiError(err) ? err.message : 'The upload failed. Try again.');
    } finally {
      if (input.current) input.current.value = '';
    }
  };
  return (
    <>
      {i.labelFiles.length === 0 ? <p>No label photo yet.</p> : (
        <ul className="grid gap-4 sm:grid-cols-3">
          {i.labelFiles.map((f) => (
            <li key={f.id} className="space-y-1">
              {f.isImage
                ? <img src={labelFileUrl(i.id, f.id, 'view')} alt={`Label photo ${f.displayName}`} className="max-h-48 rounded border border-edge" />
                : <p>PDF: {f.displayName}</p>}
              <p className="text-sm text-muted">{f.uploadedBy?.name ?? 'Someone'}, {when(f.createdAt)} · <a className="text-berry underline" href={labelFileUrl(i.id, f.id, 'download')}>Download</a></p>
            </li>
          ))}
        </ul>
      )}
      {canEdit && i.labelFiles.length < MAX_LABEL_FILES_PER_INGREDIENT && (
        <div className="space-y-1">
          <FormError message={error} />
          <label htmlFor="label-file" className="block font-bold">Add a label photo or PDF</label>
          <p id="label-file-hint" className="text-sm text-muted">JPEG, PNG, WebP or PDF, up to 10 MB; at most {MAX_LABEL_FILES_PER_INGREDIENT} per ingredient.</p>
          <input ref={input} id="label-file" type="file" accept="image/jpeg,image/png,image/webp,application/pdf" aria-describedby="label-file-hint" disabled={upload.isPending} onChange={(e) => onPick(e.target.files?.[0])} />
        </div>
      )}
    </>
  );
}

function Lots({ i, canEdit }: { i: IngredientDetail; canEdit: boolean }) {
  const when = useWhen();
  const today = new Date().toLocaleDateString('en-CA');
  return (
    <>
      {i.lots.length === 0 ? <p>No lots received yet.</p> : (
        <table className="w-full text-left">
          <caption className="sr-only">Lots received</caption>
          <thead><tr><th scope="col">Lot code</th><th scope="col">Received</th><th scope="col">Best by</th><th scope="col">Label re-check</th></tr></thead>
          <tbody>
            {i.lots.map((l) => (
              <tr key={l.id} className="border-t border-hairline align-top">
                <th scope="row" className="py-2 font-mono">{l.lotCode}</th>
                <td className="py-2">{l.receivedOn}{l.quantity && ` · ${l.quantity}`}</td>
                <td className="py-2">{l.bestBy ?? '—'}</td>
                <td className="py-2">
                  {l.labelChecks[0]
                    ? <span>{l.labelChecks[0].outcome === 'matches' ? 'Matches' : `Changed: ${l.labelChecks[0].notes}`} — {l.labelChecks[0].checkedBy.name}, {when(l.labelChecks[0].checkedAt)}</span>
                    : <span className="font-bold text-honey">Re-check needed</span>}
                  {l.needsLabelRecheck && canEdit && <div className="mt-2"><LabelCheckForm ingredientId={i.id} lotId={l.id} lotCode={l.lotCode} /></div>}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {canEdit && (<><h3 className="text-lg font-bold">Receive a lot</h3><ReceiveLotForm ingredientId={i.id} today={today} /></>)}
    </>
  );
}

function Versions({ i }: { i: IngredientDetail }) {
  const when = useWhen();
  return (
    <ol className="space-y-2">
      {i.versions.map((v) => (
        <li key={v.id} className="border-l-4 border-edge pl-3">
          <p><span className="font-bold">Version {v.version}: {CHANGE_WORDS[v.change]}</span> — {v.createdBy?.name ?? 'Someone'}, {when(v.createdAt)}</p>
          {v.reason && <p>Reason: {v.reason}</p>}
          <p className="text-sm text-muted">{v.labelName}{v.subIngredients.length ? ` (${v.subIngredients.join(', ')})` : ''}; allergens: {v.allergens.map(allergenText).join(', ') || 'none'}</p>
        </li>
      ))}
    </ol>
  );
}

function ArchiveDialog({ i, onClose }: { i: IngredientDetail; onClose: () => void }) {
  const archive = useArchiveIngredient(i.id, i.isArchived);
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string>();
  const submit = () => archive.mutateAsync({ reason }).then(onClose, (err) => setError(isApiError(err) ? (err.fieldErrors.reason?.[0] ?? err.message) : 'Try again.'));
  return (
    <Dialog isOpen onClose={onClose} title={i.isArchived ? 'Restore this ingredient?' : 'Archive this ingredient?'} description="Recipes that already use it keep working. The reason is kept with the record."
      actions={<><Button variant="secondary" onClick={onClose}>Cancel</Button><Button isBusy={archive.isPending} onClick={submit}>{i.isArchived ? 'Restore' : 'Archive'}</Button></>}>
      <Field label="Reason" value={reason} onChange={(e) => setReason(e.target.value)} error={error} />
    </Dialog>
  );
}

export function Component() {
  const { ingredientId } = useParams();
  const detail = useQuery(ingredientQueries.detail(ingredientId!));
  const session = useSession();
  const canEdit = session.user?.role === 'owner' || session.user?.role === 'baker';
  const [isEditing, setEditing] = useState(false);
  const [isArchiving, setArchiving] = useState(false);
  const update = useUpdateIngredient(ingredientId!);
  const verify = useVerifyIngredient(ingredientId!);
  const { showToast } = useToast();
  if (!detail.data) return <LoadingBlock label="Loading ingredient…" />;
  const i = detail.data;
  return (
    <>
      <p className="mb-2"><Link className="text-berry underline" to={paths.ingredients}>All ingredients</Link></p>
      <PageHeader
        title={i.labelName}
        description={<IngredientBadges ingredient={i} />}
        actions={canEdit && !isEditing ? (
          <div className="flex flex-wrap gap-2">
            <Button variant="secondary" onClick={() => setEditing(true)}>Edit</Button>
            <Button variant="secondary" isBusy={verify.isPending} onClick={() => verify.mutateAsync({}).then(() => showToast('Recorded: checked against the package.'))}>I checked it against the package</Button>
            <Button variant="quiet" onClick={() => setArchiving(true)}>{i.isArchived ? 'Restore' : 'Archive'}</Button>
          </div>
        ) : undefined}
      />
      {isArchiving && <ArchiveDialog i={i} onClose={() => setArchiving(false)} />}
      <div className="space-y-6">
        {i.needsTimeTemperatureControl && (
          <CautionBox title="This ingredient needs time/temperature control">
            Cottage food rules usually forbid foods made with ingredients like this unless they are fully cooked into a shelf-stable product. Check your local rules and ask your local health authority.
          </CautionBox>
        )}
        {isEditing ? (
          <Section id="edit" title="Edit ingredient">
            <p>Saving makes a new version; the old one is kept. Changing what the package declares clears the "checked against package" mark.</p>
            <IngredientForm isEdit submitLabel="Save new version" initial={{ ...i, reason: '', baseVersion: i.version }} onSave={async (values) => {
              await update.mutateAsync({ ...values, baseVersion: i.version, reason: values.reason ?? '' });
              setEditing(false);
              showToast('New version saved.');
            }} />
            <Button variant="quiet" onClick={() => setEditing(false)}>Cancel</Button>
          </Section>
        ) : (
          <Section id="declared" title="What the package declares"><Declared i={i} /></Section>
        )}
        <Section id="label-files" title="Label photos and spec sheets"><LabelFiles i={i} canEdit={canEdit} /></Section>
        <Section id="lots" title="Lots received"><Lots i={i} canEdit={canEdit} /></Section>
        <Section id="versions" title="Version history"><Versions i={i} /></Section>
      </div>
    </>
  );
}
