import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { render } from '@testing-library/react';
import type { ReactNode } from 'react';
import { MemoryRouter } from 'react-router-dom';

/** Renders inside a fresh query client (no retries) and a memory router; returns the client too. */
export function renderWithApp(ui: ReactNode, { route = '/' }: { route?: string } = {}) {
  const queryClient = new QueryClient({ defaultOptions: { queries: { retry: false } } });
  const rendered = render(
    <QueryClientProvider client={queryClient}>
      <MemoryRouter initialEntries={[route]}>{ui}</MemoryRouter>
    </QueryClientProvider>,
  );
  return Object.assign(rendered, { queryClient });
}

/** True once every query has its answer (or its error): what the page shows next is what it will keep showing. */
export function queriesSettled(queryClient: QueryClient): boolean {
  const queries = queryClient.getQueryCache().getAll();
  return queries.length > 0 && queries.every((q) => q.state.status !== 'pending' && q.state.fetchStatus === 'idle');
}

/** A fetch that answers from a table of handlers, standing in for the network (not the database). */
export function fakeFetch(handlers: Record<string, (init?: RequestInit) => Response>) {
  const calls: { url: string; init?: RequestInit }[] = [];
  const fn = async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = String(input);
    calls.push({ url, init });
    const key = Object.keys(handlers).find((k) => url.startsWith(k));
    if (!key) return new Response('{}', { status: 404, headers: { 'content-type': 'application/json' } });
    return handlers[key]!(init);
  };
  return { fn, calls };
}

export function json(body: unknown, status = 200, type = 'application/json') {
  return new Response(JSON.stringify(body), { status, headers: { 'content-type': type } });
}
