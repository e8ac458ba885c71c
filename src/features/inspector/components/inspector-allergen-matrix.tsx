import type { AllergenMatrix } from '@shared/contracts/recipes';

/** Products × allergens, a ✓ with the word "Contains" (never colour alone); read only, no recipe links. */
export function InspectorAllergenMatrix({ matrix }: { matrix: AllergenMatrix }) {
  return (
    <section aria-labelledby="insp-allergens" className="space-y-2">
      <h2 id="insp-allergens" className="text-xl font-bold">Allergen matrix</h2>
      <p className="text-sm text-muted">
        Current version of every product, allergens as listed for {matrix.regime.code} rules of {matrix.regime.ruleSetDate}.
      </p>
      {matrix.products.length === 0 ? <p className="text-muted">No products for sale.</p> : (
        <div className="relative overflow-x-auto">
          <table className="min-w-full border-collapse text-left" data-testid="inspector-allergen-matrix">
            <caption className="sr-only">Products and the allergens they contain</caption>
            <thead>
              <tr>
                <th scope="col" className="border border-edge p-2">Product</th>
                {matrix.allergens.map((a) => <th key={a.key} scope="col" className="border border-edge p-2 text-sm">{a.name}</th>)}
              </tr>
            </thead>
            <tbody>
              {matrix.products.map((p) => (
                <tr key={p.recipeId}>
                  <th scope="row" className="border border-edge p-2 font-bold">
                    {p.name}
                    <span className="block text-xs font-normal text-muted">version {p.version}</span>
                    {p.warnings.length ? <span className="block text-xs">Not yet confirmed: {p.warnings.join(' ')}</span> : null}
                  </th>
                  {p.cells.map((c) => (
                    <td key={c.key} className="border border-edge p-2 text-center">
                      {c.isPresent ? <span><span aria-hidden="true">✓ </span>Contains{c.kinds.length ? ` (${c.kinds.join(', ')})` : ''}</span> : <span className="text-muted">—<span className="sr-only">Not in the recipe</span></span>}
                    </td>
                  ))}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </section>
  );
}
