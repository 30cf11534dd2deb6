import { ipKeyGenerator, rateLimit } from 'express-rate-limit';
import type { RequestHandler } from 'express';
import type { Sequelize } from 'sequelize';
import { LoginSchema, PasswordResetCompleteSchema, PasswordResetRequestSchema } from '@shared/schemas/auth';
import type { Config } from '../config';
import { configurePassport } from '../auth/passport';
import { csrf } from '../http/csrf';
import { secureRouter, type RouteInfo } from '../http/guard';
import { HttpProblem, parseOr400, sendProblem } from '../http/problem';
import { User } from '../models';
import { completePasswordReset, requestPasswordReset } from '../services/password-reset';

export function authRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[]) {
  const r = secureRouter('/api/auth', table);
  const passport = configurePassport();

  const loginLimit = rateLimit({
    windowMs: config.loginWindowMs,
    limit: config.loginAttempts,
    skipSuccessfulRequests: true,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => {
      const email = typeof req.body?.email === 'string' ? req.body.email.trim().toLowerCase() : '';
      return `${ipKeyGenerator(req.ip ?? '')}|${email}`;
    },
    handler: (_req, res) =>
      sendProblem(
        res,
        new HttpProblem(429, 'too_many_attempts', 'Too many sign-in attempts', 'Too many failed sign-in attempts. Wait a few minutes and try again.'),
      ),
  });

  const login: RequestHandler = (req, res, next) => {
    parseOr400(LoginSchema, req.body);
    passport.authenticate('local', { session: false }, (err: unknown, user: Express.User | false) => {
      if (err) return next(err);
      if (!user) {
        return sendProblem(res, new HttpProblem(401, 'invalid_credentials', 'Sign-in failed', 'That e-mail and password do not match an active account.'));
      }
      req.login(user, (loginErr) => {
        if (loginErr) return next(loginErr);
        User.update({ lastLoginAt: new Date() }, { where: { id: user.id } }).then(() => {
          res.json({ user, csrfToken: csrf.generateToken(req, true) });
        }, next);
      });
    })(req, res, next);
  };

  r.get('/csrf', 'public', (req, res) => {
    res.json({ csrfToken: csrf.generateToken(req) });
  });
  r.post('/login', 'public', loginLimit, login);
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
  const resetLimit = rateLimit({
    windowMs: config.loginWindowMs,
    limit: config.loginAttempts,
    standardHeaders: 'draft-8',
    legacyHeaders: false,
    keyGenerator: (req) => ipKeyGenerator(req.ip ?? ''),
    handler: (_req, res) =>
      sendProblem(res, new HttpProblem(429, 'too_many_attempts', 'Too many requests', 'Too many password reset requests. Wait a few minutes and try again.')),
  });
  r.post('/password-reset', 'public', resetLimit, async (req, res) => {
    const { email } = parseOr400(PasswordResetRequestSchema, req.body);
    await requestPasswordReset(sequelize, config, email);
    res.status(202).json({ message: 'If that address belongs to an account here, a link to set a new password is on its way. It works once, within the hour.' });
  });
  r.post('/password-reset/complete', 'public', resetLimit, async (req, res) => {
    const { token, password } = parseOr400(PasswordResetCompleteSchema, req.body);
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
