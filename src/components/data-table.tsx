import { ArrowDown, ArrowUp, ArrowUpDown, ChevronLeft, ChevronRight } from 'lucide-react';
import type { ReactNode } from 'react';

export interface Column<T> {
  key: string;
  header: string;
  /** The server's sort key; columns without one do not sort. */
  sortKey?: string;
  align?: 'left' | 'right';
  render: (row: T) => ReactNode;
}

export interface DataTableProps<T> {
  caption: string;
  columns: Column<T>[];
  rows: T[];
  rowKey: (row: T) => string | number;
  total: number;
  /** The server counted `total` matches and stopped: there are more. */
  totalCapped?: boolean;
  page: number;
  pageSize: number;
  sort?: string;
  dir?: 'asc' | 'desc';
  loading?: boolean;
  empty?: ReactNode;
  onSort?: (sortKey: string) => void;
  onPage: (page: number) => void;
}

/** A table sorted and paged on the server. */
export function DataTable<T>({ caption, columns, rows, rowKey, total, totalCapped = false, page, pageSize, sort, dir, loading, empty, onSort, onPage }: DataTableProps<T>) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const from = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const to = Math.min(total, page * pageSize);
  return (
    <div className="overflow-hidden rounded-xl border border-parchment-200 bg-white shadow-card">
      <div className="overflow-x-auto">
        <table className="min-w-full text-sm" aria-busy={loading || undefined}>
          <caption className="sr-only">{caption}</caption>
          <thead className="bg-parchment-100 text-left text-xs uppercase tracking-wide text-walnut-600">
            <tr>
              {columns.map((col) => {
                const active = col.sortKey && sort === col.sortKey;
                const ariaSort = active ? (dir === 'asc' ? 'ascending' : 'descending') : undefined;
                return (
                  <th key={col.key} scope="col" aria-sort={ariaSort} className={`px-4 py-2.5 font-semibold ${col.align === 'right' ? 'text-right' : ''}`}>
                    {col.sortKey && onSort ? (
                      <button type="button" onClick={() => onSort(col.sortKey!)} className="inline-flex items-center gap-1 uppercase hover:text-walnut-900">
                        {col.header}
                        {active ? (
                          dir === 'asc' ? <ArrowUp className="h-3.5 w-3.5" aria-hidden /> : <ArrowDown className="h-3.5 w-3.5" aria-hidden />
                        ) : (
                          <ArrowUpDown className="h-3.5 w-3.5 opacity-40" aria-hidden />
                        )}
                      </button>
                    ) : (
                      col.header
                    )}
                  </th>
                );
              })}
            </tr>
          </thead>
          <tbody className={`divide-y divide-parchment-200 ${loading ? 'opacity-60' : ''}`}>
            {rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-4 py-10 text-center text-walnut-500">
                  {loading ? 'Loading…' : (empty ?? 'Nothing here yet.')}
                </td>
              </tr>
            ) : (
              rows.map((row) => (
                <tr key={rowKey(row)} className="hover:bg-parchment-50">
                  {columns.map((col) => (
                    <td key={col.key} className={`px-4 py-2.5 align-middle ${col.align === 'right' ? 'num text-right' : ''}`}>
                      {col.render(row)}
                    </td>
                  ))}
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
      <nav className="flex items-center justify-between gap-4 border-t border-parchment-200 bg-parchment-50 px-4 py-2 text-sm text-walnut-600" aria-label={`${caption} pages`}>
        <span className="num">
          {from}–{to} of {totalCapped ? `more than ${total}` : total}
        </span>
        <div className="flex items-center gap-2">
          <button type="button" className="rounded p-1 hover:bg-walnut-50 disabled:opacity-40" onClick={() => onPage(page - 1)} disabled={page <= 1} aria-label="Previous page">
            <ChevronLeft className="h-4 w-4" aria-hidden />
          </button>
          <span className="num">
            Page {page} of {totalCapped ? `more than ${pages}` : pages}
          </span>
          <button type="button" className="rounded p-1 hover:bg-walnut-50 disabled:opacity-40" onClick={() => onPage(page + 1)} disabled={page >= pages && !totalCapped} aria-label="Next page">
            <ChevronRight className="h-4 w-4" aria-hidden />
          </button>
        </div>
      </nav>
    </div>
  );
}
