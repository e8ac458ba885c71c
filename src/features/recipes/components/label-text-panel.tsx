import type { LabelText } from '@shared/domain/label-text';
import { CautionBox } from '@/components/ui/caution-box';
import { StatusBadge } from '@/components/ui/status-badge';

/** The TCS assessment in words: "needs review" whenever it is not a clear table result, never "safe". */
export function TcsAssessment({ tcs }: { tcs: LabelText['tcs'] }) {
  return (
    <div className="flex flex-wrap items-center gap-2">
      {tcs.result === 'non_tcs' ? (
        <span className="inline-flex items-center rounded-full border border-edge px-2.5 py-0.5 text-sm font-bold">Not TCS by Food Code Table {tcs.table}</span>
      ) : (
        <StatusBadge status="needs-review" />
      )}
      <span className="text-sm text-muted">{tcs.reason}</span>
    </div>
  );
}

/** Label text as the engine computed it: statement (allergens in bold), Contains line, net quantity, TCS, cautions. */
export function LabelTextPanel({ text, headingLevel = 3 }: { text: LabelText; headingLevel?: 2 | 3 }) {
  const H = `h${headingLevel}` as 'h2' | 'h3';
  const blocking = text.cautions.filter((c) => c.severity === 'block');
  const warnings = text.cautions.filter((c) => c.severity === 'warn');
  const info = text.cautions.filter((c) => c.severity === 'info' && c.code !== 'local_rules');
  const local = text.cautions.find((c) => c.code === 'local_rules');
  return (
    <div className="space-y-4">
      <section aria-label="Ingredient statement">
        <H className="font-bold">Ingredient statement</H>
        <p data-testid="label-statement" className="mt-1 rounded-control border border-edge bg-surface p-3">
          {text.ingredientStatement.segments.length === 0 ? <span className="text-muted">No ingredients yet.</span> : text.ingredientStatement.segments.map((s, i) => (s.isAllergen ? <strong key={i}>{s.text}</strong> : <span key={i}>{s.text}</span>))}
        </p>
      </section>
      <section aria-label="Allergens">
        <H className="font-bold">Allergens</H>
        {text.allergenStatement.containsLine ? <p data-testid="label-contains" className="mt-1 font-bold">{text.allergenStatement.containsLine}</p> : null}
        <p className="mt-1 text-sm">
          {text.allergenStatement.allergens.length === 0
            ? 'No major allergens under this profile.'
            : `Major allergens: ${text.allergenStatement.allergens.map((a) => (a.kinds.length ? `${a.name} (${a.kinds.join(', ')})` : a.name)).join(', ')}.`}
        </p>
      </section>
      <section aria-label="Net quantity">
        <H className="font-bold">Net quantity per package</H>
        <p data-testid="label-net" className="mt-1 tabular-nums">{text.netQuantity?.text ?? 'Not set'}</p>
      </section>
      {text.statements.length ? (
        <section aria-label="Required statements">
          <H className="font-bold">Statements this profile requires</H>
          <ul className="mt-1 list-disc pl-5">{text.statements.map((s) => <li key={s.key}>{s.text}</li>)}</ul>
        </section>
      ) : null}
      <section aria-label="Time and temperature control">
        <H className="font-bold">Time/temperature control (TCS) assessment</H>
        <div className="mt-1"><TcsAssessment tcs={text.tcs} /></div>
      </section>
      {blocking.length ? (
        <CautionBox title="Fix before printing a label" headingLevel={headingLevel === 2 ? 3 : 4}>
          <ul className="list-disc pl-5">{blocking.map((c, i) => <li key={i}>{c.message}</li>)}</ul>
        </CautionBox>
      ) : null}
      {warnings.length ? (
        <CautionBox title="Check these" headingLevel={headingLevel === 2 ? 3 : 4}>
          <ul className="list-disc pl-5">{warnings.map((c, i) => <li key={i}>{c.message}</li>)}</ul>
        </CautionBox>
      ) : null}
      {info.length ? <ul className="list-disc pl-5 text-sm text-muted">{info.map((c, i) => <li key={i}>{c.message}</li>)}</ul> : null}
      {local ? (
        <CautionBox title="Local rules decide" headingLevel={headingLevel === 2 ? 3 : 4}>
          <p>{local.message}</p>
        </CautionBox>
      ) : null}
    </div>
  );
}
