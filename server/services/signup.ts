/**
 * Public sign-up: a workshop's owner registers the workshop and their own account in one transaction, under the new
 * workshop's id (row-level security): the workshop row (DEFAULT_SETTINGS with the form's money and measures), the
 * defaults every workshop needs as its own rows (species, finishing systems, materials and packs without prices,
 * labour rates at zero), the owner with the address not yet confirmed, and a confirmation link sent through the
 * outbox. Only the link token's SHA-256 is stored; it works once, within CONFIRM_VALID_HOURS.
 *
 * An address that already has an account anywhere on the service is refused with a plain field error on `email`
 * (409 `email_taken`): it says that the address has an account, never whose or which workshop's. The unique index on
 * `lower(users.email)` makes parallel sign-ups with one address end with exactly one account; the others roll back
 * whole (no workshop, no defaults left behind).
 */
import { createHash, randomBytes } from 'node:crypto';
import { QueryTypes, UniqueConstraintError, type Sequelize, type Transaction } from 'sequelize';
import { paperSizeOf } from '@shared/countries';
import type { Signup } from '@shared/schemas/signup';
import type { WorkshopSettings } from '@shared/schemas/workshop';
import { DEFAULT_TIME_ZONE } from '@shared/time';
import type { Config } from '../config';
import { lookupWorkshop, runAsWorkshop } from '../db/workshop-context';
import { HttpProblem } from '../http/problem';
import { OutboxMessage, User, Workshop } from '../models';
import { DEFAULT_SETTINGS, ensureDefaults } from '../seeders/defaults';
import { audit } from './audit';
import { deliver } from './mail';
import { escapeHtml } from './mail-compose';
import { hashPassword } from './users';
import { insertWorkshop, reserveWorkshopId } from './workshops';

/** How long a confirmation link works. */
export const CONFIRM_VALID_HOURS = 48;
/** At most this many links per account per hour (the sign-up's own and the resends), so no inbox is flooded. */
const MAX_LINKS_PER_HOUR = 3;

const sha256 = (s: string) => createHash('sha256').update(s).digest('hex');

function emailTaken(): HttpProblem {
  const message = 'already has an account here: sign in, or ask for a new password if you have forgotten it';
  return new HttpProblem(409, 'email_taken', 'Address already in use', `email: ${message}`, { field: 'email', errors: [{ field: 'email', message }] });
}

/** The new workshop's settings: the defaults, with the form's country, money and measures. */
export function settingsFromSignup(input: Signup): WorkshopSettings {
  const imperial = input.units === 'imperial';
  return {
    ...structuredClone(DEFAULT_SETTINGS),
    units: input.units,
    imperialVolumes: input.country === 'GB' ? 'uk' : 'us',
    defaultLengthUnit: imperial ? 'in' : 'mm',
    pricing: { ...DEFAULT_SETTINGS.pricing, currency: input.currency, taxLabel: input.taxLabel, taxPct: input.taxPct },
    pricesIncludeTax: input.pricesIncludeTax,
    paperSize: paperSizeOf(input.country),
    timeZone: input.timeZone ?? DEFAULT_TIME_ZONE,
    country: input.country,
  };
}

/** Writes a new link for a user and its message in the outbox (in the caller's transaction); answers the message id. */
async function queueLink(sequelize: Sequelize, config: Config, user: User, workshopName: string, transaction: Transaction): Promise<number> {
  const token = randomBytes(32).toString('base64url');
  await sequelize.query(
    `INSERT INTO email_confirmations (user_id, token_hash, created_at, expires_at) VALUES (:id, :hash, now(), now() + (:hours || ' hours')::interval)`,
    { replacements: { id: user.id, hash: sha256(token), hours: String(CONFIRM_VALID_HOURS) }, transaction },
  );
  const url = `${config.publicUrl}/confirm/${token}`;
  const text =
    `Dear ${user.name},\n\nThank you for signing up ${workshopName} to Shellwright. Open this link within ${CONFIRM_VALID_HOURS} hours to confirm your e-mail address:\n\n${url}\n\n` +
    `The link works once. Then sign in with this address and the password you chose.\n\nIf you did not sign up, ignore this message: nothing more will happen.\n`;
  const html =
    `<p>Dear ${escapeHtml(user.name)},</p><p>Thank you for signing up ${escapeHtml(workshopName)} to Shellwright. Open this link within ${CONFIRM_VALID_HOURS} hours to confirm your e-mail address:</p>` +
    `<p><a href="${escapeHtml(url)}">Confirm my e-mail address</a></p><p>The link works once. Then sign in with this address and the password you chose.</p>` +
    `<p>If you did not sign up, ignore this message: nothing more will happen.</p>`;
  const message = await OutboxMessage.create(
    { quoteId: null, toAddress: user.email, subject: 'Confirm your e-mail address for Shellwright', textBody: text, htmlBody: html, attachmentName: null, attachment: null, lastError: null, messageId: null, createdBy: null, sentAt: null },
    { transaction },
  );
  return message.id;
}

/** Sends a queued link now; the stored copy then has the link blanked out, so the outbox never shows a working one. */
async function sendLink(config: Config, outboxId: number): Promise<void> {
  const sent = await deliver(config, outboxId);
  const blank = (s: string) => s.split(/\/confirm\/[A-Za-z0-9_-]+/).join('/confirm/(link removed once sent)');
  if (sent.status === 'sent') await sent.update({ textBody: blank(sent.textBody), htmlBody: blank(sent.htmlBody) });
}

/** Registers a workshop and its owner; the owner signs in once the e-mailed link has been opened. */
export async function signUp(sequelize: Sequelize, config: Config, input: Signup): Promise<{ workshopId: number; userId: number }> {
  // An address known anywhere is refused before any work (the unique index settles parallel requests below).
  if ((await lookupWorkshop(sequelize, 'email', input.email)) !== null) throw emailTaken();
  const passwordHash = await hashPassword(input.password);
  const workshopId = await reserveWorkshopId(sequelize);
  return runAsWorkshop(workshopId, async () => {
    let created: { userId: number; outboxId: number };
    try {
      created = await sequelize.transaction(async (transaction) => {
        await insertWorkshop(workshopId, { name: input.workshopName, email: input.email, phone: null, address: null, settings: settingsFromSignup(input) }, transaction);
        await ensureDefaults(sequelize, transaction);
        const user = await User.create({ email: input.email, name: input.ownerName, role: 'owner', passwordHash, lastLoginAt: null, emailConfirmedAt: null }, { transaction });
        await audit({ userId: null, action: 'workshop.signup', entityType: 'workshop', entityId: workshopId, after: { name: input.workshopName, country: input.country, currency: input.currency, owner: user.email } }, transaction);
        const outboxId = await queueLink(sequelize, config, user, input.workshopName, transaction);
        return { userId: user.id, outboxId };
      });
    } catch (err) {
      if (err instanceof UniqueConstraintError && /email/i.test(JSON.stringify(err.fields ?? {}) + String(err.parent?.message ?? ''))) throw emailTaken();
      throw err;
    }
    await sendLink(config, created.outboxId);
    return { workshopId, userId: created.userId };
  });
}

/** Confirms the address of the link's user; the link is spent (and any other open one of theirs). */
export async function confirmEmail(sequelize: Sequelize, token: string): Promise<{ email: string }> {
  // An unknown token runs under no workshop and finds no row: the "unknown" refusal below.
  const workshopId = await lookupWorkshop(sequelize, 'email_confirmation', sha256(token));
  return runAsWorkshop(workshopId, () =>
    sequelize.transaction(async (transaction) => {
      const rows = await sequelize.query<{ user_id: number; expired: boolean; used: boolean }>(
        'SELECT user_id, expires_at < now() AS expired, used_at IS NOT NULL AS used FROM email_confirmations WHERE token_hash = :hash FOR UPDATE',
        { replacements: { hash: sha256(token) }, type: QueryTypes.SELECT, transaction },
      );
      const row = rows[0];
      const field = { field: 'token' };
      if (!row) {
        throw new HttpProblem(404, 'confirmation_link_unknown', 'Link not recognised', 'This link is not one we sent. Copy the whole link from the message, or ask for a new one.', field);
      }
      if (row.used) {
        throw new HttpProblem(409, 'confirmation_link_used', 'Link already used', 'This link has already been used and the address is confirmed. Sign in.', field);
      }
      if (row.expired) {
        throw new HttpProblem(410, 'confirmation_link_expired', 'Link expired', `This link was valid for ${CONFIRM_VALID_HOURS} hours and has expired. Ask for a new one from the sign-in page.`, field);
      }
      const user = await User.findByPk(row.user_id, { transaction, lock: transaction.LOCK.UPDATE });
      if (!user || !user.active) throw new HttpProblem(409, 'account_inactive', 'Account not active', 'This account is no longer active. Ask the workshop owner.', field);
      if (user.emailConfirmedAt === null) {
        user.emailConfirmedAt = new Date();
        await user.save({ transaction });
      }
      await sequelize.query('UPDATE email_confirmations SET used_at = now() WHERE user_id = :id AND used_at IS NULL', { replacements: { id: user.id }, transaction });
      await audit({ userId: user.id, action: 'user.email_confirmed', entityType: 'user', entityId: user.id }, transaction);
      return { email: user.email };
    }),
  );
}

/**
 * Sends a new link to an account whose address is not confirmed yet. Does nothing, quietly, for an unknown,
 * confirmed or inactive address, or past the hourly limit: the answer is the same whatever the address.
 */
export async function resendConfirmation(sequelize: Sequelize, config: Config, email: string): Promise<void> {
  const workshopId = await lookupWorkshop(sequelize, 'email', email);
  if (workshopId === null) return;
  await runAsWorkshop(workshopId, async () => {
    const outboxId = await sequelize.transaction(async (transaction) => {
      const user = await User.findOne({ where: { email }, transaction, lock: transaction.LOCK.UPDATE });
      if (!user || !user.active || user.emailConfirmedAt !== null) return null;
      const [{ recent }] = await sequelize.query<{ recent: number }>(
        `SELECT count(*)::int AS recent FROM email_confirmations WHERE user_id = :id AND created_at > now() - interval '1 hour'`,
        { replacements: { id: user.id }, type: QueryTypes.SELECT, transaction },
      ) as [{ recent: number }];
      if (recent >= MAX_LINKS_PER_HOUR) return null;
      const workshop = await Workshop.findByPk(workshopId, { transaction });
      await audit({ userId: null, action: 'user.email_confirmation_resent', entityType: 'user', entityId: user.id }, transaction);
      return queueLink(sequelize, config, user, workshop?.name ?? 'your workshop', transaction);
    });
    if (outboxId !== null) await sendLink(config, outboxId);
  });
}
