import { useCallback, useMemo } from 'react';
import { useSearchParams } from 'react-router-dom';

export interface TableState {
  q: string;
  sort: string;
  dir: 'asc' | 'desc';
  page: number;
  filters: Record<string, string>;
}

/** Search, sort, page and filters of a server-side table, kept in the address bar so a view can be shared. */
export function useTableState(defaults: { sort: string; dir?: 'asc' | 'desc'; filters?: string[] }) {
  const [params, setParams] = useSearchParams();
  const filterNames = defaults.filters ?? [];
  const state: TableState = useMemo(
    () => ({
      q: params.get('q') ?? '',
      sort: params.get('sort') ?? defaults.sort,
      dir: params.get('dir') === 'desc' ? 'desc' : params.get('dir') === 'asc' ? 'asc' : (defaults.dir ?? 'asc'),
      page: Math.max(1, Number(params.get('page')) || 1),
      filters: Object.fromEntries(filterNames.map((f) => [f, params.get(f) ?? ''])),
    }),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [params, defaults.sort, defaults.dir, filterNames.join(',')],
  );

  const update = useCallback(
    (patch: Record<string, string | number | undefined>) => {
      setParams(
        (prev) => {
          const next = new URLSearchParams(prev);
          for (const [k, v] of Object.entries(patch)) {
            if (v === undefined || v === '') next.delete(k);
            else next.set(k, String(v));
          }
          return next;
        },
        { replace: true },
      );
    },
    [setParams],
  );

  return {
    state,
    setSearch: (q: string) => update({ q, page: undefined }),
    setFilter: (name: string, value: string) => update({ [name]: value, page: undefined }),
    setPage: (page: number) => update({ page: page <= 1 ? undefined : page }),
    toggleSort: (key: string) =>
      update({ sort: key, dir: state.sort === key && state.dir === 'asc' ? 'desc' : 'asc', page: undefined }),
  };
}
