/**
 * The one policy for what a client sends, applied before any route sees it:
 *
 * - the path must be valid percent-encoding of UTF-8 (`/%ZZ` or a truncated sequence is a 400, never a 500 from
 *   a route's parameter decoding);
 * - a request body may use only the content codings the JSON parser understands (gzip, deflate, br), and only on a
 *   JSON body; anything else is a 400 naming Content-Encoding before a byte is read;
 * - no string anywhere in the path, the query or the body (keys included) may hold a NUL character or an unpaired
 *   UTF-16 surrogate. PostgreSQL cannot store the first in text and would store the second altered (as U+FFFD), so
 *   such input is refused with a 400 naming the field; it is never stored changed.
 *
 * Multipart bodies are parsed inside their routes (multer): those routes run `textPolicy` after the upload
 * middleware so that their text fields meet the same rule.
 */
import type { RequestHandler } from 'express';
import { validationSentence } from '@shared/schemas/error-map';
import { HttpProblem } from './problem';

/** A NUL, a high surrogate not followed by a low one, or a low surrogate not preceded by a high one. */
// eslint-disable-next-line no-control-regex -- finding NUL is the point
const BAD_TEXT = /\u0000|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** Why a string is refused, or undefined when it is fine. */
export function badTextReason(s: string): string | undefined {
  const m = BAD_TEXT.exec(s);
  if (!m) return undefined;
  return m[0] === '\u0000' ? 'must not contain a NUL character' : 'must be valid Unicode text (it holds an unpaired surrogate)';
}

function textProblem(field: string, reason: string): HttpProblem {
  const detail = validationSentence(field.split('.'), reason);
  return new HttpProblem(400, 'invalid_text', 'Invalid text', detail, { field, errors: [{ field, message: reason }] });
}

/**
 * The first string (value or key) in a parsed body that breaks the rule, as a dotted path like zod's. Walks
 * without recursion so that a deeply nested body cannot overflow the stack.
 */
export function findBadText(root: unknown, rootName = '(body)'): { field: string; reason: string } | undefined {
  const stack: { value: unknown; path: string[] }[] = [{ value: root, path: [] }];
  const name = (path: string[]) => (path.length ? path.join('.') : rootName);
  let seen = 0;
  while (stack.length) {
    const { value, path } = stack.pop()!;
    if (++seen > 200_000) return { field: name(path), reason: 'is nested too deeply or holds too many values' };
    if (typeof value === 'string') {
      const reason = badTextReason(value);
      if (reason) return { field: name(path), reason };
    } else if (Array.isArray(value)) {
      for (let i = value.length - 1; i >= 0; i--) stack.push({ value: value[i], path: [...path, String(i)] });
    } else if (value && typeof value === 'object') {
      const entries = Object.entries(value as Record<string, unknown>);
      for (let i = entries.length - 1; i >= 0; i--) {
        const [key, v] = entries[i]!;
        const keyReason = badTextReason(key);
        if (keyReason) return { field: name([...path, key.replace(new RegExp(BAD_TEXT.source, 'g'), '?')]), reason: `(a field name) ${keyReason}` };
        stack.push({ value: v, path: [...path, key] });
      }
    }
  }
  return undefined;
}

/** Checks the parsed body (JSON or multipart fields) against the text rule. */
export const textPolicy: RequestHandler = (req, _res, next) => {
  const bad = findBadText(req.body);
  next(bad ? textProblem(bad.field, bad.reason) : undefined);
};

/** Content codings the JSON body parser decodes. */
const JSON_CODINGS = new Set(['identity', 'gzip', 'deflate', 'br']);

/** Refuses a Content-Encoding that the body's parser cannot undo, before any parser reads it. */
export const encodingPolicy: RequestHandler = (req, _res, next) => {
  const header = req.headers['content-encoding'];
  if (!header) return next();
  const codings = header.split(',').map((c) => c.trim().toLowerCase()).filter(Boolean);
  const isJson = req.is('application/json') === 'application/json' || req.is('+json') !== false;
  const decodable = isJson && !req.path.startsWith('/api/webhooks/') ? JSON_CODINGS : new Set(['identity']);
  const unsupported = codings.find((c) => !decodable.has(c));
  if (unsupported === undefined && codings.length <= 1) return next();
  const detail =
    unsupported === undefined
      ? 'Content-Encoding: send the body with at most one content coding.'
      : `Content-Encoding: "${unsupported.slice(0, 40)}" is not accepted${isJson ? '; use gzip, deflate or br, or none' : ' on this kind of body; send it uncompressed'}.`;
  next(new HttpProblem(400, 'unsupported_encoding', 'Unsupported content encoding', detail, { field: 'Content-Encoding', errors: [{ field: 'Content-Encoding', message: detail }] }));
};

/** Refuses a path that is not valid percent-encoded UTF-8, or that decodes to a NUL. */
export const pathPolicy: RequestHandler = (req, _res, next) => {
  let decoded: string;
  try {
    decoded = decodeURIComponent(req.path);
  } catch {
    return next(new HttpProblem(400, 'bad_path', 'Bad address', 'The address holds malformed percent-encoding (such as %ZZ or a cut-off UTF-8 sequence).', { field: 'path', errors: [{ field: 'path', message: 'is not valid percent-encoded UTF-8' }] }));
  }
  const reason = badTextReason(decoded);
  if (reason) return next(textProblem('path', reason));
  next();
};

/**
 * Query strings follow the same rules as paths and bodies: valid percent-encoding (the parser would otherwise turn
 * a broken escape into replacement characters, silently), and no NUL or unpaired surrogate in a name or value.
 */
export const queryPolicy: RequestHandler = (req, _res, next) => {
  const at = req.originalUrl.indexOf('?');
  if (at < 0) return next();
  for (const part of req.originalUrl.slice(at + 1).split('&')) {
    const eq = part.indexOf('=');
    const [key, value] = eq < 0 ? [part, ''] : [part.slice(0, eq), part.slice(eq + 1)];
    try {
      decodeURIComponent(key.replace(/\+/g, ' '));
      decodeURIComponent(value.replace(/\+/g, ' '));
    } catch {
      const field = key.replace(/[^\w.-]/g, '').slice(0, 60) || '(query)';
      return next(new HttpProblem(400, 'bad_query', 'Bad address', `${field}: the query holds malformed percent-encoding (such as %ZZ or a cut-off UTF-8 sequence).`, { field, errors: [{ field, message: 'is not valid percent-encoded UTF-8' }] }));
    }
  }
  const bad = findBadText(req.query, '(query)');
  if (bad) return next(textProblem(bad.field, bad.reason));
  next();
};

/**
 * Wraps a multipart parser (multer): its own limit errors go to the error handler as they are (or through `mapError`),
 * a form that cannot be parsed at all is a 400 naming the file field, and the text fields then meet the text rule.
 */
export function multipart(upload: RequestHandler, field: string, mapError?: (err: unknown) => HttpProblem | undefined): RequestHandler[] {
  const receive: RequestHandler = (req, res, next) => {
    if (!req.is('multipart/form-data')) {
      return next(new HttpProblem(400, 'multipart_required', 'Form upload required', `${field}: send the file as multipart/form-data.`, { field, errors: [{ field, message: 'must be sent as multipart/form-data' }] }));
    }
    upload(req, res, (err: unknown) => {
      if (!err) return next();
      const mapped = mapError?.(err);
      if (mapped) return next(mapped);
      if ((err as { name?: string }).name === 'MulterError' || err instanceof HttpProblem) return next(err);
      const detail = `${field}: the form could not be read (${String((err as Error)?.message ?? err).slice(0, 120)}).`;
      next(new HttpProblem(400, 'bad_upload', 'Bad upload', detail, { field, errors: [{ field, message: 'the form could not be read' }] }));
    });
  };
  return [receive, textPolicy];
}
