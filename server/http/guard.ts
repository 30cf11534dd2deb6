import express, { type RequestHandler, type Router } from 'express';
import { allows, type Access } from '@shared/roles';
import { ensureWorkshopTimeZone, lookupWorkshop, runAsWorkshop } from '../db/workshop-context';
import { User } from '../models';
import { hashToken } from '../services/quotes/links';
import { problems } from './problem';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      /** The workshop a public path resolved from its token or event (signed-in paths use the user's). */
      workshopScope?: number | null;
    }
  }
}

/**
 * Runs a handler under the request's workshop: the one a public path resolved, else the signed-in user's, else
 * none (a query then sees no row). Each handler enters it itself, so work resumed from a stream's events (an upload)
 * still runs under it.
 */
export function scoped(handler: RequestHandler): RequestHandler {
  return (req, res, next) =>
    runAsWorkshop(req.workshopScope !== undefined ? req.workshopScope : (req.user?.workshopId ?? null), () => {
      // The clock follows this workshop's time zone; read it first when this process has not yet.
      const reading = ensureWorkshopTimeZone(User.sequelize!);
      if (!reading) return handler(req, res, next);
      return reading.then(() => handler(req, res, next), next);
    });
}

/**
 * Who may call a route: the holders of a permission from `shared/roles.ts`, any signed-in user, or the public (the
 * customer's signed link, health, sign-in). Every route must say; there is no default, and no list of roles.
 */
export type { Access };

export interface RouteInfo {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  path: string;
  access: Access;
}

/** The one guard: 401 when signed out, 403 for a role that does not hold the route's permission. */
export function guard(access: Access): RequestHandler {
  return (req, _res, next) => {
    if (access === 'public') return next();
    if (!req.user) return next(problems.unauthenticated());
    if (!allows(access, req.user.role)) return next(problems.forbidden());
    next();
  };
}

/** Public paths under these prefixes carry a signed token in `:token`: a quote's, a variation's, or an invitation's. */
const SIGNED_LINK_PREFIXES = [
  { prefix: '/api/public/quotes/:token', lookup: 'quote_token' },
  { prefix: '/api/public/variations/:token', lookup: 'variation_token' },
  { prefix: '/api/public/invitations/:token', lookup: 'invitation' },
] as const;

/**
 * Resolves the workshop of a customer's signed link (through the owner's lookup by the token's hash); an unknown
 * token resolves to no workshop, so the handler finds nothing and answers as it would for any unknown link.
 */
function workshopOfLink(lookup: (typeof SIGNED_LINK_PREFIXES)[number]['lookup']): RequestHandler {
  return async (req, _res, next) => {
    const token = typeof req.params.token === 'string' ? req.params.token : '';
    req.workshopScope = token ? await lookupWorkshop(User.sequelize!, lookup, hashToken(token)) : null;
    next();
  };
}

type AddRoute = (path: string, access: Access, ...handlers: RequestHandler[]) => void;

export interface SecureRouter {
  router: Router;
  get: AddRoute;
  post: AddRoute;
  put: AddRoute;
  patch: AddRoute;
  delete: AddRoute;
}

/**
 * A router whose every route names its access. Routes are recorded in `table` (the app's route table), which the
 * role-matrix test walks so that a new route joins it by declaring its roles.
 */
export function secureRouter(prefix: string, table: RouteInfo[]): SecureRouter {
  const router = express.Router();
  const add =
    (method: RouteInfo['method']): AddRoute =>
    (path, access, ...handlers) => {
      const full = prefix + path;
      table.push({ method, path: full, access });
      // A customer's signed link names its workshop: its last handler runs under it (after any rate limiter).
      const link = access === 'public' ? SIGNED_LINK_PREFIXES.find((l) => full.startsWith(l.prefix)) : undefined;
      const resolved = link ? [...handlers.slice(0, -1), workshopOfLink(link.lookup), ...handlers.slice(-1)] : handlers;
      router[method](full, guard(access), ...resolved.map(scoped));
    };
  return { router, get: add('get'), post: add('post'), put: add('put'), patch: add('patch'), delete: add('delete') };
}
