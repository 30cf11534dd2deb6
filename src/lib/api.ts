import type { Problem } from '@shared/schemas/problem';

/** A failed API call, carrying the server's problem+json so the UI can say what went wrong and where. */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly field?: string;
  readonly errors: { field: string; message: string }[];

  constructor(problem: Problem) {
    super(problem.detail ?? problem.title);
    this.status = problem.status;
    this.code = problem.code;
    this.field = problem.field;
    this.errors = problem.errors ?? [];
  }

  /** The message for one form field, if the server named it. */
  fieldMessage(field: string): string | undefined {
    return this.errors.find((e) => e.field === field)?.message;
  }
}

let csrfToken: string | null = null;

/** Keeps the token the server handed out (sign-in returns a fresh one). */
export function setCsrfToken(token: string | null): void {
  csrfToken = token;
}

async function fetchCsrfToken(): Promise<string> {
  const res = await fetch('/api/auth/csrf', { credentials: 'same-origin' });
  const body = (await res.json()) as { csrfToken: string };
  csrfToken = body.csrfToken;
  return csrfToken;
}

async function toError(res: Response): Promise<ApiError> {
  const type = res.headers.get('content-type') ?? '';
  if (type.includes('json')) {
    const body = (await res.json()) as Partial<Problem>;
    return new ApiError({
      type: body.type ?? 'about:blank',
      title: body.title ?? res.statusText,
      status: res.status,
      code: body.code ?? 'http_error',
      detail: body.detail,
      field: body.field,
      errors: body.errors,
    });
  }
  return new ApiError({
    type: 'about:blank',
    title: res.status >= 500 ? 'The server is not answering properly' : res.statusText,
    status: res.status,
    code: 'http_error',
    detail: res.status === 502 || res.status === 504 ? 'The server could not be reached.' : undefined,
  });
}

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  body?: unknown;
  signal?: AbortSignal;
}

/** Calls the API with the session cookie, the CSRF token on writes, JSON in and out; throws ApiError on failure. */
export async function api<T>(path: string, { method = 'GET', body, signal }: RequestOptions = {}): Promise<T> {
  const send = async (token: string | null) => {
    const headers: Record<string, string> = { accept: 'application/json' };
    if (body !== undefined && !(body instanceof FormData)) headers['content-type'] = 'application/json';
    if (method !== 'GET' && token) headers['x-csrf-token'] = token;
    return fetch(path, {
      method,
      headers,
      credentials: 'same-origin',
      signal,
      body: body === undefined ? undefined : body instanceof FormData ? body : JSON.stringify(body),
    });
  };
  let token = csrfToken;
  if (method !== 'GET' && !token) token = await fetchCsrfToken();
  let res = await send(token);
  if (res.status === 403 && method !== 'GET') {
    const err = await toError(res.clone());
    if (err.code === 'csrf_invalid') res = await send(await fetchCsrfToken());
  }
  if (!res.ok) throw await toError(res);
  if (res.status === 204) return undefined as T;
  return (await res.json()) as T;
}

/** Builds a query string from the defined values of an object. */
export function toQuery(params: Record<string, string | number | boolean | undefined | null>): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value !== undefined && value !== null && value !== '') search.set(key, String(value));
  }
  const s = search.toString();
  return s ? `?${s}` : '';
}
