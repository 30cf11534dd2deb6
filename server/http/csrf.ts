import type { Request } from 'express';
import { csrfSync } from 'csrf-sync';

/**
 * Synchroniser-token CSRF protection for cookie-authenticated writes: the token lives in the session and comes back
 * in the x-csrf-token header. GET, HEAD and OPTIONS are not checked.
 */
export const csrf = csrfSync({
  getTokenFromRequest: (req: Request) => {
    const header = req.headers['x-csrf-token'];
    return Array.isArray(header) ? header[0] : header;
  },
});
