/**
 * A quote's customer link: a random token with an HMAC (a tampered token is refused before any look-up), its hash and address.
 */
import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { Config } from '../../config';

// ------------------------------------------------------------------------------------------------ links

/** A customer's link token: random, with an HMAC so a tampered token is refused before any look-up. */
export function makeToken(secret: string): { token: string; hash: string } {
  const random = randomBytes(24).toString('base64url');
  const sig = createHmac('sha256', secret).update(random).digest('base64url').slice(0, 22);
  const token = `${random}.${sig}`;
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** True when the token carries a valid signature (it may still be unknown, expired or withdrawn). */
export function tokenSigned(token: string, secret: string): boolean {
  const m = /^([A-Za-z0-9_-]{32})\.([A-Za-z0-9_-]{22})$/.exec(token);
  if (!m) return false;
  const expected = Buffer.from(createHmac('sha256', secret).update(m[1]!).digest('base64url').slice(0, 22));
  const given = Buffer.from(m[2]!);
  return expected.length === given.length && timingSafeEqual(expected, given);
}

export function quoteLink(config: Config, token: string): string {
  return `${config.publicUrl}/q/${token}`;
}
