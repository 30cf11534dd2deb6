import { ipKeyGenerator } from 'express-rate-limit';
import type { RequestHandler } from 'express';
import type pg from 'pg';
import type { Sequelize } from 'sequelize';
import { LoginSchema, PasswordResetCompleteSchema, PasswordResetRequestSchema } from '@shared/schemas/auth';
import type { Config } from '../config';
import { loginLimits, resetLimits } from '../auth/login-limits';
import { configurePassport } from '../auth/passport';
import { csrf } from '../http/csrf';
import { secureRouter, type RouteInfo } from '../http/guard';
import { runAsWorkshop } from '../db/workshop-context';
import { HttpProblem, parseOr400, sendProblem } from '../http/problem';
import { User } from '../models';
import { completePasswordReset, requestPasswordReset } from '../services/password-reset';

/** Sign-in, sign-out, password resets and who is signed in. `pool` holds the shared failed-sign-in counters (login_attempts). */
export function authRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[], pool: pg.Pool) {
  const r = secureRouter('/api/auth', table);
  const passport = configurePassport();
  const limits = loginLimits(config, pool);

  const login: RequestHandler = async (req, res, next) => {
    const { email } = parseOr400(LoginSchema, req.body);
    const address = ipKeyGenerator(req.ip ?? '');
    // The attempt is counted before the password is checked; a success gives it back.
    const wait = await limits.attempt(address, email);
    if (wait > 0) {
      res.setHeader('Retry-After', String(wait));
      return sendProblem(
        res,
        new HttpProblem(429, 'too_many_attempts', 'Too many sign-in attempts', `Too many failed sign-in attempts. Wait ${wait > 90 ? `${Math.ceil(wait / 60)} minutes` : `${wait} seconds`} and try again.`),
      );
    }
    passport.authenticate('local', { session: false }, (err: unknown, user: Express.User | false, info?: { message?: string }) => {
      if (err) return next(err);
      if (!user && info?.message === 'unconfirmed') {
        // The password was right: the attempt does not count against the account.
        limits.succeeded(address, email).then(() => {
          sendProblem(
            res,
            new HttpProblem(403, 'email_unconfirmed', 'E-mail address not confirmed', 'Confirm your e-mail address first: open the link in the message we sent when you signed up. No message? Ask for a new link.', { field: 'email', errors: [{ field: 'email', message: 'is not confirmed yet' }] }),
          );
        }, next);
        return;
      }
      if (!user) {
        return sendProblem(res, new HttpProblem(401, 'invalid_credentials', 'Sign-in failed', 'That e-mail and password do not match an active account.'));
      }
      req.login(user, (loginErr) => {
        if (loginErr) return next(loginErr);
        const { workshopId, ...shown } = user;
        Promise.all([runAsWorkshop(workshopId, () => User.update({ lastLoginAt: new Date() }, { where: { id: user.id } })), limits.succeeded(address, email)]).then(() => {
          res.json({ user: shown, csrfToken: csrf.generateToken(req, true) });
        }, next);
      });
    })(req, res, next);
  };

  r.get('/csrf', 'public', (req, res) => {
    res.json({ csrfToken: csrf.generateToken(req) });
  });
  r.post('/login', 'public', login);
  r.post('/logout', 'public', (req, res, next) => {
    req.logout((err) => {
      if (err) return next(err);
      res.status(204).end();
    });
  });
  // Who is signed in, or `{ user: null }`: the client's first call, answered 200 either way so that a signed-out first
  // visit logs no failed request in the browser's console.
  r.get('/session', 'public', async (req, res) => {
    const user = req.user ? await User.findByPk(req.user.id) : null;
    res.json({ user: user?.active ? user.toDto() : null });
  });
  // Password reset by e-mailed link. The request answers 202 whatever the address, so it tells no one who has an
  // account; a few requests per address and e-mail in the sign-in window, like sign-in itself.
  const resets = resetLimits(config, pool);
  /** Counts a well-formed request against its address; answers 429 and resolves false once the limit is reached. */
  const withinResetLimit = async (req: Parameters<RequestHandler>[0], res: Parameters<RequestHandler>[1]): Promise<boolean> => {
    const wait = await resets.attempt(ipKeyGenerator(req.ip ?? ''));
    if (wait === 0) return true;
    res.setHeader('Retry-After', String(wait));
    sendProblem(res, new HttpProblem(429, 'too_many_attempts', 'Too many requests', 'Too many password reset requests. Wait a few minutes and try again.'));
    return false;
  };
  r.post('/password-reset', 'public', async (req, res) => {
    const { email } = parseOr400(PasswordResetRequestSchema, req.body);
    if (!(await withinResetLimit(req, res))) return;
    await requestPasswordReset(sequelize, config, email);
    res.status(202).json({ message: 'If that address belongs to an account here, a link to set a new password is on its way. It works once, within the hour.' });
  });
  r.post('/password-reset/complete', 'public', async (req, res) => {
    const { token, password } = parseOr400(PasswordResetCompleteSchema, req.body);
    if (!(await withinResetLimit(req, res))) return;
    await completePasswordReset(sequelize, token, password);
    res.status(204).end();
  });
  r.get('/me', 'signed-in', async (req, res) => {
    const user = await User.findByPk(req.user!.id);
    if (!user) throw new HttpProblem(401, 'unauthenticated', 'Sign in required');
    res.json({ user: user.toDto() });
  });
  return r.router;
}
