import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type SortingState,
} from '@tanstack/react-table';
import { useState, type ReactNode } from 'react';
import { EmptyState } from './feedback';

interface DataTableProps<T> {
  data: T[];
  columns: ColumnDef<T, any>[];
  /** Text searched across all columns (kept by the caller, e.g. in the URL). */
  search: string;
  caption: string;
  empty: ReactNode;
  initialSort?: SortingState;
  rowLabel?: (row: T) => string;
}

/** A sortable, searchable table (TanStack Table); click a column header to sort by it. */
export function DataTable<T>({ data, columns, search, caption, empty, initialSort = [], rowLabel }: DataTableProps<T>) {
  const [sorting, setSorting] = useState<SortingState>(initialSort);
  const table = useReactTable({
    data,
    columns,
    state: { sorting, globalFilter: search },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    globalFilterFn: 'includesString',
  });
  const rows = table.getRowModel().rows;
  return (
    <div className="overflow-x-auto rounded-panel bg-white shadow-panel ring-1 ring-ink-100">
      <table className="w-full text-left text-body">
        <caption className="sr-only">{caption}</caption>
        <thead className="bg-ptfe-50">
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => {
                const sorted = header.column.getIsSorted();
                return (
                  <th
                    key={header.id}
                    scope="col"
                    aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
                    className="border-b border-ink-100 px-3 py-2 text-caption font-semibold uppercase tracking-wide text-ink-500"
                  >
                    {header.column.getCanSort() ? (
                      <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 uppercase hover:text-ink-800">
                        {flexRender(header.column.columnDef.header, header.getContext())}
                        <span aria-hidden className="text-ink-300">{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}</span>
                      </button>
                    ) : (
                      flexRender(header.column.columnDef.header, header.getContext())
                    )}
                  </th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {rows.map((row) => (
            <tr key={row.id} aria-label={rowLabel?.(row.original)} className="border-t border-ink-100 hover:bg-ptfe-50">
              {row.getVisibleCells().map((cell) => (
                <td key={cell.id} className="px-3 py-2 align-top">
                  {flexRender(cell.column.columnDef.cell, cell.getContext())}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      {rows.length === 0 ? <div className="p-4"><EmptyState title="Nothing matches">{empty}</EmptyState></div> : null}
    </div>
  );
}
