import type { ZodError } from 'zod';
import { ApiError } from './api';

/** Field messages from a zod error (first message per field). */
export function zodFieldErrors(error: ZodError): Record<string, string> {
  const out: Record<string, string> = {};
  for (const issue of error.issues) {
    const key = issue.path.map(String).join('.');
    out[key] ??= issue.message;
  }
  return out;
}

/** Field messages from a server error that names fields. */
export function serverFieldErrors(error: unknown): Record<string, string> {
  if (!(error instanceof ApiError)) return {};
  const out: Record<string, string> = {};
  for (const e of error.errors) out[e.field] ??= e.message;
  return out;
}
