import { useId, useState, type ReactNode } from 'react';
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from '@tanstack/react-table';
import { cn } from '@/lib/cn';
import { Icon } from './icon';
import { controlClasses } from './field';

export type { ColumnDef } from '@tanstack/react-table';

export interface DataTableProps<T> {
  /** Says what the table lists; read out by screen readers and shown unless isCaptionHidden. */
  caption: string;
  isCaptionHidden?: boolean;
  columns: ColumnDef<T, unknown>[];
  data: T[];
  getRowId?: (row: T) => string;
  /** Shows a search box that filters every column's text; its label, e.g. "Search recipes". */
  searchLabel?: string;
  initialSorting?: SortingState;
  /** What to say when there are no rows (or none match the search). */
  emptyMessage?: ReactNode;
  /** The column whose cells head their row (<th scope="row">); defaults to the first. */
  rowHeaderColumnId?: string;
  className?: string;
}

/**
 * A data table with a <caption>, <th scope> headers, sortable columns (buttons with aria-sort) and an
 * optional search. Columns turn sorting off with `enableSorting: false`; right-align numbers with
 * `meta: { isNumeric: true }`.
 */
export function DataTable<T>({ caption, isCaptionHidden, columns, data, getRowId, searchLabel, initialSorting = [], emptyMessage = 'Nothing to show yet.', rowHeaderColumnId, className }: DataTableProps<T>) {
  const [sorting, setSorting] = useState<SortingState>(initialSorting);
  const [globalFilter, setGlobalFilter] = useState('');
  const searchId = useId();
  const table = useReactTable({
    data,
    columns,
    state: { sorting, globalFilter },
    onSortingChange: setSorting,
    onGlobalFilterChange: setGlobalFilter,
    getRowId,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });
  const rows = table.getRowModel().rows;
  const headerColumnId = rowHeaderColumnId ?? table.getAllLeafColumns()[0]?.id;

  return (
    <div className={cn('space-y-3', className)}>
      {searchLabel ? (
        <div className="max-w-sm">
          <label htmlFor={searchId} className="mb-1 block font-bold">
            {searchLabel}
          </label>
          <input id={searchId} type="search" value={globalFilter} onChange={(e) => setGlobalFilter(e.target.value)} className={controlClasses} />
        </div>
      ) : null}
      {/* relative: keeps sr-only text inside cells from widening the page. */}
      <div className="relative overflow-x-auto rounded-card border border-hairline bg-surface">
        <table className="w-full border-collapse text-left">
          <caption className={cn('px-4 py-3 text-left text-lg font-bold', isCaptionHidden && 'sr-only')}>{caption}</caption>
          <thead className="bg-flour">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  const isNumeric = (header.column.columnDef.meta as { isNumeric?: boolean } | undefined)?.isNumeric;
                  const content = header.isPlaceholder ? null : flexRender(header.column.columnDef.header, header.getContext());
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      colSpan={header.colSpan}
                      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                      className={cn('border-b border-edge px-4 py-2 text-sm font-bold whitespace-nowrap', isNumeric && 'text-right')}
                    >
                      {header.column.getCanSort() ? (
                        <button
                          type="button"
                          onClick={header.column.getToggleSortingHandler()}
                          className="-mx-1 inline-flex min-h-8 items-center gap-1 rounded-control px-1 font-bold hover:bg-berry-soft"
                        >
                          {content}
                          <Icon name={sorted === 'asc' ? 'sortUp' : sorted === 'desc' ? 'sortDown' : 'sort'} className="size-4 text-muted" />
                        </button>
                      ) : (
                        content
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {rows.length === 0 ? (
              <tr>
                <td colSpan={table.getAllLeafColumns().length} className="px-4 py-6 text-center text-muted">
                  {globalFilter ? `Nothing matches “${globalFilter}”.` : emptyMessage}
                </td>
              </tr>
            ) : (
              rows.map((row) => (
                <tr key={row.id} className="border-b border-hairline last:border-b-0">
                  {row.getVisibleCells().map((cell) => {
                    const isNumeric = (cell.column.columnDef.meta as { isNumeric?: boolean } | undefined)?.isNumeric;
                    const Cell = cell.column.id === headerColumnId ? 'th' : 'td';
                    return (
                      <Cell
                        key={cell.id}
                        scope={Cell === 'th' ? 'row' : undefined}
                        className={cn('px-4 py-2 align-top', Cell === 'th' && 'font-bold', isNumeric && 'tabular text-right')}
                      >
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </Cell>
                    );
                  })}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
      <p className="sr-only" role="status">
        {globalFilter ? `${rows.length} ${rows.length === 1 ? 'row' : 'rows'} shown` : ''}
      </p>
    </div>
  );
}
