/**
 * The rate limit on the customer's side (the signed links of quotes and variations): 120 requests a minute from one
 * address, answered past that with a 429 problem in plain words. Each route file takes its own, so one page's calls
 * do not use up another's.
 */
import { rateLimit } from 'express-rate-limit';
import { HttpProblem, sendProblem } from './problem';

export function publicLinkLimiter() {
  return rateLimit({
    windowMs: 60_000,
    limit: 120,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    handler: (_req, res) => sendProblem(res, new HttpProblem(429, 'too_many_requests', 'Too many requests', 'Too many requests from this address; wait a minute.')),
  });
}
