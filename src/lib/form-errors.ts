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

/** Zod's words for limits and empty number boxes, in the workshop's. */
export function plainMessage(v: string): string {
  if (/received NaN|expected number, received/i.test(v)) return 'must be a number';
  const m = /^Too (?:big|small): expected (?:number|string|array) to (?:be|have) ([<>]=?)(-?[\d.]+)/.exec(v);
  if (!m) return v;
  const words: Record<string, string> = { '<=': 'at most', '>=': 'at least', '<': 'less than', '>': 'more than' };
  return `must be ${words[m[1]!]} ${m[2]}`;
}
