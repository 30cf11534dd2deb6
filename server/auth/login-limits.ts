/**
 * Failed sign-in limits, counted per account (the e-mail tried, known or not) and per address, in PostgreSQL so that
 * every instance behind a load balancer shares them (table login_attempts, rate-limiter-flexible's PostgreSQL
 * store). A guess against one account from many addresses meets the account's limit; password spraying from one
 * address across many accounts meets the address's.
 *
 * Every attempt takes its point first, atomically in the database, so parallel guesses cannot slip past the limit
 * between a check and a count; a successful sign-in then gives the points back (the account's counter is cleared).
 */
import type pg from 'pg';
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import type { Config } from '../config';

export interface LoginLimits {
  /** Counts an attempt. Resolves to the seconds to wait when a limit is already reached, or 0 when it may go on. */
  attempt(address: string, email: string): Promise<number>;
  /** A successful sign-in: its attempt does not count. */
  succeeded(address: string, email: string): Promise<void>;
}

/** The account's key: the e-mail as the sign-in form reads it. */
export function accountKey(email: string): string {
  return email.trim().toLowerCase().slice(0, 254);
}

export function loginLimits(config: Pick<Config, 'loginAttempts' | 'loginAddressAttempts' | 'loginWindowMs'>, pool: pg.Pool): LoginLimits {
  const duration = Math.max(1, Math.ceil(config.loginWindowMs / 1000));
  const common = { storeClient: pool, storeType: 'pool', tableName: 'login_attempts', tableCreated: true, clearExpiredByTimeout: true, duration };
  const perAccount = new RateLimiterPostgres({ ...common, keyPrefix: 'account', points: config.loginAttempts });
  const perAddress = new RateLimiterPostgres({ ...common, keyPrefix: 'address', points: config.loginAddressAttempts });

  /** Seconds to wait from a refusal, or rethrows a store error (a database error is a 503, not a pass). */
  const waitOf = (outcome: PromiseSettledResult<RateLimiterRes>): number => {
    if (outcome.status === 'fulfilled') return 0;
    if (outcome.reason instanceof RateLimiterRes) return Math.max(1, Math.ceil(outcome.reason.msBeforeNext / 1000));
    throw outcome.reason;
  };

  return {
    async attempt(address, email) {
      const outcomes = await Promise.allSettled([perAccount.consume(accountKey(email)), perAddress.consume(address)]);
      return Math.max(...outcomes.map(waitOf));
    },
    async succeeded(address, email) {
      await Promise.all([perAccount.delete(accountKey(email)), perAddress.reward(address, 1)]);
    },
  };
}

/** A limit per address in the shared table: `attempt` answers 0 when allowed, else the seconds to wait. */
function addressLimit(keyPrefix: string, points: number, windowMs: number, pool: pg.Pool): { attempt(address: string): Promise<number> } {
  const duration = Math.max(1, Math.ceil(windowMs / 1000));
  const limiter = new RateLimiterPostgres({ storeClient: pool, storeType: 'pool', tableName: 'login_attempts', tableCreated: true, clearExpiredByTimeout: true, duration, keyPrefix, points });
  return {
    async attempt(address) {
      try {
        await limiter.consume(address);
        return 0;
      } catch (e) {
        if (e instanceof RateLimiterRes) return Math.max(1, Math.ceil(e.msBeforeNext / 1000));
        throw e;
      }
    },
  };
}

/**
 * Password-reset requests and completions per address, in the same shared table: a few in the sign-in window, like
 * sign-in itself, so that no instance can be used to flood an inbox or guess a token.
 */
export function resetLimits(config: Pick<Config, 'loginAttempts' | 'loginWindowMs'>, pool: pg.Pool): { attempt(address: string): Promise<number> } {
  return addressLimit('reset', config.loginAttempts, config.loginWindowMs, pool);
}

/**
 * Sign-ups, confirmations and resent links per address, in the same shared table: as many in the sign-in window as
 * the sign-in limit per address (a whole office may sign up and confirm from one address), so that no instance can
 * be used to create workshops in bulk, flood an inbox or guess a link.
 */
export function signupLimits(config: Pick<Config, 'loginAddressAttempts' | 'loginWindowMs'>, pool: pg.Pool): { attempt(address: string): Promise<number> } {
  return addressLimit('signup', config.loginAddressAttempts, config.loginWindowMs, pool);
}
