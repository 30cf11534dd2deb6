import { useMemo, useState } from 'react';

/**
 * Sort and page rows already in the browser (a file preview, a short list), with the same shape of state as the
 * server-side tables so that DataTable can show either.
 */
export function useLocalTable<T>(rows: readonly T[], opts: { sort: string; dir?: 'asc' | 'desc'; pageSize?: number; value: (row: T, key: string) => string | number | null }) {
  const [sort, setSort] = useState(opts.sort);
  const [dir, setDir] = useState<'asc' | 'desc'>(opts.dir ?? 'asc');
  const [page, setPage] = useState(1);
  const pageSize = opts.pageSize ?? 20;
  const { value } = opts;
  const sorted = useMemo(() => {
    const copy = [...rows];
    copy.sort((a, b) => {
      const va = value(a, sort);
      const vb = value(b, sort);
      if (va === vb) return 0;
      if (va === null) return 1;
      if (vb === null) return -1;
      const c = typeof va === 'number' && typeof vb === 'number' ? va - vb : String(va).localeCompare(String(vb), 'en-GB', { numeric: true });
      return dir === 'asc' ? c : -c;
    });
    return copy;
  }, [rows, sort, dir, value]);
  const pages = Math.max(1, Math.ceil(sorted.length / pageSize));
  const current = Math.min(page, pages);
  return {
    rows: sorted.slice((current - 1) * pageSize, current * pageSize),
    total: sorted.length,
    page: current,
    pageSize,
    sort,
    dir,
    onPage: setPage,
    onSort: (key: string) => {
      setDir(sort === key && dir === 'asc' ? 'desc' : 'asc');
      setSort(key);
      setPage(1);
    },
  };
}
