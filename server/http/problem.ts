import type { ErrorRequestHandler, RequestHandler, Response } from 'express';
import { CustodyMoveError, StateMoveError, VariationMoveError } from '@shared/schemas/state-moves';
import { MulterError } from 'multer';
import { ConnectionError, UniqueConstraintError } from 'sequelize';
import { ZodError, type z } from 'zod';
import type { Problem } from '@shared/schemas/problem';
import { validationSentence } from '@shared/schemas/error-map';

/** An error that leaves the server as application/problem+json with a stable code. */
export class HttpProblem extends Error {
  readonly detail?: string;

  constructor(
    readonly status: number,
    readonly code: string,
    readonly title: string,
    detail?: string,
    readonly extra: Partial<Pick<Problem, 'field' | 'errors'>> = {},
  ) {
    const plain = detail === undefined ? undefined : plainDetail(detail);
    super(plain ?? title);
    this.detail = plain;
  }
}

/**
 * A hand-written detail in the form "field: what is wrong" (the form a programmer reaches for) becomes the
 * product's sentence, as the zod errors read: "start: must be today or later" → "The start must be today or
 * later."; "photos: choose at least one image" → "Choose at least one image (the photos).". Header names
 * ("Content-Encoding: …") and details that are already sentences are left as they are.
 */
export function plainDetail(detail: string): string {
  const m = /^([a-z][A-Za-z0-9]*(?:\.[A-Za-z0-9]+)*): (.+)$/s.exec(detail);
  if (!m) return detail;
  return validationSentence(m[1]!.split('.'), m[2]!);
}

export const problems = {
  unauthenticated: () => new HttpProblem(401, 'unauthenticated', 'Sign in required', 'Sign in to use this.'),
  forbidden: () => new HttpProblem(403, 'forbidden', 'Not allowed', 'Your role may not do this.'),
  notFound: (what = 'That') => new HttpProblem(404, 'not_found', 'Not found', `${what} was not found.`),
  conflict: (code: string, detail: string) => new HttpProblem(409, code, 'Conflict', detail),
  badRequest: (code: string, detail: string, field?: string) =>
    new HttpProblem(400, code, 'Bad request', detail, field ? { field, errors: [{ field, message: detail }] } : {}),
  dbDown: () =>
    new HttpProblem(503, 'database_unavailable', 'Database unavailable', 'The database cannot be reached just now. Try again shortly.'),
};

/**
 * Turns zod issues into a 400: the detail is a whole sentence about the first problem in the product's voice ("The
 * length of the piece is missing."); `field` names the first field by its path and `errors` lists them all.
 */
export function fromZod(error: ZodError): HttpProblem {
  const issues = error.issues.slice(0, 20);
  const errors = issues.map((issue) => ({
    field: issue.path.length ? issue.path.map(String).join('.') : '(body)',
    message: issue.message,
  }));
  const first = errors[0] ?? { field: '(body)', message: 'is not valid' };
  const detail = validationSentence(issues[0]?.path ?? [], first.message);
  return new HttpProblem(400, 'validation_failed', 'Invalid input', detail, {
    field: first.field,
    errors,
  });
}

/** Parses a value with a schema or throws a 400 naming the field. */
export function parseOr400<S extends z.ZodType>(schema: S, value: unknown): z.output<S> {
  const result = schema.safeParse(value);
  if (!result.success) throw fromZod(result.error);
  return result.data;
}

export function sendProblem(res: Response, problem: HttpProblem): void {
  const body: Problem = {
    type: `https://shellwright.invalid/problems/${problem.code}`,
    title: problem.title,
    status: problem.status,
    code: problem.code,
    ...(problem.detail ? { detail: problem.detail } : {}),
    ...problem.extra,
  };
  res.status(problem.status).type('application/problem+json').send(JSON.stringify(body));
}

function isDbDown(err: unknown): boolean {
  if (err instanceof ConnectionError) return true;
  const code = (err as { code?: string } | null)?.code;
  return (
    code === 'ECONNREFUSED' ||
    code === 'ECONNRESET' ||
    code === '57P01' || // admin shutdown
    code === '57P03' || // cannot connect now
    code === '3D000' || // database does not exist
    code === '55000' || // database not accepting connections
    /Connection terminated|connect ECONNREFUSED|timeout exceeded when trying to connect/i.test(String((err as Error)?.message))
  );
}

/** Codes for the client errors the body parser and router raise, by their `type`. */
const CLIENT_ERROR_CODES: Record<string, { code: string; title: string; detail: string; field?: string; status?: number }> = {
  // A coding the server cannot undo is bad input like any other: a 400 naming the header, not the parser's 415.
  'encoding.unsupported': { code: 'unsupported_encoding', title: 'Unsupported content encoding', detail: 'Content-Encoding: use gzip, deflate or br, or none.', field: 'Content-Encoding', status: 400 },
  'charset.unsupported': { code: 'unsupported_charset', title: 'Unsupported charset', detail: 'Content-Type: the body must be UTF-8.', field: 'Content-Type' },
  'request.aborted': { code: 'request_aborted', title: 'Request aborted', detail: 'The request was aborted before its body arrived.' },
  'request.size.invalid': { code: 'bad_body', title: 'Bad request body', detail: 'The body is shorter or longer than its Content-Length says.' },
  'stream.encoding.set': { code: 'bad_body', title: 'Bad request body', detail: 'The request body could not be read.' },
  'parameters.too.many': { code: 'bad_body', title: 'Bad request body', detail: 'The body holds too many parameters.' },
};

/** A problem for an error that carries its own 4xx status (and a `type` from the body parser when it has one). */
function clientProblem(status: number, type: string | undefined, err: Error & { expose?: boolean }): HttpProblem {
  const known = type ? CLIENT_ERROR_CODES[type] : undefined;
  if (known) {
    return new HttpProblem(known.status ?? status, known.code, known.title, known.detail, known.field ? { field: known.field, errors: [{ field: known.field, message: known.detail }] } : {});
  }
  if (status === 400 && /decode|zlib|incorrect header|invalid (block|distance|stored)|unexpected end|brotli/i.test(String(err?.message))) {
    const detail = 'The body could not be decoded as its Content-Encoding says.';
    return new HttpProblem(400, 'bad_encoding', 'Bad content encoding', detail, { field: 'Content-Encoding', errors: [{ field: 'Content-Encoding', message: detail }] });
  }
  const detail = err?.expose && typeof err.message === 'string' ? err.message.slice(0, 300) : 'The request could not be understood.';
  return new HttpProblem(status, status === 400 ? 'bad_request' : `client_error_${status}`, 'Bad request', detail);
}

/** The last error handler: every error leaves as problem+json. */
/** The events of the state table, as they read after "it cannot be". */
const PAST: Record<StateMoveError['event'], string> = {
  send: 'sent',
  view: 'opened',
  accept: 'accepted',
  decline: 'declined',
  withdraw: 'withdrawn',
  expire: 'expired',
  pay: 'paid',
  superseded: 'withdrawn',
};

const CUSTODY_WORDS: Record<CustodyMoveError['from'], string> = {
  'awaiting-collection': 'still awaiting collection',
  'in-workshop': 'in the workshop',
  ready: 'ready',
  returned: 'already returned',
};
const CUSTODY_PAST: Record<CustodyMoveError['event'], string> = { arrive: 'marked arrived', ready: 'marked ready', return: 'marked returned', reopen: 'reopened' };
const VARIATION_PAST: Record<VariationMoveError['event'], string> = { send: 'sent', approve: 'approved', decline: 'declined', withdraw: 'withdrawn' };

export const errorHandler: ErrorRequestHandler = (err: unknown, _req, res, next) => {
  if (res.headersSent) {
    next(err);
    return;
  }
  if (err instanceof HttpProblem) return sendProblem(res, err);
  if (err instanceof ZodError) return sendProblem(res, fromZod(err));
  if (err instanceof StateMoveError) return sendProblem(res, problems.conflict('state_move_refused', `This quote is ${err.from}: it cannot be ${PAST[err.event]} now.`));
  if (err instanceof CustodyMoveError) return sendProblem(res, problems.conflict('state_move_refused', `The piece is ${CUSTODY_WORDS[err.from]}: it cannot be ${CUSTODY_PAST[err.event]} now.`));
  if (err instanceof VariationMoveError) return sendProblem(res, problems.conflict('state_move_refused', `This variation is ${err.from}: it cannot be ${VARIATION_PAST[err.event]} now.`));
  if (err instanceof UniqueConstraintError) {
    const field = Object.keys(err.fields ?? {})[0];
    return sendProblem(res, new HttpProblem(409, 'already_exists', 'Already exists', `${field ?? 'a value'} is already in use`, field ? { field } : {}));
  }
  const typed = err as { type?: string; status?: number; code?: string };
  if (typed?.type === 'entity.too.large') {
    return sendProblem(res, new HttpProblem(413, 'too_large', 'Request too large', 'The request body is larger than allowed.'));
  }
  if (typed?.type === 'entity.parse.failed') {
    return sendProblem(res, new HttpProblem(400, 'invalid_json', 'Invalid JSON', 'The request body is not valid JSON.'));
  }
  if (typed?.code === 'EBADCSRFTOKEN' || typed?.code === 'csrf_invalid') {
    return sendProblem(res, new HttpProblem(403, 'csrf_invalid', 'Missing or invalid CSRF token', 'Fetch a token from GET /api/auth/csrf and send it in the x-csrf-token header.'));
  }
  if (err instanceof MulterError) {
    const field = err.field ?? 'file';
    const tooLarge = err.code === 'LIMIT_FILE_SIZE';
    const detail = tooLarge ? `${field}: a file is larger than allowed` : `${field}: ${err.message}`;
    return sendProblem(res, new HttpProblem(tooLarge ? 413 : 400, tooLarge ? 'file_too_large' : 'bad_upload', tooLarge ? 'File too large' : 'Bad upload', detail, { field, errors: [{ field, message: detail }] }));
  }
  if (isDbDown(err)) return sendProblem(res, problems.dbDown());
  if (typed?.status === 404) return sendProblem(res, problems.notFound('That file'));
  // Any other error that already says it is the client's (body parser, router, static files): its own 4xx.
  const status = typed?.status ?? (err as { statusCode?: number } | null)?.statusCode;
  if (typeof status === 'number' && Number.isInteger(status) && status >= 400 && status < 500) {
    return sendProblem(res, clientProblem(status, typed?.type, err as Error & { expose?: boolean }));
  }
  console.error('[server] unexpected error', err);
  sendProblem(res, new HttpProblem(500, 'internal', 'Internal error', 'Something went wrong on the server.'));
};

/** 404 for any /api path no route answers. */
export const apiNotFound: RequestHandler = (req, res) => {
  sendProblem(res, new HttpProblem(404, 'no_such_route', 'Not found', `No API route ${req.method} ${req.originalUrl.split('?')[0]}`));
};
