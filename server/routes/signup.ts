import { ipKeyGenerator } from 'express-rate-limit';
import type { Request, Response } from 'express';
import type pg from 'pg';
import type { Sequelize } from 'sequelize';
import { ConfirmEmailSchema, ResendConfirmationSchema, SignupSchema, type SignupResult } from '@shared/schemas/signup';
import type { Config } from '../config';
import { signupLimits } from '../auth/login-limits';
import { secureRouter, type RouteInfo } from '../http/guard';
import { HttpProblem, parseOr400, sendProblem } from '../http/problem';
import { confirmEmail, CONFIRM_VALID_HOURS, resendConfirmation, signUp } from '../services/signup';

/**
 * Public sign-up of a new workshop, the confirmation of its owner's address, and a new link on request. Each call
 * is counted against its address in the shared sign-in limits (PostgreSQL), after its body has been read, so that a
 * form sent with a mistake costs nothing.
 */
export function signupRoutes(config: Config, sequelize: Sequelize, table: RouteInfo[], pool: pg.Pool) {
  const r = secureRouter('/api/signup', table);
  const limits = signupLimits(config, pool);
  /** Counts the request; answers 429 and resolves false once the address has used its share. */
  const withinLimit = async (req: Request, res: Response): Promise<boolean> => {
    const wait = await limits.attempt(ipKeyGenerator(req.ip ?? ''));
    if (wait === 0) return true;
    res.setHeader('Retry-After', String(wait));
    sendProblem(res, new HttpProblem(429, 'too_many_attempts', 'Too many requests', `Too many sign-up requests from this address. Wait ${wait > 90 ? `${Math.ceil(wait / 60)} minutes` : `${wait} seconds`} and try again.`));
    return false;
  };

  r.post('', 'public', async (req, res) => {
    const input = parseOr400(SignupSchema, req.body);
    if (!(await withinLimit(req, res))) return;
    await signUp(sequelize, config, input);
    const result: SignupResult = {
      email: input.email,
      message: `We have sent a link to ${input.email}. Open it within ${CONFIRM_VALID_HOURS} hours to confirm the address, then sign in.`,
    };
    res.status(201).json(result);
  });
  r.post('/confirm', 'public', async (req, res) => {
    const { token } = parseOr400(ConfirmEmailSchema, req.body);
    if (!(await withinLimit(req, res))) return;
    res.json(await confirmEmail(sequelize, token));
  });
  // The same answer whatever the address, so the form tells no one who has an account.
  r.post('/resend', 'public', async (req, res) => {
    const { email } = parseOr400(ResendConfirmationSchema, req.body);
    if (!(await withinLimit(req, res))) return;
    await resendConfirmation(sequelize, config, email);
    res.status(202).json({ message: `If ${email} is waiting to be confirmed, a new link is on its way. It works once, within ${CONFIRM_VALID_HOURS} hours.` });
  });
  return r.router;
}
