import type { UseQueryResult } from '@tanstack/react-query';
import type { ReactNode } from 'react';
import type { Page } from '@shared/schemas/auth';
import { Alert } from './alert';
import { DataTable, type Column } from './data-table';
import type { TableState } from '@/lib/use-table-state';

export interface PagedTableProps<T> {
  caption: string;
  columns: Column<T>[];
  rowKey: (row: T) => string | number;
  /** The page query: its rows, total, loading state and error. */
  query: UseQueryResult<Page<T>, Error>;
  /** Search, sort and page from the address bar (useTableState). */
  table: { state: TableState; toggleSort: (key: string) => void; setPage: (page: number) => void };
  pageSize: number;
  empty: ReactNode;
  /** Shown, with the server's message, when the page cannot be loaded. */
  errorTitle: string;
  /** false: the columns do not sort; a string: the one sort the server uses. */
  sort?: false | string;
}

/** A server-paged table wired to its query and the address bar, or the reason it could not load. */
export function PagedTable<T>({ caption, columns, rowKey, query, table, pageSize, empty, errorTitle, sort }: PagedTableProps<T>) {
  if (query.isError) return <Alert tone="error" title={errorTitle}>{query.error.message}</Alert>;
  return (
    <DataTable
      caption={caption}
      columns={columns}
      rows={query.data?.rows ?? []}
      rowKey={rowKey}
      total={query.data?.total ?? 0}
      totalCapped={query.data?.totalCapped}
      page={table.state.page}
      pageSize={pageSize}
      sort={sort === false ? undefined : (sort ?? table.state.sort)}
      dir={sort === false ? undefined : table.state.dir}
      loading={query.isFetching}
      empty={empty}
      onSort={sort === false ? undefined : table.toggleSort}
      onPage={table.setPage}
    />
  );
}
