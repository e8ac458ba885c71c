import type { ReactNode } from 'react';
import type { AllergenMatrix } from '@shared/contracts/recipes';

type Product = AllergenMatrix['products'][number];

/**
 * Products × allergens: a ✓ with the word "Contains" and the kinds (never colour alone). `productCell` lets a
 * screen link the product name (members) or not (inspectors).
 */
export function AllergenMatrixTable({ matrix, productCell, warningLabel, testId }: {
  matrix: AllergenMatrix;
  productCell: (p: Product) => ReactNode;
  warningLabel: string;
  testId: string;
}) {
  return (
    <div className="relative overflow-x-auto">
      <table className="min-w-full border-collapse text-left" data-testid={testId}>
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
              <th scope="row" className="border border-edge p-2 font-normal">
                {productCell(p)}
                <span className="block text-xs text-muted">version {p.version}</span>
                {p.warnings.length ? <span className="block text-xs font-bold">{warningLabel} {p.warnings.join(' ')}</span> : null}
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
  );
}
